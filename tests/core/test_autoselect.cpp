// Auto selection: the choice uses only errors of nights already final at the reading date, and
// the criterion changes the choice when MAE and RMSE disagree (hand-made error sets).
#include "core/autoselect.h"
#include "core/backtest.h"

#include <gtest/gtest.h>

using cb::Date;

namespace {

Date d(unsigned day) { return Date::fromYmd(2026, 3, day); }

cb::BacktestRow row(std::uint32_t method, Date night, double error) {
  cb::BacktestRow r;
  r.night = night;
  r.reading = night - 1;
  r.lead = 1;
  r.method = method;
  r.final = 50;
  r.forecast = 50 + error;
  return r;
}

} // namespace

TEST(AutoSelect, OnlyErrorsKnownAtTheReadingDateCount) {
  // Method 0 was off by 1 on nights 1–10 and by 10 on nights 11–20; method 1 by 3, then by 0.
  // At t = 10 only nights ≤ 10 are final: method 0 wins. With nights 11–20 (the future at t) it
  // would lose, and at t = 20 with a 10-day window it does.
  std::vector<cb::BacktestRow> rows;
  for (unsigned n = 1; n <= 20; ++n) {
    rows.push_back(row(0, d(n), n <= 10 ? 1.0 : -10.0));
    rows.push_back(row(1, d(n), n <= 10 ? 3.0 : 0.0));
  }
  const cb::ErrorWindow window(rows, cb::LeadBuckets{});
  cb::AutoSelectOptions o;
  o.windowDays = 10;
  o.minCount = 5;
  const cb::AutoSelector sel(window, {0, 1}, o);
  const cb::AutoChoice at10 = sel.choose(0, 0, d(10));
  ASSERT_EQ(at10.method, 0u);
  ASSERT_EQ(at10.evidence.size(), 2u);
  EXPECT_EQ(at10.evidence[0].count, 10);
  EXPECT_DOUBLE_EQ(at10.evidence[0].error, 1.0);
  EXPECT_DOUBLE_EQ(at10.evidence[1].error, 3.0);
  EXPECT_EQ(sel.choose(0, 0, d(20)).method, 1u);
  // At t = 12 the window is nights 3–12: method 0 MAE (8·1 + 2·10)/10 = 2.8 < 3 (method 1: 2.4).
  const cb::AutoChoice at12 = sel.choose(0, 0, d(12));
  EXPECT_EQ(at12.method, 1u);
  EXPECT_DOUBLE_EQ(at12.evidence[0].error, 2.4);
  EXPECT_DOUBLE_EQ(at12.evidence[1].error, 2.8);
  // Too few known errors (night 1–4 only at t = 4): no choice, no evidence.
  const cb::AutoChoice at4 = sel.choose(0, 0, d(4));
  EXPECT_FALSE(at4.method);
  EXPECT_TRUE(at4.evidence.empty());
  // Another series or lead bucket has no errors at all.
  EXPECT_FALSE(sel.choose(1, 0, d(20)).method);
  EXPECT_FALSE(sel.choose(0, 3, d(20)).method);
}

TEST(AutoSelect, CriterionDecides) {
  // Method 0 errors 0, 0, 0, 6: MAE 1.5, RMSE 3. Method 1 errors 2, 2, 2, −2: MAE 2, RMSE 2,
  // bias 1 (|bias| of method 0 is 1.5).
  std::vector<cb::BacktestRow> rows;
  const double e0[] = {0, 0, 0, 6}, e1[] = {2, 2, 2, -2};
  for (unsigned n = 0; n < 4; ++n) {
    rows.push_back(row(0, d(n + 1), e0[n]));
    rows.push_back(row(1, d(n + 1), e1[n]));
  }
  const cb::ErrorWindow window(rows, cb::LeadBuckets{});
  cb::AutoSelectOptions o;
  o.minCount = 4;
  EXPECT_EQ(cb::AutoSelector(window, {0, 1}, o).choose(0, 0, d(4)).method, 0u);
  o.criterion = cb::SelectionCriterion::Rmse;
  EXPECT_EQ(cb::AutoSelector(window, {0, 1}, o).choose(0, 0, d(4)).method, 1u);
  o.criterion = cb::SelectionCriterion::AbsBias;
  EXPECT_EQ(cb::AutoSelector(window, {0, 1}, o).choose(0, 0, d(4)).method, 1u);
  // WAPE = Σ|e| / Σ final: 6/200 vs 8/200 → method 0.
  o.criterion = cb::SelectionCriterion::Wape;
  const auto w = cb::AutoSelector(window, {0, 1}, o).choose(0, 0, d(4));
  EXPECT_EQ(w.method, 0u);
  EXPECT_DOUBLE_EQ(w.evidence[0].error, 3.0);
  // The default minCount (8) finds four errors too few.
  EXPECT_EQ(cb::AutoSelector(window, {1, 0}, {}).choose(0, 0, d(4)).method, std::nullopt);
  EXPECT_EQ(cb::parseCriterion("rmse"), cb::SelectionCriterion::Rmse);
  EXPECT_FALSE(cb::parseCriterion("r2"));
}

TEST(LeadBuckets, DefaultBoundsAndLabels) {
  const cb::LeadBuckets b;
  EXPECT_EQ(b.bucketOf(1), 0);
  EXPECT_EQ(b.bucketOf(2), 1);
  EXPECT_EQ(b.bucketOf(3), 1);
  EXPECT_EQ(b.bucketOf(90), 6);
  EXPECT_EQ(b.bucketOf(91), 7);
  EXPECT_EQ(b.label(0), "1");
  EXPECT_EQ(b.label(1), "2-3");
  EXPECT_EQ(b.label(7), "91+");
  EXPECT_THROW(cb::LeadBuckets({3, 3}), std::invalid_argument);
}
