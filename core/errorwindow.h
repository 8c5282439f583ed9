// Backtest errors looked up by series, method, lead bucket and a range of nights: what auto
// selection and error bands read, always limited to nights whose final is known.
#pragma once

#include "core/date.h"

#include <cstdint>
#include <span>
#include <string>
#include <vector>

namespace cb {

struct BacktestRow;

/// Groups leads: bucket i holds the leads in (bound[i−1], bound[i]]; leads beyond the last bound
/// fall in one more bucket. With the default bounds each default backtest lead is its own bucket,
/// and a 90-day forecast uses 7 buckets: 1, 2–3, 4–7, 8–14, 15–30, 31–60, 61–90.
class LeadBuckets {
public:
  LeadBuckets() : LeadBuckets(std::vector<int>{1, 3, 7, 14, 30, 60, 90}) {}
  /// Bounds must be positive and increasing (else std::invalid_argument).
  explicit LeadBuckets(std::vector<int> upperBounds);
  int bucketOf(int lead) const;
  int count() const { return static_cast<int>(bounds_.size()) + 1; }
  /// "1", "2-3", …, "91+".
  std::string label(int bucket) const;

private:
  std::vector<int> bounds_;
};

/// An index over backtest rows. Example: `ErrorWindow w(rows, {});`
/// `w.rows(0, 2, w.buckets().bucketOf(7), t - 55, t)` = rows of series 0, method 2, lead 7
/// whose nights lie in the 56 days up to t.
class ErrorWindow {
public:
  ErrorWindow(std::span<const BacktestRow> rows, LeadBuckets buckets);
  ~ErrorWindow();
  const LeadBuckets &buckets() const { return buckets_; }
  /// Every row, in the order rows() returns them from (spans from rows() point into this one).
  std::span<const BacktestRow> all() const;
  /// Rows of (series, method, bucket) with firstNight ≤ night ≤ lastNight, ordered by night.
  std::span<const BacktestRow> rows(std::uint32_t series, std::uint32_t method, int bucket,
                                    Date firstNight, Date lastNight) const;

private:
  LeadBuckets buckets_;
  std::vector<BacktestRow> rows_; ///< sorted by (series, method, bucket, night)
};

} // namespace cb
