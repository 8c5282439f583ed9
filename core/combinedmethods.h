// Combined forecast methods: regress, blend, mlp (brief section 5, "Combined").
#pragma once

#include "core/forecastmethod.h"

#include <Eigen/Dense>

#include <functional>
#include <optional>

namespace cb {

/// The combined method called `name`, or nullptr when the name is not one of them.
///  - "regress": least squares per lead h, Final(r) ~ 1 + OTB(r, r − h) + Final(r − 364) +
///    weekday dummies (Monday the baseline), on the last 365 nights r ≤ t (fewer at the start of
///    the data). Without a known STLY final (first year of data, or too few rows with one) the
///    STLY column is dropped; with fewer than 4 rows per coefficient the forecast is nullopt.
///  - "blend": mavg and pickup-add combined with inverse mean-squared-error weights per lead
///    bucket, measured on the 28 most recent arrived nights (see makeBlendMethod).
///  - "mlp": a one-hidden-layer network (8 tanh units, seed options.seed) per lead predicting the
///    pickup still to come, Final(r) − OTB(r, r − h), from OTB at lead, 7-day pickup, weekday
///    (sin/cos), STLY final and STLY OTB at lead; trained on the last 365 arrived nights.
std::unique_ptr<ForecastMethod> makeCombinedMethod(std::string_view name,
                                                   const MethodOptions &options);

/// Creates a fresh, unfitted method (the blend refits its parts at past reading dates).
using MethodFactory = std::function<std::unique_ptr<ForecastMethod>()>;

/// A blend of two methods under `name`. For a lead h in bucket [lo, hi] (blendLeadBucket), each
/// part is backtested on the nights r = t, t − 1, …, t − 27 at lead lo + (i mod (hi − lo + 1))
/// from reading date r − lead ≤ t, and the weights are inverseMseWeights of the two error lists
/// (pairs where either part gave no forecast are skipped; fewer than 7 pairs → equal weights).
std::unique_ptr<ForecastMethod> makeBlendMethod(std::string name, MethodFactory first,
                                                MethodFactory second);

/// Inverse mean-squared-error weights (Bates & Granger 1969, "The combination of forecasts",
/// Operational Research Quarterly 20(4), the variant that ignores the errors' covariance):
/// w_k = (1 / MSE_k) / Σ_j (1 / MSE_j). Methods with MSE 0 share the whole weight; empty error
/// lists give equal weights. Example: MSEs 1 and 4 → weights 0.8 and 0.2.
std::vector<double> inverseMseWeights(const std::vector<std::vector<double>> &errors);

/// Lead buckets of the blend: 1, 2–3, 4–7, 8–14, 15–30, 31–60, 61–90, 91–180, 181–365, 366+.
std::pair<int, int> blendLeadBucket(int lead);

/// One row of the regression's design matrix: 1, OTB at lead, [STLY final], then six dummies
/// for Tuesday … Sunday (isoWeekday 2 … 7). The same coding as R's
/// `lm(final ~ otb + stly + factor(weekday))` with levels 1 … 7.
Eigen::RowVectorXd regressionFeatures(double otbAtLead, std::optional<double> stlyFinal,
                                      unsigned isoWeekday);

} // namespace cb
