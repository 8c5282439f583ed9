#include "core/errorwindow.h"

#include "core/backtest.h"

#include <algorithm>
#include <stdexcept>
#include <tuple>

namespace cb {

LeadBuckets::LeadBuckets(std::vector<int> upperBounds) : bounds_(std::move(upperBounds)) {
  for (std::size_t i = 0; i < bounds_.size(); ++i)
    if (bounds_[i] < 1 || (i > 0 && bounds_[i] <= bounds_[i - 1]))
      throw std::invalid_argument("lead bucket bounds must be positive and increasing");
}

int LeadBuckets::bucketOf(int lead) const {
  return static_cast<int>(std::lower_bound(bounds_.begin(), bounds_.end(), lead) - bounds_.begin());
}

std::string LeadBuckets::label(int bucket) const {
  const auto b = static_cast<std::size_t>(bucket);
  const int first = b == 0 ? 1 : bounds_[b - 1] + 1;
  if (b >= bounds_.size())
    return std::to_string(first) + "+";
  if (first == bounds_[b])
    return std::to_string(first);
  return std::to_string(first) + "-" + std::to_string(bounds_[b]);
}

namespace {
auto key(const LeadBuckets &buckets, const BacktestRow &r) {
  return std::make_tuple(r.series, r.method, buckets.bucketOf(r.lead), r.night);
}
} // namespace

ErrorWindow::ErrorWindow(std::span<const BacktestRow> rows, LeadBuckets buckets)
    : buckets_(std::move(buckets)), rows_(rows.begin(), rows.end()) {
  std::stable_sort(rows_.begin(), rows_.end(), [this](const BacktestRow &a, const BacktestRow &b) {
    return key(buckets_, a) < key(buckets_, b);
  });
}

ErrorWindow::~ErrorWindow() = default;

std::span<const BacktestRow> ErrorWindow::all() const { return rows_; }

std::span<const BacktestRow> ErrorWindow::rows(std::uint32_t series, std::uint32_t method,
                                               int bucket, Date firstNight, Date lastNight) const {
  if (lastNight < firstNight)
    return {};
  const auto lo = std::make_tuple(series, method, bucket, firstNight);
  const auto hi = std::make_tuple(series, method, bucket, lastNight);
  auto first =
      std::lower_bound(rows_.begin(), rows_.end(), lo, [this](const BacktestRow &r, const auto &k) {
        return key(buckets_, r) < k;
      });
  auto last = std::upper_bound(first, rows_.end(), hi, [this](const auto &k, const BacktestRow &r) {
    return k < key(buckets_, r);
  });
  return {first, last};
}

} // namespace cb
