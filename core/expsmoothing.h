// Additive exponential smoothing in component form: simple (SES), Holt's linear trend and
// Holt–Winters additive seasonal, with fixed parameters (Hyndman & Athanasopoulos, Forecasting:
// Principles and Practice, chapter on exponential smoothing; the same recursions as statsmodels'
// ExponentialSmoothing with initialization_method="known" and R forecast::ses/holt/hw).
#pragma once

#include <optional>
#include <span>
#include <vector>

namespace cb {

/// States l_t, b_t and the seasonal factors, seasonal[i] being the season of the (i + 1)-th
/// observation after t (so at t = 0 it lists the seasons of y_1 … y_m).
struct SmoothingState {
  double level = 0;
  double trend = 0;             ///< unused (0) without a trend
  std::vector<double> seasonal; ///< empty without a season
};

/// One pass of the recursion over a series.
struct SmoothingRun {
  std::vector<double> fitted; ///< one-step fitted values yhat_t, t = 1 … n
  SmoothingState end;         ///< states after y_n
  double sse = 0;             ///< Σ (y_t − yhat_t)²
};

/// The model with its smoothing parameters. Without beta there is no trend; without gamma (or
/// period < 2) no season. Example: `ExpSmoothing::simple(0.3).run(y, {60}).end.level`.
class ExpSmoothing {
public:
  ExpSmoothing(double alpha, std::optional<double> beta, std::optional<double> gamma, int period);
  static ExpSmoothing simple(double alpha) { return {alpha, std::nullopt, std::nullopt, 0}; }
  static ExpSmoothing holt(double alpha, double beta) { return {alpha, beta, std::nullopt, 0}; }
  static ExpSmoothing holtWinters(double alpha, double beta, double gamma, int period) {
    return {alpha, beta, gamma, period};
  }

  bool hasTrend() const { return beta_.has_value(); }
  bool hasSeason() const { return gamma_.has_value(); }
  int period() const { return period_; }

  /// Filters y from the initial states (yhat_t = l + b + s_{t−m}; l, b, s updated as in FPP).
  /// Throws std::invalid_argument when the initial seasonal vector's size is not the period.
  SmoothingRun run(std::span<const double> y, const SmoothingState &initial) const;
  /// Σ of squared one-step errors only (no allocation; what the parameter fits minimise).
  double sse(std::span<const double> y, const SmoothingState &initial) const;
  /// yhat_{T+h} = l_T + h b_T + s_{T+h−m(k+1)}, k = ⌊(h − 1)/m⌋; h ≥ 1.
  double forecast(const SmoothingState &end, int h) const;

  /// forecast's "simple" start: l0 = y_1 and, with a trend, b0 = y_2 − y_1 (needs 2 values).
  static SmoothingState simpleStart(std::span<const double> y, bool trend);
  /// forecast::hw's "simple" start: l0 = mean of the first period, b0 = (mean of the second −
  /// mean of the first) / m, s0_i = y_i − l0 (needs 2 periods).
  static SmoothingState seasonalStart(std::span<const double> y, int period);

private:
  double alpha_;
  std::optional<double> beta_, gamma_;
  int period_;
};

} // namespace cb
