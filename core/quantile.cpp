// Written by hand: Boost.Math's statistics offer a median but no quantile at an arbitrary
// probability, and the type-7 rule is a few lines once the data are sorted.
#include "core/quantile.h"

#include <algorithm>
#include <cmath>
#include <stdexcept>

namespace cb {
namespace {

void checkProbability(double p) {
  if (!(p >= 0.0 && p <= 1.0))
    throw std::invalid_argument("quantile probability must be between 0 and 1");
}

} // namespace

double quantileType7Sorted(std::span<const double> sorted, double p) {
  checkProbability(p);
  if (sorted.empty())
    throw std::invalid_argument("quantile of an empty sample");
  const double h = static_cast<double>(sorted.size() - 1) * p;
  const double lo = std::floor(h);
  const auto i = static_cast<std::size_t>(lo);
  if (i + 1 >= sorted.size())
    return sorted[i];
  return sorted[i] + (h - lo) * (sorted[i + 1] - sorted[i]);
}

double quantileType7(std::vector<double> values, double p) {
  std::sort(values.begin(), values.end());
  return quantileType7Sorted(values, p);
}

std::vector<double> quantilesType7(std::vector<double> values, std::span<const double> probs) {
  std::sort(values.begin(), values.end());
  std::vector<double> out;
  out.reserve(probs.size());
  for (double p : probs)
    out.push_back(quantileType7Sorted(values, p));
  return out;
}

double quantileType7Counts(std::vector<std::pair<double, std::int64_t>> counted, double p) {
  checkProbability(p);
  std::erase_if(counted, [](const auto &vc) { return vc.second <= 0; });
  std::sort(counted.begin(), counted.end());
  std::int64_t n = 0;
  for (const auto &vc : counted)
    n += vc.second;
  if (n == 0)
    throw std::invalid_argument("quantile of an empty sample");
  // Position h in the expanded sample, then the values at 0-based ranks ⌊h⌋ and ⌊h⌋ + 1.
  const double h = static_cast<double>(n - 1) * p;
  const double lo = std::floor(h);
  const auto rank = static_cast<std::int64_t>(lo);
  auto valueAt = [&](std::int64_t r) {
    std::int64_t seen = 0;
    for (const auto &vc : counted) {
      seen += vc.second;
      if (r < seen)
        return vc.first;
    }
    return counted.back().first;
  };
  const double a = valueAt(rank);
  if (rank + 1 >= n)
    return a;
  return a + (h - lo) * (valueAt(rank + 1) - a);
}

} // namespace cb
