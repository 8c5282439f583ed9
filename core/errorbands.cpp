#include "core/errorbands.h"

#include "core/backtest.h"
#include "core/quantile.h"

#include <algorithm>
#include <array>
#include <stdexcept>
#include <vector>

namespace cb {

ErrorBands::ErrorBands(const ErrorWindow &window, BandOptions options)
    : window_(window), options_(options) {}

std::optional<Band> ErrorBands::band(std::uint32_t series, std::uint32_t method, int bucket,
                                     Date readingDate, double forecast) const {
  const auto rows =
      window_.rows(series, method, bucket, readingDate - (options_.windowDays - 1), readingDate);
  std::vector<double> residuals;
  residuals.reserve(rows.size());
  for (const BacktestRow &r : rows)
    residuals.push_back(r.final - r.forecast);
  return fromResiduals(residuals, forecast, options_);
}

std::optional<Band> ErrorBands::fromResiduals(std::span<const double> residuals, double forecast,
                                              const BandOptions &options) {
  if (residuals.empty() || static_cast<int>(residuals.size()) < options.minCount)
    return std::nullopt;
  const std::array<double, 2> probs = {options.lower, options.upper};
  const std::vector<double> q =
      quantilesType7(std::vector<double>(residuals.begin(), residuals.end()), probs);
  return Band{std::max(0.0, forecast + q[0]), std::max(0.0, forecast + q[1])};
}

std::optional<double> bandCoverage(std::span<const Band> bands, std::span<const double> finals) {
  if (bands.size() != finals.size())
    throw std::invalid_argument("band coverage: bands and finals differ in length");
  if (bands.empty())
    return std::nullopt;
  std::size_t inside = 0;
  for (std::size_t i = 0; i < bands.size(); ++i)
    if (finals[i] >= bands[i].lo && finals[i] <= bands[i].hi)
      ++inside;
  return static_cast<double>(inside) / static_cast<double>(bands.size());
}

} // namespace cb
