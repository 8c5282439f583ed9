#include "core/pickupmethods.h"

#include "core/referencenights.h"

#include <algorithm>

namespace cb {

namespace {

/// What every method does before its own arithmetic: the lead, and OTB(s,t).
struct Start {
  int h = 0;
  int otbNow = 0;
};

/// nullopt when the method cannot forecast s; `done` holds Final(s) for a night already arrived.
std::optional<Start> start(const ForecastContext &ctx, Date night, std::optional<double> &done) {
  done.reset();
  const int h = night - ctx.asOf();
  if (h <= 0) {
    if (auto f = ctx.observedFinal(night))
      done = static_cast<double>(*f);
    return std::nullopt;
  }
  auto now = ctx.otbNow(night);
  if (!now)
    return std::nullopt;
  return Start{h, *now};
}

double nonNegative(double f) { return std::max(0.0, f); }

class PickupBase : public ForecastMethod {
public:
  explicit PickupBase(const MethodOptions &options) : refs_(options) {}
  void fit(const ForecastContext &) override {} // nothing to fit: every figure is read live

protected:
  std::vector<Date> references(const ForecastContext &ctx, Date night, Date latest) const {
    return refs_.choose(night, latest, ctx.firstNight(), ctx.cube().lastNight());
  }
  /// mean_r [Final(r) − OTB(r, r − h)] over references r ≤ t; nullopt without references.
  std::optional<double> meanPickup(const ForecastContext &ctx, Date night, int h) const {
    const int lead = std::min(h, ctx.maxDba());
    double sum = 0;
    int n = 0;
    for (Date r : references(ctx, night, ctx.asOf())) {
      auto f = ctx.final(r);
      auto o = ctx.otb(r, lead);
      if (f && o) {
        sum += *f - *o;
        ++n;
      }
    }
    if (n == 0)
      return std::nullopt;
    return sum / n;
  }
  ReferenceNights refs_;
};

class AdditivePickup final : public PickupBase {
public:
  using PickupBase::PickupBase;
  std::string name() const override { return "pickup-add"; }
  std::string description() const override {
    return "Classical pickup: the rooms on the books now, plus the rooms that " + refs_.describe() +
           " picked up on average from the same number of days before arrival until arrival.";
  }
  std::string formula() const override {
    return "F(s) = OTB(s,t) + mean_r [Final(r) − OTB(r, r − h)], h = s − t, references r ≤ t";
  }
  std::optional<double> forecast(const ForecastContext &ctx, Date night) const override {
    std::optional<double> done;
    auto st = start(ctx, night, done);
    if (!st)
      return done;
    auto p = meanPickup(ctx, night, st->h);
    if (!p)
      return std::nullopt;
    return nonNegative(st->otbNow + *p);
  }
};

class AdvancedPickup final : public PickupBase {
public:
  using PickupBase::PickupBase;
  std::string name() const override { return "pickup-adv"; }
  std::string description() const override {
    return "Advanced pickup: the rooms on the books now, plus the average pickup of each single "
           "day still to come, each day taken from " +
           refs_.describe() +
           " for which that day is already known — so the last days before arrival use nights "
           "that have not arrived yet.";
  }
  std::string formula() const override {
    return "F(s) = OTB(s,t) + Σ_{j=0}^{h−1} mean_{r ∈ R_j} [OTB(r, r − j) − OTB(r, r − j − 1)], "
           "R_j = references with r − j ≤ t";
  }
  std::optional<double> forecast(const ForecastContext &ctx, Date night) const override {
    std::optional<double> done;
    auto st = start(ctx, night, done);
    if (!st)
      return done;
    const int lead = std::min(st->h, ctx.maxDba());
    double total = st->otbNow;
    for (int j = 0; j < lead; ++j) {
      double sum = 0;
      int n = 0;
      for (Date r : references(ctx, night, ctx.asOf() + j)) {
        auto later = ctx.otb(r, j);
        auto earlier = ctx.otb(r, j + 1);
        if (later && earlier) {
          sum += *later - *earlier;
          ++n;
        }
      }
      if (n == 0)
        return std::nullopt;
      total += sum / n;
    }
    return nonNegative(total);
  }
};

class MultiplicativePickup final : public PickupBase {
public:
  using PickupBase::PickupBase;
  std::string name() const override { return "pickup-mult"; }
  std::string description() const override {
    return "Multiplicative pickup: the rooms on the books now, scaled by how much " +
           refs_.describe() +
           " grew from the same number of days before arrival until arrival (ratio of the "
           "sums); classical pickup when those nights had no rooms on the books then.";
  }
  std::string formula() const override {
    return "F(s) = OTB(s,t) × Σ_r Final(r) / Σ_r OTB(r, r − h), references r ≤ t "
           "(classical pickup when Σ_r OTB(r, r − h) = 0)";
  }
  std::optional<double> forecast(const ForecastContext &ctx, Date night) const override {
    std::optional<double> done;
    auto st = start(ctx, night, done);
    if (!st)
      return done;
    const int lead = std::min(st->h, ctx.maxDba());
    double finals = 0;
    long long onBooks = 0;
    int n = 0;
    for (Date r : references(ctx, night, ctx.asOf())) {
      auto f = ctx.final(r);
      auto o = ctx.otb(r, lead);
      if (f && o) {
        finals += *f;
        onBooks += *o;
        ++n;
      }
    }
    if (n == 0)
      return std::nullopt;
    if (onBooks == 0)
      return nonNegative(st->otbNow + finals / n); // the additive fallback
    return nonNegative(st->otbNow * (finals / static_cast<double>(onBooks)));
  }
};

class PaceExtrapolation final : public ForecastMethod {
public:
  explicit PaceExtrapolation(const MethodOptions &options) : w_(options.paceWindow) {
    if (w_ < 1)
      throw MethodError("the pace window must be at least 1 day (got " + std::to_string(w_) + ")");
  }
  std::string name() const override { return "pace-extrap"; }
  std::string description() const override {
    // The rule itself is common practice in hotels, no source.
    return "Recent-pace extrapolation, a rule of thumb of the trade: the night keeps picking up "
           "rooms until arrival at the pace of its last " +
           std::to_string(w_) + " days.";
  }
  std::string formula() const override {
    return "F(s) = OTB(s,t) + h × (OTB(s,t) − OTB(s,t−" + std::to_string(w_) + ")) / " +
           std::to_string(w_) + ", h = s − t";
  }
  void fit(const ForecastContext &) override {}
  std::optional<double> forecast(const ForecastContext &ctx, Date night) const override {
    std::optional<double> done;
    auto st = start(ctx, night, done);
    if (!st)
      return done;
    // The cube reads s no earlier than s − maxDba: shrink the window rather than give up.
    const int w = std::min(w_, ctx.maxDba() - st->h);
    if (w <= 0)
      return nonNegative(st->otbNow);
    auto before = ctx.otb(night, st->h + w);
    if (!before)
      return std::nullopt;
    return nonNegative(st->otbNow + st->h * static_cast<double>(st->otbNow - *before) / w);
  }

private:
  int w_;
};

} // namespace

std::unique_ptr<ForecastMethod> makePickupMethod(std::string_view name,
                                                 const MethodOptions &options) {
  if (name == "pickup-add")
    return std::make_unique<AdditivePickup>(options);
  if (name == "pickup-adv")
    return std::make_unique<AdvancedPickup>(options);
  if (name == "pickup-mult")
    return std::make_unique<MultiplicativePickup>(options);
  if (name == "pace-extrap")
    return std::make_unique<PaceExtrapolation>(options);
  return nullptr;
}

} // namespace cb
