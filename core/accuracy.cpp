#include "core/accuracy.h"

#include <cmath>
#include <stdexcept>

namespace cb {

// Hand-written: these are a few sums; the statistics libraries at hand (Boost.Math, Eigen) have
// no forecast-accuracy measures, and the conventions (finals > 0 for MAPE, the sign) are ours.
Accuracy Accuracy::measure(std::span<const double> forecasts, std::span<const double> finals,
                           std::optional<double> scale) {
  if (forecasts.size() != finals.size())
    throw std::invalid_argument("accuracy: forecasts and finals differ in length");
  Accuracy a;
  a.count = static_cast<std::int64_t>(forecasts.size());
  if (a.count == 0)
    return a;
  double sumAbs = 0, sumSq = 0, sum = 0, sumFinal = 0, sumPct = 0;
  std::int64_t pctCount = 0;
  for (std::size_t i = 0; i < forecasts.size(); ++i) {
    const double e = forecasts[i] - finals[i];
    sumAbs += std::abs(e);
    sumSq += e * e;
    sum += e;
    sumFinal += finals[i];
    if (finals[i] > 0) {
      sumPct += std::abs(100.0 * e / finals[i]);
      ++pctCount;
    }
  }
  const double n = static_cast<double>(a.count);
  a.mae = sumAbs / n;
  a.rmse = std::sqrt(sumSq / n);
  a.bias = sum / n;
  if (pctCount > 0)
    a.mape = sumPct / static_cast<double>(pctCount);
  if (sumFinal > 0)
    a.wape = 100.0 * sumAbs / sumFinal;
  if (scale && *scale > 0)
    a.mase = a.mae / *scale;
  return a;
}

std::optional<double> naiveScale(std::span<const double> insample, int lag) {
  if (lag < 1 || insample.size() <= static_cast<std::size_t>(lag))
    return std::nullopt;
  const auto l = static_cast<std::size_t>(lag);
  double sum = 0;
  for (std::size_t i = l; i < insample.size(); ++i)
    sum += std::abs(insample[i] - insample[i - l]);
  return sum / static_cast<double>(insample.size() - l);
}

} // namespace cb
