// Forecast error measures (brief section 5) after Hyndman & Koehler (2006), "Another look at
// measures of forecast accuracy", Int. J. Forecasting 22(4):679-688.
#pragma once

#include <cstdint>
#include <optional>
#include <span>

namespace cb {

/// Accuracy of a set of forecasts against the finals that came true.
///
/// Sign convention: the error is e = forecast − final, so a positive bias means the method
/// forecast too many rooms (over-forecast). Hyndman & Koehler write e = y − ŷ; their "ME" is
/// therefore −bias. MAE, RMSE, MAPE, WAPE and MASE do not depend on the sign.
struct Accuracy {
  std::int64_t count = 0;     ///< forecasts compared
  double mae = 0;             ///< mean |e|
  double rmse = 0;            ///< sqrt(mean e²)
  std::optional<double> mape; ///< mean |100 e / final| over finals > 0 only; nullopt when none
  std::optional<double> wape; ///< 100 Σ|e| / Σ final; nullopt when Σ final = 0
  double bias = 0;            ///< mean e (forecast − final)
  std::optional<double> mase; ///< MAE / scale; nullopt without a positive scale

  /// Computes every measure. `forecasts` and `finals` must have the same size (else
  /// std::invalid_argument). `scale` is the in-sample naive error used by MASE (see
  /// naiveScale()). Example: forecasts {88, 88}, finals {70, 71} → mae 17.5, bias 17.5.
  static Accuracy measure(std::span<const double> forecasts, std::span<const double> finals,
                          std::optional<double> scale = std::nullopt);
};

/// The MASE scale of Hyndman & Koehler: the in-sample mean |y_t − y_{t−lag}| over a training
/// series (lag 1 = naive, lag 7 = seasonal naive of daily data with a weekly season). nullopt
/// when the series has no more than `lag` values.
/// Example: naiveScale({1, 3, 6}, 1) == 2.5.
std::optional<double> naiveScale(std::span<const double> insample, int lag);

} // namespace cb
