#include "core/combinedmethods.h"

#include "core/leastsquares.h"
#include "core/mlp.h"

#include <algorithm>
#include <cmath>
#include <map>
#include <mutex>
#include <numbers>
#include <tuple>

namespace cb {

namespace {

/// Training window of the learned methods: the last year of arrived nights, so every weekday
/// and season is in it once and a fit stays small (a few ms).
constexpr int kTrainingNights = 365;
/// Same night last year, weekday-aligned (brief section 4).
constexpr int kStly = 364;

/// Nights r ≤ t, newest first, inside the cube and the training window.
std::vector<Date> trainingNights(const ForecastContext &ctx) {
  std::vector<Date> out;
  const Date last = std::min(ctx.asOf(), ctx.cube().lastNight());
  for (Date r = last; r >= ctx.firstNight() && ctx.asOf() - r < kTrainingNights; r = r - 1)
    out.push_back(r);
  return out;
}

/// The lead of night s as of t, when the method can forecast it (OTB(s, t) is in the cube).
std::optional<int> leadOf(const ForecastContext &ctx, Date night) {
  const int h = night - ctx.asOf();
  if (h < 1 || h > ctx.maxDba())
    return std::nullopt;
  return h;
}

double nonNegative(double x) { return std::max(0.0, x); }

// ---- regress ----

class RegressMethod final : public ForecastMethod {
public:
  std::string name() const override { return "regress"; }
  std::string description() const override {
    return "For each lead, a straight-line fit over the last year of arrived nights: how the "
           "final rooms relate to the rooms on the books at that lead, to the same night last "
           "year, and to the day of the week.";
  }
  std::string formula() const override {
    return "F(s) = b0 + b1 × OTB(s,t) + b2 × Final(s − 364) + c[weekday(s)], with b, c fitted by "
           "least squares on Final(r) over nights r ≤ t at the same lead h = s − t";
  }
  void fit(const ForecastContext &) override {
    std::lock_guard lock(mutex_);
    models_.clear();
  }
  std::optional<double> forecast(const ForecastContext &ctx, Date night) const override {
    if (night <= ctx.asOf())
      return ctx.final(night);
    const auto h = leadOf(ctx, night);
    const auto otb = ctx.otbNow(night);
    if (!h || !otb)
      return std::nullopt;
    const auto stly = ctx.final(night - kStly);
    const Model *m = stly ? &model(ctx, *h, true) : nullptr;
    if (!m || !m->ok)
      m = &model(ctx, *h, false);
    if (!m->ok)
      return std::nullopt;
    auto x = regressionFeatures(*otb, m->stly ? std::optional<double>(*stly) : std::nullopt,
                                night.isoWeekday());
    return nonNegative(x.dot(m->beta));
  }

private:
  struct Model {
    bool ok = false, stly = false;
    Eigen::VectorXd beta;
  };

  const Model &model(const ForecastContext &ctx, int h, bool stly) const {
    std::lock_guard lock(mutex_);
    auto [it, fresh] = models_.try_emplace({h, stly});
    if (!fresh)
      return it->second;
    Model &m = it->second;
    m.stly = stly;
    std::vector<Eigen::RowVectorXd> rows;
    std::vector<double> ys;
    for (Date r : trainingNights(ctx)) {
      auto y = ctx.final(r);
      auto otb = ctx.otb(r, h);
      std::optional<double> st;
      if (stly) {
        auto f = ctx.final(r - kStly);
        if (!f)
          continue;
        st = *f;
      }
      if (!y || !otb)
        continue;
      rows.push_back(regressionFeatures(*otb, st, r.isoWeekday()));
      ys.push_back(*y);
    }
    const auto cols = stly ? 9 : 8;
    // Four rows per coefficient at least: fewer leaves the weekday effects mostly noise.
    if (static_cast<int>(rows.size()) < 4 * cols)
      return m;
    Eigen::MatrixXd x(static_cast<Eigen::Index>(rows.size()), cols);
    Eigen::VectorXd y(x.rows());
    for (Eigen::Index i = 0; i < x.rows(); ++i) {
      x.row(i) = rows[static_cast<std::size_t>(i)];
      y(i) = ys[static_cast<std::size_t>(i)];
    }
    m.beta = leastSquares(x, y).coefficients;
    m.ok = true;
    return m;
  }

  mutable std::mutex mutex_;
  mutable std::map<std::pair<int, bool>, Model> models_;
};

// ---- blend ----

constexpr int kBlendNights = 28;  ///< four weeks: every weekday four times
constexpr int kBlendMinPairs = 7; ///< below this the errors say too little: equal weights

class BlendMethod final : public ForecastMethod {
public:
  BlendMethod(std::string name, MethodFactory first, MethodFactory second)
      : name_(std::move(name)), make_{std::move(first), std::move(second)} {}

  std::string name() const override { return name_; }
  std::string description() const override {
    return "A weighted average of two forecasts (by default the moving average of past finals and "
           "additive pickup). Each gets more weight the smaller its squared errors were on the "
           "last four weeks of nights at a similar lead.";
  }
  std::string formula() const override {
    return "F(s) = w1 × F1(s) + w2 × F2(s), w_k = (1/MSE_k) / (1/MSE_1 + 1/MSE_2), MSE_k over "
           "nights r = t … t − 27 forecast from reading date r − h' with h' in the lead bucket "
           "of h = s − t";
  }
  void fit(const ForecastContext &ctx) override {
    std::lock_guard lock(mutex_);
    weights_.clear();
    for (std::size_t k = 0; k < 2; ++k) {
      parts_[k] = make_[k]();
      parts_[k]->fit(ctx);
    }
  }
  std::optional<double> forecast(const ForecastContext &ctx, Date night) const override {
    if (night <= ctx.asOf())
      return ctx.final(night);
    if (!parts_[0] || !parts_[1])
      throw std::logic_error("blend: forecast() before fit()");
    const auto f0 = parts_[0]->forecast(ctx, night);
    const auto f1 = parts_[1]->forecast(ctx, night);
    if (!f0 || !f1)
      return f0 ? f0 : f1;
    const auto &w = weights(ctx, blendLeadBucket(night - ctx.asOf()));
    return nonNegative(w[0] * *f0 + w[1] * *f1);
  }

private:
  const std::vector<double> &weights(const ForecastContext &ctx, std::pair<int, int> bucket) const {
    std::lock_guard lock(mutex_);
    auto [it, fresh] = weights_.try_emplace(bucket.first);
    if (!fresh)
      return it->second;
    std::vector<std::vector<double>> errors(2);
    const int width = bucket.second - bucket.first + 1;
    for (int i = 0; i < kBlendNights; ++i) {
      const Date r = ctx.asOf() - i;
      const int lead = bucket.first + i % width;
      const Date reading = r - lead;
      const auto actual = ctx.final(r);
      if (!actual || reading < ctx.firstNight())
        continue;
      // A context masked at the past reading date: r − lead < t, so nothing after t is visible.
      ForecastContext past(ctx.cube(), ctx.series(), reading, ctx.property());
      past.useHistory(ctx.history()); // estimates known at t; past masks nights after `reading`
      std::optional<double> f[2];
      for (std::size_t k = 0; k < 2; ++k) {
        auto m = make_[k]();
        m->fit(past);
        f[k] = m->forecast(past, r);
      }
      if (!f[0] || !f[1])
        continue;
      for (std::size_t k = 0; k < 2; ++k)
        errors[k].push_back(*f[k] - *actual);
    }
    if (static_cast<int>(errors[0].size()) < kBlendMinPairs)
      errors = {{}, {}};
    it->second = inverseMseWeights(errors);
    return it->second;
  }

  std::string name_;
  MethodFactory make_[2];
  std::unique_ptr<ForecastMethod> parts_[2];
  mutable std::mutex mutex_;
  mutable std::map<int, std::vector<double>> weights_;
};

// ---- mlp ----

constexpr int kMlpHidden = 8;
constexpr int kMlpMinRows = 56; ///< eight weeks of nights: below this the net would memorise

/// Inputs of the network for night r at lead h: OTB(r, r − h), 7-day pickup, sin and cos of the
/// weekday, and with STLY also Final(r − 364) and OTB(r − 364, r − 364 − h). nullopt when a cell
/// is not known as of the context's reading date.
std::optional<Eigen::RowVectorXd> mlpInputs(const ForecastContext &ctx, Date r, int h, bool stly) {
  const auto otb = ctx.otb(r, h);
  const auto before = ctx.otb(r, std::min(h + 7, ctx.maxDba()));
  if (!otb || !before)
    return std::nullopt;
  Eigen::RowVectorXd x(stly ? 6 : 4);
  const double angle = 2.0 * std::numbers::pi * r.isoWeekday() / 7.0;
  x(0) = *otb;
  x(1) = *otb - *before;
  x(2) = std::sin(angle);
  x(3) = std::cos(angle);
  if (stly) {
    const auto f = ctx.final(r - kStly);
    const auto o = ctx.otb(r - kStly, h);
    if (!f || !o)
      return std::nullopt;
    x(4) = *f;
    x(5) = *o;
  }
  return x;
}

class MlpMethod final : public ForecastMethod {
public:
  MlpMethod(std::uint64_t seed, int retrainDays) : seed_(seed), retrainDays_(retrainDays) {
    if (retrainDays < 1)
      throw MethodError("mlp: the retraining interval must be at least 1 day");
  }
  std::string name() const override { return "mlp"; }
  std::string description() const override {
    return "A small neural network, one per lead, trained on the last year of arrived nights to "
           "predict the rooms still to come from the rooms on the books, last week's pickup, the "
           "day of the week and the same night last year.";
  }
  std::string formula() const override {
    return "F(s) = OTB(s,t) + g(OTB(s,t), OTB(s,t) − OTB(s,t−7), sin/cos weekday, Final(s − 364), "
           "OTB(s − 364, t − 364)); g = 8 tanh units, inputs and target standardised, fitted "
           "by Adam on Final(r) − OTB(r, r − h) over nights r ≤ t";
  }
  void fit(const ForecastContext &ctx) override {
    std::lock_guard lock(mutex_);
    // MethodOptions::mlpRetrainDays: the nets of this instance's first fit serve the next k − 1
    // days too (the backtest gives each block of k days a fresh instance).
    if (trainedAt_ && ctx.asOf() >= *trainedAt_ && ctx.asOf() - *trainedAt_ < retrainDays_)
      return;
    nets_.clear();
    trainedAt_ = ctx.asOf();
  }
  std::optional<double> forecast(const ForecastContext &ctx, Date night) const override {
    if (night <= ctx.asOf())
      return ctx.final(night);
    const auto h = leadOf(ctx, night);
    if (!h)
      return std::nullopt;
    for (bool stly : {true, false}) {
      const auto x = mlpInputs(ctx, night, *h, stly);
      if (!x)
        continue;
      const Mlp *net = this->net(ctx, *h, stly);
      if (!net)
        continue;
      return nonNegative((*x)(0) + net->predict(*x)(0));
    }
    return std::nullopt;
  }

private:
  const Mlp *net(const ForecastContext &ctx, int h, bool stly) const {
    std::lock_guard lock(mutex_);
    auto [it, fresh] = nets_.try_emplace({ctx.series(), h, stly});
    if (!fresh)
      return it->second.get();
    std::vector<Eigen::RowVectorXd> rows;
    std::vector<double> ys;
    for (Date r : trainingNights(ctx)) {
      const auto y = ctx.final(r);
      const auto x = mlpInputs(ctx, r, h, stly);
      if (!y || !x)
        continue;
      rows.push_back(*x);
      ys.push_back(*y - (*x)(0));
    }
    if (static_cast<int>(rows.size()) < kMlpMinRows)
      return nullptr;
    Eigen::MatrixXd x(static_cast<Eigen::Index>(rows.size()), rows.front().size());
    Eigen::VectorXd y(x.rows());
    for (Eigen::Index i = 0; i < x.rows(); ++i) {
      x.row(i) = rows[static_cast<std::size_t>(i)];
      y(i) = ys[static_cast<std::size_t>(i)];
    }
    auto net = std::make_unique<Mlp>(static_cast<int>(x.cols()), kMlpHidden, seed_);
    net->train(x, y);
    it->second = std::move(net);
    return it->second.get();
  }

  std::uint64_t seed_;
  int retrainDays_;
  std::optional<Date> trainedAt_;
  mutable std::mutex mutex_;
  mutable std::map<std::tuple<std::size_t, int, bool>, std::unique_ptr<Mlp>> nets_;
};

} // namespace

std::vector<double> inverseMseWeights(const std::vector<std::vector<double>> &errors) {
  const std::size_t k = errors.size();
  std::vector<double> w(k, k ? 1.0 / static_cast<double>(k) : 0.0);
  std::vector<double> mse(k, 0.0);
  std::size_t zeros = 0;
  for (std::size_t i = 0; i < k; ++i) {
    if (errors[i].empty())
      return w;
    for (double e : errors[i])
      mse[i] += e * e;
    mse[i] /= static_cast<double>(errors[i].size());
    zeros += mse[i] == 0.0 ? 1 : 0;
  }
  double sum = 0.0;
  for (std::size_t i = 0; i < k; ++i) {
    w[i] = zeros ? (mse[i] == 0.0 ? 1.0 : 0.0) : 1.0 / mse[i];
    sum += w[i];
  }
  for (double &x : w)
    x /= sum;
  return w;
}

std::pair<int, int> blendLeadBucket(int lead) {
  static constexpr std::pair<int, int> buckets[] = {
      {1, 1}, {2, 3}, {4, 7}, {8, 14}, {15, 30}, {31, 60}, {61, 90}, {91, 180}, {181, 365}};
  for (auto b : buckets)
    if (lead <= b.second)
      return lead < b.first ? std::pair{lead, lead} : b;
  return {366, std::max(366, lead)};
}

Eigen::RowVectorXd regressionFeatures(double otbAtLead, std::optional<double> stlyFinal,
                                      unsigned isoWeekday) {
  Eigen::RowVectorXd x = Eigen::RowVectorXd::Zero(stlyFinal ? 9 : 8);
  Eigen::Index k = 0;
  x(k++) = 1.0;
  x(k++) = otbAtLead;
  if (stlyFinal)
    x(k++) = *stlyFinal;
  if (isoWeekday >= 2 && isoWeekday <= 7)
    x(k + static_cast<Eigen::Index>(isoWeekday) - 2) = 1.0;
  return x;
}

std::unique_ptr<ForecastMethod> makeBlendMethod(std::string name, MethodFactory first,
                                                MethodFactory second) {
  return std::make_unique<BlendMethod>(std::move(name), std::move(first), std::move(second));
}

std::unique_ptr<ForecastMethod> makeCombinedMethod(std::string_view name,
                                                   const MethodOptions &options) {
  if (name == "regress")
    return std::make_unique<RegressMethod>();
  if (name == "mlp")
    return std::make_unique<MlpMethod>(options.seed, options.mlpRetrainDays);
  if (name == "blend")
    return makeBlendMethod(
        "blend", [options] { return makeMethod("mavg", options); },
        [options] { return makeMethod("pickup-add", options); });
  return nullptr;
}

} // namespace cb
