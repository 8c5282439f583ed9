// Sample quantiles, type 7 of Hyndman & Fan (1996): the definition behind every band and error
// range the workbench shows (brief section 5: "type-7 quantiles").
#pragma once

#include <cstdint>
#include <span>
#include <utility>
#include <vector>

namespace cb {

/// Type-7 quantile of sorted values (R's default `quantile(type = 7)`, numpy's 'linear'):
/// with n values x[0…n−1] and h = (n − 1)·p, Q(p) = x[⌊h⌋] + (h − ⌊h⌋)·(x[⌊h⌋+1] − x[⌊h⌋]).
/// Throws std::invalid_argument when `sorted` is empty or p is outside [0, 1].
/// Example: `quantileType7Sorted({1, 2, 3, 4}, 0.1) == 1.3`.
double quantileType7Sorted(std::span<const double> sorted, double p);

/// Same, for values in any order (sorts a copy).
double quantileType7(std::vector<double> values, double p);

/// Several probabilities at once (selects the ranks they read instead of sorting: the same
/// values as quantileType7, bit for bit). Same errors as quantileType7Sorted.
std::vector<double> quantilesType7(std::vector<double> values, std::span<const double> probs);

/// Type-7 quantile of a sample given as (value, count) pairs — each value repeated `count` times
/// (e.g. a lead time weighted by room-nights) — without expanding it. Pairs may come in any
/// order; counts ≤ 0 are ignored. Throws std::invalid_argument when the total count is 0 or p is
/// outside [0, 1].
double quantileType7Counts(std::vector<std::pair<double, std::int64_t>> counted, double p);

} // namespace cb
