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
  for (double p : probs)
    checkProbability(p);
  if (probs.empty())
    return {};
  if (values.empty())
    throw std::invalid_argument("quantile of an empty sample");
  // Only the ranks ⌊h⌋ and ⌊h⌋ + 1 of each probability are read, so they are selected in
  // ascending order (std::nth_element, each on what lies above the last) instead of sorting
  // everything: linear instead of n log n, and the same values a full sort puts there.
  const std::size_t n = values.size();
  std::vector<std::size_t> ranks;
  for (double p : probs) {
    const auto i = static_cast<std::size_t>(std::floor(static_cast<double>(n - 1) * p));
    ranks.push_back(i);
    if (i + 1 < n)
      ranks.push_back(i + 1);
  }
  std::sort(ranks.begin(), ranks.end());
  ranks.erase(std::unique(ranks.begin(), ranks.end()), ranks.end());
  auto from = values.begin();
  for (std::size_t r : ranks) {
    const auto at = values.begin() + static_cast<std::ptrdiff_t>(r);
    std::nth_element(from, at, values.end());
    from = at + 1;
  }
  std::vector<double> out;
  out.reserve(probs.size());
  for (double p : probs) {
    // As quantileType7Sorted, reading only the selected ranks.
    const double h = static_cast<double>(n - 1) * p;
    const double lo = std::floor(h);
    const auto i = static_cast<std::size_t>(lo);
    out.push_back(i + 1 >= n ? values[i] : values[i] + (h - lo) * (values[i + 1] - values[i]));
  }
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
