// Unconstraining history (brief section 6; check-values.md §5): a night whose final reached
// capacity (within the sell-out margin) or whose sales were closed shows only the demand the
// hotel accepted. These functions mark such nights as censored and estimate the demand behind
// them: expectation–maximisation for normal demand right-censored at the observed final, within
// groups of comparable nights (weekday × season), or projection detruncation; logged denials
// and regrets add to the estimate where present.
#pragma once

#include "core/curvecube.h"
#include "core/reservation.h"

#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <vector>

namespace cb {

/// A normal fit to a right-censored sample.
struct CensoredNormalFit {
  double mu = 0;
  double sigma = 0;
  int iterations = 0;
  bool converged = false;
};

/// E[D | D ≥ b] for D ~ Normal(mu, sigma) (max(mu, b) when sigma = 0, the limit as sigma → 0).
/// Safe far in the tail (no NaN): beyond z = 30 the hazard comes from a continued fraction.
double conditionalMeanAbove(double mu, double sigma, double b);

/// EM for normal demand right-censored at the observed value (check-values.md §5 E and M steps,
/// M-step divisor n). Its fixed point is the censored-normal maximum-likelihood fit (R
/// survival::survreg, dist = "gaussian"). Stops when |Δmu| and |Δsigma| < tolerance. Starts from
/// the mean and sd (divisor n) of all values. Throws std::invalid_argument for different
/// lengths, fewer than 2 values, or no uncensored value.
CensoredNormalFit emCensoredNormal(std::span<const double> values, std::span<const bool> censored,
                                   double tolerance = 1e-10, int maxIterations = 10000);

/// Projection detruncation (Hopperstad; check-values.md §5): each censored b becomes y' with
/// P(D > y' | D > b) = tau, y' = mu + sigma·Φ⁻¹(1 − tau·(1 − Φ(z))); mean and sd (divisor n) of
/// the completed sample; repeat until stable. Returns the fit; `completed` (if given) receives
/// the completed values (uncensored ones unchanged) under the returned fit. Definition
/// from-memory in check-values.md §5, as described by Guo, Xiao & Li (2012). Throws like
/// emCensoredNormal, and for tau outside (0, 1]. May stop unconverged at maxIterations.
CensoredNormalFit projectionDetruncation(std::span<const double> values,
                                         std::span<const bool> censored, double tau = 0.5,
                                         std::vector<double> *completed = nullptr,
                                         double tolerance = 1e-10, int maxIterations = 10000);

enum class UnconstrainMethod { None, Em, ProjectionDetruncation };
/// "naive" (None: the final as is), "em", "pd".
std::string_view unconstrainMethodName(UnconstrainMethod m);
std::optional<UnconstrainMethod> parseUnconstrainMethod(std::string_view name);

/// What else tells that demand was turned away (from the store; filtered by date inside).
struct CensorSources {
  std::vector<SalesClosure> closures;
  std::vector<Denial> denials; ///< denials and regrets
};

struct UnconstrainOptions {
  UnconstrainMethod method = UnconstrainMethod::Em;
  /// Add logged denials/regrets: a night's estimate is at least final + rooms denied.
  bool useDenials = true;
  double tau = 0.5; ///< projection detruncation
  int minGroup = 8; ///< nights a group needs (with ≥ 3 uncensored), else weekday-only, else none
  SeasonBands seasons; ///< classes calendar months for the weekday × season groups
  /// A split series (segment, channel, room type) counts a full night as censored only when it
  /// usually still books after the hotel filled: on its uncensored same-weekday nights, the
  /// share of the final booked within the lead at which the hotel first reached full must be at
  /// least this. An early-booking segment (groups, tour operators) was not turned away. 0 = every
  /// full night is censored for every series (also when the cube has no depth, maxDba 0).
  double minLateShare = 0.05;
};

/// Why a night counts as censored.
enum class CensorReason { None, Full, Closed };

/// One history night of one series.
struct NightDemand {
  Date night;
  double final = 0;
  CensorReason reason = CensorReason::None;
  double denied = 0;   ///< rooms of logged denials/regrets covering the night (known at asOf)
  double estimate = 0; ///< unconstrained estimate (= final when not censored and no denials)
  /// Censored nights only: the group fitted, e.g. "Fri/peak", "Fri", or "" when no group was
  /// large enough (the estimate then stays the final, plus denials).
  std::string group;
};

/// Unconstrains the nights cube.firstNight() … min(asOf, cube.lastNight()) of one series, using
/// only what was known at asOf: finals of nights ≤ asOf, closures with closedOn ≤ asOf, denials
/// requested ≤ asOf. A night is Full when the hotel's total final ≥ (1 − selloutMargin) ×
/// capacityOn(night) > 0 (read from the cube's series 0, "ALL"); else Closed when a closure of
/// the whole hotel, or of this series' segment (cube.by() == Segment; the total counts only
/// whole-hotel closures), covered it: a closure counts when closedOn ≤ min(asOf, night) and it
/// stood for at least a day (no reopenedOn, or reopenedOn > closedOn) — a closure reopened later
/// still turned requests away. Denials count for the total (all of them) and for a segment
/// series (its segment's); channel and room-type series get none. Nights are grouped by
/// weekday × season class of their calendar month (each year's month on its own: the hotel's
/// mean final / mean capacity over the month's known nights, classed by options.seasons); each
/// group in use gets one fit (EM or PD) over all its nights, and each censored night the
/// conditional mean above its final (EM) or its projected value (PD), never below the final.
/// With useDenials every night's estimate is then at least final + denied. Throws
/// std::invalid_argument when asOf is after cube.asOf(), std::out_of_range for a bad series.
std::vector<NightDemand> unconstrainSeries(const CurveCube &cube, std::size_t series, Date asOf,
                                           const Property &property, const CensorSources &sources,
                                           const UnconstrainOptions &options);

/// The closures and denials of `sources` that speak for one series of the cube, the only ones
/// unconstrainSeries reads for it (see above): unconstrainSeries gives the same result from
/// these as from all. For callers that unconstrain one series at many reading dates (a
/// backtest), so that each call does not pass over every record of the hotel.
CensorSources censorsFor(const CurveCube &cube, std::size_t series, const CensorSources &sources);

/// The estimates alone, index 0 = cube.firstNight() (what ForecastContext reads).
std::vector<double> unconstrainedFinals(const CurveCube &cube, std::size_t series, Date asOf,
                                        const Property &property, const CensorSources &sources,
                                        const UnconstrainOptions &options);

/// Estimates set against a known truth (the simulator's true demand) on the censored nights.
struct UnconstrainScore {
  std::string method; ///< "naive", "em", "pd", "em+denials", …
  int nights = 0;     ///< censored nights scored
  double mae = 0;     ///< mean |estimate − truth|
  double bias = 0;    ///< mean (estimate − truth)
};

/// Scores estimates against truth on the nights flagged censored. `truth` is indexed like
/// `nights` (same order); nights whose truth is nullopt are skipped.
UnconstrainScore scoreAgainstTruth(std::string method, std::span<const NightDemand> nights,
                                   std::span<const std::optional<double>> truth);

} // namespace cb
