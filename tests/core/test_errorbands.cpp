// Error bands: type-7 quantiles of residuals added to the forecast, floored at 0, only from
// errors known at the reading date; coverage on a hand-made set.
#include "core/backtest.h"
#include "core/errorbands.h"

#include <gtest/gtest.h>

#include <numeric>

TEST(ErrorBands, TypeSevenQuantilesOfResiduals) {
  // Source: check-values.md §6, type-7 quantiles of 1..10 at 0.1 and 0.9 are 1.9 and 9.1
  // (R quantile(type = 7) = numpy 'linear').
  std::vector<double> r(10);
  std::iota(r.begin(), r.end(), 1.0);
  const auto b = cb::ErrorBands::fromResiduals(r, 20.0, {});
  ASSERT_TRUE(b);
  EXPECT_NEAR(b->lo, 21.9, 1e-12);
  EXPECT_NEAR(b->hi, 29.1, 1e-12);
  // Source: check-values.md §6, data 60 62 65 70 95 110 80 at 0.05 / 0.95 → 60.6 / 105.5.
  cb::BandOptions o;
  o.lower = 0.05;
  o.upper = 0.95;
  o.minCount = 7;
  const std::vector<double> s = {60, 62, 65, 70, 95, 110, 80};
  const auto c = cb::ErrorBands::fromResiduals(s, 0.0, o);
  EXPECT_NEAR(c->lo, 60.6, 1e-12);
  EXPECT_NEAR(c->hi, 105.5, 1e-12);
  // Floor at 0 (hand-worked): residuals −10 … −1, forecast 5 → 5 − 9.1 < 0 and 5 − 1.9 = 3.1.
  std::vector<double> neg(10);
  std::iota(neg.begin(), neg.end(), -10.0);
  const auto f = cb::ErrorBands::fromResiduals(neg, 5.0, {});
  EXPECT_DOUBLE_EQ(f->lo, 0.0);
  EXPECT_NEAR(f->hi, 3.1, 1e-12);
  // Fewer than minCount (10) residuals: no band.
  EXPECT_FALSE(cb::ErrorBands::fromResiduals(std::vector<double>(9, 1.0), 5.0, {}));
}

TEST(ErrorBands, CoverageOfAHandMadeSet) {
  // Inside: 2 ∈ [0, 2] (edge), 0 ∉ [1, 3], 5.5 ∈ [5, 6], 2 ∈ [2, 2] (edge), 7 ∉ [5, 6.9] → 3/5.
  const std::vector<cb::Band> bands = {{0, 2}, {1, 3}, {5, 6}, {2, 2}, {5, 6.9}};
  const std::vector<double> finals = {2, 0, 5.5, 2, 7};
  EXPECT_DOUBLE_EQ(*cb::bandCoverage(bands, finals), 0.6);
  EXPECT_FALSE(cb::bandCoverage({}, {}));
  EXPECT_THROW(cb::bandCoverage(bands, std::vector<double>{1}), std::invalid_argument);
}

TEST(ErrorBands, OnlyNightsFinalAtTheReadingDate) {
  // Lead-7 rows of nights 1–20 March: residuals 1 … 10 on nights 1–10, 100 afterwards.
  std::vector<cb::BacktestRow> rows;
  for (unsigned n = 1; n <= 20; ++n) {
    cb::BacktestRow r;
    r.night = cb::Date::fromYmd(2026, 3, n);
    r.reading = r.night - 7;
    r.lead = 7;
    r.forecast = 10;
    r.final = n <= 10 ? 10.0 + n : 110.0;
    rows.push_back(r);
  }
  const cb::ErrorWindow window(rows, cb::LeadBuckets{});
  const cb::ErrorBands bands(window, {});
  const int bucket = window.buckets().bucketOf(7);
  const auto b = bands.band(0, 0, bucket, cb::Date::fromYmd(2026, 3, 10), 50.0);
  ASSERT_TRUE(b);
  EXPECT_NEAR(b->lo, 51.9, 1e-12);
  EXPECT_NEAR(b->hi, 59.1, 1e-12);
  // Another lead bucket has no residuals.
  EXPECT_FALSE(bands.band(0, 0, window.buckets().bucketOf(1), cb::Date::fromYmd(2026, 3, 10), 50));
}
