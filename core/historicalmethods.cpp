#include "core/historicalmethods.h"

#include "core/autoregression.h"
#include "core/expsmoothing.h"

#include <boost/math/tools/minima.hpp>
#include <nlopt.hpp>

#include <algorithm>
#include <array>
#include <limits>
#include <string>

namespace cb {

namespace {

/// The newest night with a known final: T = min(asOf, last night of the cube).
Date lastKnown(const ForecastContext &ctx) {
  return ctx.firstNight() + static_cast<int>(ctx.finals().size()) - 1;
}

/// Position of a night in the weekly cycle of ctx.finals() (0 = the weekday of the first night).
std::size_t phase(const ForecastContext &ctx, Date night) {
  return static_cast<std::size_t>(((night - ctx.firstNight()) % 7 + 7) % 7);
}

/// The newest night ≤ T with the weekday of s.
Date sameWeekdayKnown(const ForecastContext &ctx, Date night) {
  const int ahead = night - lastKnown(ctx);
  const int weeks = std::max(1, (ahead + 6) / 7);
  return night - 7 * weeks;
}

std::optional<double> nonNegative(double v) { return std::max(0.0, v); }

class NaiveMethod final : public ForecastMethod {
public:
  std::string name() const override { return "naive"; }
  std::string description() const override {
    return "The final of the most recent night already stayed that fell on the same weekday.";
  }
  std::string formula() const override {
    return "F(s) = Final(s − 7k), k = smallest with s − 7k ≤ t";
  }
  void fit(const ForecastContext &) override {}
  std::optional<double> forecast(const ForecastContext &ctx, Date night) const override {
    if (auto f = ctx.final(sameWeekdayKnown(ctx, night)))
      return *f;
    return std::nullopt;
  }
};

class LastYearMethod final : public ForecastMethod {
public:
  std::string name() const override { return "last-year"; }
  std::string description() const override {
    return "The final of the same weekday one year earlier (364 days before), unknown when that "
           "night is before the data or not stayed yet.";
  }
  std::string formula() const override { return "F(s) = Final(s − 364)"; }
  void fit(const ForecastContext &) override {}
  std::optional<double> forecast(const ForecastContext &ctx, Date night) const override {
    if (auto f = ctx.final(night - 364))
      return *f;
    return std::nullopt;
  }
};

class MovingAverageMethod final : public ForecastMethod {
public:
  explicit MovingAverageMethod(int k) : k_(k) {
    if (k < 1)
      throw MethodError("mavg: k must be at least 1");
  }
  std::string name() const override { return "mavg"; }
  std::string description() const override {
    return "The average final of the last " + std::to_string(k_) +
           " nights already stayed that fell on the same weekday (fewer at the start of the "
           "data).";
  }
  std::string formula() const override {
    return "F(s) = mean of Final(r) over the last k = " + std::to_string(k_) +
           " nights r ≤ t with the weekday of s";
  }
  void fit(const ForecastContext &) override {}
  std::optional<double> forecast(const ForecastContext &ctx, Date night) const override {
    double sum = 0;
    int count = 0;
    for (Date r = sameWeekdayKnown(ctx, night); count < k_; r = r - 7) {
      auto f = ctx.final(r);
      if (!f)
        break;
      sum += *f;
      ++count;
    }
    if (count == 0)
      return std::nullopt;
    return sum / count;
  }

private:
  int k_;
};

/// Simple exponential smoothing of each weekday's own series of finals.
class SesMethod final : public ForecastMethod {
public:
  std::string name() const override { return "ses"; }
  std::string description() const override {
    return "Exponential smoothing of each weekday's finals: recent weeks weigh more, older "
           "weeks fade geometrically; the weight is fitted to this history.";
  }
  std::string formula() const override {
    return "per weekday: l_n = a·Final_n + (1 − a)·l_{n−1}, l_0 = first final; F(s) = l at t; "
           "a minimises Σ (Final_n − l_{n−1})²";
  }
  void fit(const ForecastContext &ctx) override {
    const auto &y = ctx.finals();
    for (std::size_t w = 0; w < 7; ++w) {
      std::vector<double> series;
      for (std::size_t i = w; i < y.size(); i += 7)
        series.push_back(y[i]);
      level_[w].reset();
      alpha_[w] = 0;
      if (series.size() < 3)
        continue;
      const SmoothingState start = ExpSmoothing::simpleStart(series, false);
      // One parameter on [0, 1]: Brent's method (Boost.Math) finds the minimum of the one-step
      // SSE to full precision; the SSE of SES is smooth in alpha and in practice unimodal, and
      // were it not, Brent still returns a local minimum inside the bounds.
      auto sse = [&](double a) { return ExpSmoothing::simple(a).sse(series, start); };
      const double a = boost::math::tools::brent_find_minima(
                           sse, 0.0, 1.0, std::numeric_limits<double>::digits / 2)
                           .first;
      alpha_[w] = a;
      level_[w] = ExpSmoothing::simple(a).run(series, start).end.level;
    }
  }
  std::optional<double> forecast(const ForecastContext &ctx, Date night) const override {
    const auto &level = level_[phase(ctx, night)];
    if (!level)
      return std::nullopt;
    return nonNegative(*level);
  }
  /// The fitted smoothing weight of a weekday position (tests).
  double alpha(std::size_t w) const { return alpha_[w]; }

private:
  std::array<std::optional<double>, 7> level_{};
  std::array<double, 7> alpha_{};
};

/// Additive Holt–Winters, period 7, on the daily finals.
class HoltWintersMethod final : public ForecastMethod {
public:
  std::string name() const override { return "holt-winters"; }
  std::string description() const override {
    return "Exponential smoothing of the daily finals with a level, a trend and a weekday "
           "pattern, each updated as nights are stayed; the three weights are fitted to this "
           "history.";
  }
  std::string formula() const override {
    return "l_t = a(y_t − s_{t−7}) + (1 − a)(l_{t−1} + b_{t−1}); b_t = b(l_t − l_{t−1}) + (1 − b) "
           "b_{t−1}; s_t = g(y_t − l_{t−1} − b_{t−1}) + (1 − g) s_{t−7}; F(t + h) = l_t + h·b_t + "
           "s_{t+h−7k}; a, b, g minimise the one-step squared error";
  }
  void fit(const ForecastContext &ctx) override {
    end_.reset();
    const auto &y = ctx.finals();
    if (y.size() < 4 * 7) // two periods start the states, two more at least to fit three weights
      return;
    const SmoothingState start = ExpSmoothing::seasonalStart(y, 7);
    auto objective = [](unsigned, const double *x, double *, void *data) {
      const auto *self = static_cast<const Fit *>(data);
      return ExpSmoothing::holtWinters(x[0], x[1], x[2], 7).sse(*self->y, *self->start);
    };
    Fit data{&y, &start};
    // BOBYQA: derivative-free with box constraints [0, 1]³, the usual choice for smoothing
    // weights; starting weights are forecast::ets' defaults-like middle values (common
    // practice, no source).
    nlopt::opt opt(nlopt::LN_BOBYQA, 3);
    opt.set_lower_bounds(std::vector<double>{0, 0, 0});
    opt.set_upper_bounds(std::vector<double>{1, 1, 1});
    opt.set_min_objective(objective, &data);
    opt.set_xtol_rel(1e-8);
    opt.set_maxeval(2000);
    std::vector<double> x{0.3, 0.1, 0.1};
    double best = 0;
    try {
      opt.optimize(x, best);
    } catch (const nlopt::roundoff_limited &) {
      // x holds the best point found; good enough for a forecast.
    } catch (const std::exception &) {
      x = {0.3, 0.1, 0.1};
    }
    params_ = {x[0], x[1], x[2]};
    end_ = ExpSmoothing::holtWinters(x[0], x[1], x[2], 7).run(y, start).end;
    last_ = lastKnown(ctx);
  }
  std::optional<double> forecast(const ForecastContext &, Date night) const override {
    if (!end_ || night <= last_)
      return std::nullopt;
    const auto &p = params_;
    return nonNegative(
        ExpSmoothing::holtWinters(p[0], p[1], p[2], 7).forecast(*end_, night - last_));
  }

private:
  struct Fit {
    const std::vector<double> *y;
    const SmoothingState *start;
  };
  std::array<double, 3> params_{};
  std::optional<SmoothingState> end_;
  Date last_;
};

/// AR(p) on the daily finals less their weekday means.
class ArMethod final : public ForecastMethod {
public:
  explicit ArMethod(int maxP) : maxP_(maxP) {
    if (maxP < 1)
      throw MethodError("ar: the largest order must be at least 1");
  }
  std::string name() const override { return "ar"; }
  std::string description() const override {
    return "Autoregression: each day's final, less its weekday's average, is predicted from the "
           "previous days' (up to " +
           std::to_string(maxP_) +
           "), with the number of days chosen by AIC; the forecast steps "
           "forward day by day.";
  }
  std::string formula() const override {
    return "z_t = Final(t) − mean of its weekday; z_t = c + φ_1 z_{t−1} + … + φ_p z_{t−p} + e_t "
           "(OLS, p ≤ " +
           std::to_string(maxP_) + " by AIC); F(s) = weekday mean + z iterated to s";
  }
  void fit(const ForecastContext &ctx) override {
    fit_.reset();
    const auto &y = ctx.finals();
    if (y.size() < 4 * 7)
      return;
    std::array<double, 7> sum{};
    std::array<int, 7> count{};
    for (std::size_t i = 0; i < y.size(); ++i) {
      sum[i % 7] += y[i];
      ++count[i % 7];
    }
    for (std::size_t w = 0; w < 7; ++w)
      means_[w] = sum[w] / count[w];
    z_.resize(y.size());
    for (std::size_t i = 0; i < y.size(); ++i)
      z_[i] = y[i] - means_[i % 7];
    fit_ = AutoRegression::fitByAic(z_, maxP_);
    last_ = lastKnown(ctx);
  }
  std::optional<double> forecast(const ForecastContext &ctx, Date night) const override {
    if (!fit_ || night <= last_)
      return std::nullopt;
    return nonNegative(means_[phase(ctx, night)] +
                       AutoRegression::forecast(*fit_, z_, night - last_));
  }

private:
  int maxP_;
  std::array<double, 7> means_{};
  std::vector<double> z_;
  std::optional<ArFit> fit_;
  Date last_;
};

} // namespace

std::unique_ptr<ForecastMethod> makeHistoricalMethod(std::string_view name,
                                                     const MethodOptions &options) {
  if (name == "naive")
    return std::make_unique<NaiveMethod>();
  if (name == "last-year")
    return std::make_unique<LastYearMethod>();
  if (name == "mavg")
    return std::make_unique<MovingAverageMethod>(options.movingAverageK);
  if (name == "ses")
    return std::make_unique<SesMethod>();
  if (name == "holt-winters")
    return std::make_unique<HoltWintersMethod>();
  if (name == "ar")
    return std::make_unique<ArMethod>(options.maxArOrder);
  return nullptr;
}

} // namespace cb
