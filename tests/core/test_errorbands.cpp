// Error bands: type-7 quantiles of residuals added to the forecast, floored at 0, only from
// errors known at the reading date; the conformal correction on hand-worked rows; coverage on a
// hand-made set.
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

TEST(ErrorBands, ConformalScoreAndQuantile) {
  // Hand-worked: y = 10 above [5, 8] by 2; y = 6 inside, 1 from the lower edge and 2 from the
  // upper, so the score is max(5 − 6, 6 − 8) = −1.
  EXPECT_DOUBLE_EQ(cb::ErrorBands::score(5, 8, 10), 2.0);
  EXPECT_DOUBLE_EQ(cb::ErrorBands::score(5, 8, 6), -1.0);
  // Rank ⌈(n + 1)·0.8⌉ (Romano, Patterson & Candès 2019, from memory): n = 10 → ⌈8.8⌉ = 9th.
  std::vector<double> s(10);
  std::iota(s.begin(), s.end(), 1.0);
  EXPECT_DOUBLE_EQ(cb::ErrorBands::conformalQuantile(s, 0.8), 9.0);
  // n = 4 → ⌈5 × 0.8⌉ = ⌈4.0⌉ = 4th, not the 5th that binary rounding of 4.0 could give.
  EXPECT_DOUBLE_EQ(cb::ErrorBands::conformalQuantile({4, 1, 3, 2}, 0.8), 4.0);
  // n = 3 → rank ⌈3.2⌉ = 4 passes n: the largest.
  EXPECT_DOUBLE_EQ(cb::ErrorBands::conformalQuantile({-1, 7, 2}, 0.8), 7.0);
  EXPECT_THROW(cb::ErrorBands::conformalQuantile({}, 0.8), std::invalid_argument);
}

TEST(ErrorBands, ConformalCorrectionFromKnownOutcomesOnly) {
  // Lead-1 rows of nights 1–6 March, forecast 10, residuals 0, 1, 3, 6, 10, 15. With a 1-day
  // base window each base band is [F + r(s − 1), F + r(s − 1)], so the score of night s is
  // |r(s) − r(s − 1)|: 1, 2, 3, 4, 5 for nights 2–6 (night 1 has no earlier residual).
  const std::vector<double> residual = {0, 1, 3, 6, 10, 15};
  std::vector<cb::BacktestRow> rows;
  for (unsigned n = 1; n <= 6; ++n) {
    cb::BacktestRow r;
    r.night = cb::Date::fromYmd(2026, 3, n);
    r.reading = r.night - 1;
    r.lead = 1;
    r.forecast = 10;
    r.final = 10 + residual[n - 1];
    rows.push_back(r);
  }
  cb::BandOptions o;
  o.windowDays = 1;
  o.minCount = 1;
  o.calibrationDays = 10;
  const cb::ErrorWindow window(rows, cb::LeadBuckets{});
  const int bucket = window.buckets().bucketOf(1);
  {
    // At 5 March: base [50 + 10, 50 + 10]; scores of nights 2–5 are 1, 2, 3, 4 (night 6 is not
    // final yet); rank ⌈5 × 0.8⌉ = 4 → Q = 4 → [56, 64].
    const cb::ErrorBands bands(window, o);
    const auto b = bands.band(0, 0, bucket, cb::Date::fromYmd(2026, 3, 5), 50.0);
    ASSERT_TRUE(b);
    EXPECT_DOUBLE_EQ(b->lo, 56.0);
    EXPECT_DOUBLE_EQ(b->hi, 64.0);
  }
  {
    // A 2-day calibration window at 6 March: nights 5 and 6, scores 4 and 5; rank ⌈2.4⌉ = 3
    // passes n = 2, so Q = 5; base [50 + 15, 50 + 15] → [60, 70].
    o.calibrationDays = 2;
    const cb::ErrorBands bands(window, o);
    const auto b = bands.band(0, 0, bucket, cb::Date::fromYmd(2026, 3, 6), 50.0);
    ASSERT_TRUE(b);
    EXPECT_DOUBLE_EQ(b->lo, 60.0);
    EXPECT_DOUBLE_EQ(b->hi, 70.0);
  }
  {
    // Base window 2 days, minCount 2. At 3 March the base is Q7({1, 3}) = 1.2 and 2.8; the only
    // score is night 3's (its base from residuals 0, 1 is [10.1, 10.9], y = 13 → 2.1): one score
    // is fewer than minCount, so no correction → [51.2, 52.8].
    o.windowDays = 2;
    o.minCount = 2;
    const cb::ErrorBands bands(window, o);
    const auto b = bands.band(0, 0, bucket, cb::Date::fromYmd(2026, 3, 3), 50.0);
    ASSERT_TRUE(b);
    EXPECT_NEAR(b->lo, 51.2, 1e-12);
    EXPECT_NEAR(b->hi, 52.8, 1e-12);
    // At 4 March night 4 adds its score (base Q7({1, 3}) → [11.2, 12.8], y = 16 → 3.2); rank
    // ⌈3 × 0.8⌉ = 3 passes n = 2 → Q = 3.2. Base Q7({3, 6}) = 3.3, 5.7 → [50.1, 58.9].
    const auto c = bands.band(0, 0, bucket, cb::Date::fromYmd(2026, 3, 4), 50.0);
    ASSERT_TRUE(c);
    EXPECT_NEAR(c->lo, 50.1, 1e-12);
    EXPECT_NEAR(c->hi, 58.9, 1e-12);
  }
  {
    // Calibration off: the base band alone, [50 + 10, 50 + 10] at 5 March.
    o.windowDays = 1;
    o.minCount = 1;
    o.calibrationDays = 0;
    const cb::ErrorBands bands(window, o);
    const auto b = bands.band(0, 0, bucket, cb::Date::fromYmd(2026, 3, 5), 50.0);
    ASSERT_TRUE(b);
    EXPECT_DOUBLE_EQ(b->lo, 60.0);
    EXPECT_DOUBLE_EQ(b->hi, 60.0);
  }
}

TEST(ErrorBands, RememberedOffsetsGiveWhatAFreshObjectGives) {
  // band() remembers each key's quantiles and correction. Asking one object many keys, in two
  // orders and each twice with other forecasts, must give what a new object gives for each
  // question alone. Rows as in ConformalCorrectionFromKnownOutcomesOnly for series 0, method 0,
  // lead 1; the same nights scaled for another series, another method and another lead bucket
  // (lead 10), so a key that left one of them out would hand one its neighbour's offsets.
  const std::vector<double> residual = {0, 1, 3, 6, 10, 15};
  std::vector<cb::BacktestRow> rows;
  for (std::uint32_t series : {0u, 1u})
    for (std::uint32_t method : {0u, 1u})
      for (int lead : {1, 10})
        for (unsigned n = 1; n <= 6; ++n) {
          cb::BacktestRow r;
          r.night = cb::Date::fromYmd(2026, 3, n);
          r.lead = lead;
          r.reading = r.night - lead;
          r.series = series;
          r.method = method;
          r.forecast = 10;
          r.final = 10 + residual[n - 1] * (1 + series + 2 * method + (lead > 1 ? 4 : 0));
          rows.push_back(r);
        }
  const cb::ErrorWindow window(rows, cb::LeadBuckets{});
  const int bucket = window.buckets().bucketOf(1);
  for (const int calibration : {0, 10}) {
    cb::BandOptions o;
    o.windowDays = 2;
    o.minCount = 1;
    o.calibrationDays = calibration;
    // Reading dates 28 Feb … 9 Mar: the rows' own and later ones no row has.
    std::vector<cb::Date> days;
    for (int d = 0; d < 10; ++d)
      days.push_back(cb::Date::fromYmd(2026, 2, 28) + d);
    struct Ask {
      std::uint32_t series, method;
      int bucket;
      cb::Date t;
    };
    std::vector<Ask> asks;
    for (std::uint32_t series : {0u, 1u})
      for (std::uint32_t method : {0u, 1u})
        for (int b : {bucket, window.buckets().bucketOf(10)})
          for (cb::Date t : days)
            asks.push_back({series, method, b, t});
    const cb::ErrorBands kept(window, o);
    for (const bool reverse : {false, true})
      for (std::size_t i = 0; i < asks.size(); ++i) {
        const Ask &a = asks[reverse ? asks.size() - 1 - i : i];
        for (const double f : {50.0, 20.0, 50.0}) {
          const cb::ErrorBands fresh(window, o);
          const auto want = fresh.band(a.series, a.method, a.bucket, a.t, f);
          const auto got = kept.band(a.series, a.method, a.bucket, a.t, f);
          const std::string where = a.t.toIso() + " series " + std::to_string(a.series) +
                                    " method " + std::to_string(a.method) + " bucket " +
                                    std::to_string(a.bucket) + " calibration " +
                                    std::to_string(calibration);
          ASSERT_EQ(want.has_value(), got.has_value()) << where;
          if (want) {
            EXPECT_EQ(want->lo, got->lo) << where;
            EXPECT_EQ(want->hi, got->hi) << where;
          }
        }
      }
  }
  // One hand-worked value through the remembered path (see the test above): 1-day window,
  // calibration 10 at 5 March gives offsets +6 and +14, whatever the forecast asked before.
  cb::BandOptions o;
  o.windowDays = 1;
  o.minCount = 1;
  o.calibrationDays = 10;
  const cb::ErrorBands bands(window, o);
  const auto a = bands.band(0, 0, bucket, cb::Date::fromYmd(2026, 3, 5), 50.0);
  const auto b = bands.band(0, 0, bucket, cb::Date::fromYmd(2026, 3, 5), 20.0);
  ASSERT_TRUE(a && b);
  EXPECT_DOUBLE_EQ(a->lo, 56.0);
  EXPECT_DOUBLE_EQ(a->hi, 64.0);
  EXPECT_DOUBLE_EQ(b->lo, 26.0);
  EXPECT_DOUBLE_EQ(b->hi, 34.0);
}
