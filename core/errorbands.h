// Error bands (brief section 5): empirical type-7 quantiles of the backtest residuals at the same
// series and lead bucket, added to the point forecast.
#pragma once

#include "core/errorwindow.h"

#include <cstdint>
#include <optional>
#include <span>

namespace cb {

struct BandOptions {
  double lower = 0.10; ///< probability of the lower edge
  double upper = 0.90; ///< of the upper edge (10 %–90 %: an 80 % band)
  int windowDays = 56; ///< nights t − windowDays + 1 … t (same evidence as auto selection)
  int minCount = 10;   ///< fewer residuals give no band (our own choice: 10 % of 10 is one value)
};

struct Band {
  double lo = 0, hi = 0;
};

class ErrorBands {
public:
  ErrorBands(const ErrorWindow &window, BandOptions options);
  /// Band of a forecast made at reading date t by `method`: residuals r = final − forecast of
  /// the rows with night ≤ t in the window; lo = max(0, forecast + Q7(r, lower)),
  /// hi = max(0, forecast + Q7(r, upper)). nullopt with fewer than minCount residuals.
  std::optional<Band> band(std::uint32_t series, std::uint32_t method, int bucket, Date readingDate,
                           double forecast) const;
  /// The same from a list of residuals (final − forecast). Example: residuals 1 … 10, p 0.1 and
  /// 0.9, forecast 20 → {21.9, 29.1}.
  static std::optional<Band> fromResiduals(std::span<const double> residuals, double forecast,
                                           const BandOptions &options);

private:
  const ErrorWindow &window_;
  BandOptions options_;
};

/// Share of outcomes inside their band, edges included: finals[i] ∈ [bands[i].lo, bands[i].hi].
/// nullopt for no bands. Throws std::invalid_argument on different lengths.
std::optional<double> bandCoverage(std::span<const Band> bands, std::span<const double> finals);

} // namespace cb
