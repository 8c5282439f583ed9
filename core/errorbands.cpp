#include "core/errorbands.h"

#include "core/backtest.h"
#include "core/quantile.h"

#include <algorithm>
#include <array>
#include <cmath>
#include <stdexcept>
#include <tuple>
#include <vector>

namespace cb {

ErrorBands::ErrorBands(const ErrorWindow &window, BandOptions options)
    : window_(window), options_(options) {
  if (options_.calibrationDays <= 0)
    return;
  const std::span<const BacktestRow> all = window_.all();
  base_.reserve(all.size());
  for (const BacktestRow &r : all) {
    const int b = window_.buckets().bucketOf(r.lead);
    const Key key{r.series, r.method, b, r.reading.days()};
    auto it = quantiles_.find(key);
    if (it == quantiles_.end())
      it = quantiles_.emplace(key, residualQuantiles(r.series, r.method, b, r.reading)).first;
    base_.push_back(it->second);
  }
}

ErrorBands::Quantiles ErrorBands::residualQuantiles(std::uint32_t series, std::uint32_t method,
                                                    int bucket, Date readingDate) const {
  const auto rows =
      window_.rows(series, method, bucket, readingDate - (options_.windowDays - 1), readingDate);
  if (rows.empty() || static_cast<int>(rows.size()) < options_.minCount)
    return std::nullopt;
  std::vector<double> residuals;
  residuals.reserve(rows.size());
  for (const BacktestRow &r : rows)
    residuals.push_back(r.final - r.forecast);
  const std::array<double, 2> probs = {options_.lower, options_.upper};
  const std::vector<double> q = quantilesType7(std::move(residuals), probs);
  return std::pair{q[0], q[1]};
}

std::optional<double> ErrorBands::correction(std::uint32_t series, std::uint32_t method, int bucket,
                                             Date readingDate) const {
  const auto rows = window_.rows(series, method, bucket,
                                 readingDate - (options_.calibrationDays - 1), readingDate);
  const BacktestRow *first = window_.all().data();
  std::vector<double> scores;
  scores.reserve(rows.size());
  for (const BacktestRow &r : rows)
    if (const auto &b = base_[static_cast<std::size_t>(&r - first)])
      scores.push_back(score(r.forecast + b->first, r.forecast + b->second, r.final));
  if (static_cast<int>(scores.size()) < options_.minCount)
    return std::nullopt;
  return conformalQuantile(std::move(scores), options_.upper - options_.lower);
}

std::optional<Band> ErrorBands::band(std::uint32_t series, std::uint32_t method, int bucket,
                                     Date readingDate, double forecast) const {
  const Key key{series, method, bucket, readingDate.days()};
  Quantiles q;
  std::optional<double> corr;
  {
    // Held while a missing offset is worked out: two threads asking for the same key do the
    // work once, and a band costs a look-up once its key is known.
    std::lock_guard lock(memoMutex_);
    if (auto it = quantiles_.find(key); it != quantiles_.end()) {
      q = it->second;
    } else {
      auto e = extraQuantiles_.find(key);
      if (e == extraQuantiles_.end())
        e = extraQuantiles_.emplace(key, residualQuantiles(series, method, bucket, readingDate))
                .first;
      q = e->second;
    }
    if (!q)
      return std::nullopt;
    if (options_.calibrationDays > 0) {
      auto c = corrections_.find(key);
      if (c == corrections_.end())
        c = corrections_.emplace(key, correction(series, method, bucket, readingDate)).first;
      corr = c->second;
    }
  }
  double lo = forecast + q->first, hi = forecast + q->second;
  if (corr) {
    lo -= *corr;
    hi += *corr;
    if (lo > hi) // a negative correction can cross the edges; the band then shrinks to a point
      lo = hi = (lo + hi) / 2;
  }
  return Band{std::max(0.0, lo), std::max(0.0, hi)};
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

double ErrorBands::score(double lo, double hi, double y) { return std::max(lo - y, y - hi); }

double ErrorBands::conformalQuantile(std::vector<double> scores, double level) {
  // Not a type-7 quantile: the finite-sample rank ⌈(n + 1)(1 − α)⌉ is what gives conformal
  // prediction its coverage guarantee under exchangeability. The small tolerance keeps
  // 10 × 0.8 at rank 8 despite binary rounding.
  if (scores.empty())
    throw std::invalid_argument("conformal quantile of no scores");
  const auto n = scores.size();
  const double rank = std::ceil(static_cast<double>(n + 1) * level - 1e-9);
  const auto k = std::clamp<std::size_t>(static_cast<std::size_t>(std::max(rank, 1.0)), 1, n);
  std::nth_element(scores.begin(), scores.begin() + static_cast<std::ptrdiff_t>(k - 1),
                   scores.end());
  return scores[k - 1];
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
