// No NaN or infinity reaches a screen or an export (issue 9): the entry points the screens and
// the command line read (outlook, forecast run, backtest accuracy, pace, booking window) are fed
// the degenerate cases — a property with 0 rooms, a segment with no history, nights whose finals
// are 0 everywhere — and every number they return must be finite.
#include "core/accuracy.h"
#include "core/backtest.h"
#include "core/bookingwindow.h"
#include "core/forecastrun.h"
#include "core/holidaymap.h"
#include "core/outlook.h"
#include "core/pace.h"

#include "testsupport.h"

#include <gtest/gtest.h>

#include <cmath>

namespace {

cb::Date d(const char *iso) { return *cb::Date::parseIso(iso); }

/// Counts every number checked, so a test that checked nothing fails.
struct FiniteCheck {
  std::int64_t checked = 0;
  void operator()(double v, const std::string &what) {
    ++checked;
    EXPECT_TRUE(std::isfinite(v)) << what << " = " << v;
  }
  void operator()(const std::optional<double> &v, const std::string &what) {
    if (v)
      (*this)(*v, what);
  }
};

std::vector<cb::Reservation> pricedQuarter() {
  auto rows = cbtest::steadyQuarterRows();
  for (auto &r : rows)
    r.rate = r.segment == "CORP" ? 100.0 : 130.0;
  return rows;
}

/// The steady quarter with every booking cancelled the day it was made: every final is 0.
std::vector<cb::Reservation> allCancelled() {
  auto rows = pricedQuarter();
  for (auto &r : rows) {
    r.status = cb::ReservationStatus::Cancelled;
    r.cancelledOn = r.bookedOn;
  }
  return rows;
}

cb::Property property(int capacity) {
  cb::Property p;
  p.name = "Finite house";
  p.capacity = capacity;
  return p;
}

void checkOutlook(const cb::Outlook &ol, FiniteCheck &check) {
  for (const auto &n : ol.nights) {
    const std::string at = "night " + n.night.toIso() + " ";
    check(n.otbRevenue, at + "otbRevenue");
    check(n.forecast, at + "forecast");
    check(n.lo, at + "lo");
    check(n.hi, at + "hi");
    check(n.sd, at + "sd");
    check(n.constrained, at + "constrained");
    check(n.spill, at + "spill");
    check(n.pSellout, at + "pSellout");
    check(n.occupancy, at + "occupancy");
    check(n.adr, at + "adr");
    check(n.revpar, at + "revpar");
  }
  for (const auto &m : ol.minStays) {
    check(m.pSellout, "minStay pSellout");
    check(m.before, "minStay before");
    check(m.after, "minStay after");
  }
}

void checkRun(const cb::ForecastRun &run, FiniteCheck &check) {
  for (const auto &v : run.values) {
    const std::string at = v.series + " " + v.night.toIso() + " ";
    check(v.forecast, at + "forecast");
    check(v.lo, at + "lo");
    check(v.hi, at + "hi");
    check(v.sd, at + "sd");
  }
}

void checkAccuracy(const cb::Accuracy &a, const std::string &at, FiniteCheck &check) {
  check(a.mae, at + "mae");
  check(a.rmse, at + "rmse");
  check(a.mape, at + "mape");
  check(a.wape, at + "wape");
  check(a.bias, at + "bias");
  check(a.mase, at + "mase");
}

void checkBacktest(const std::vector<cb::Reservation> &rows, const cb::Property &p, cb::SeriesBy by,
                   FiniteCheck &check) {
  cb::BacktestOptions o;
  o.from = d("2026-02-20");
  o.to = d("2026-03-10");
  o.leads = {1, 3, 7};
  o.methods = {"pickup-add", "pickup-mult", "auto"};
  o.threads = 1;
  const cb::CurveCube cube = cb::Backtest::buildCube(rows, o, by);
  const cb::BacktestResult r = cb::Backtest::run(cube, p, o);
  ASSERT_FALSE(r.rows.empty());
  for (const auto &row : r.rows) {
    check(row.forecast, "backtest forecast");
    check(row.lo, "backtest lo");
    check(row.hi, "backtest hi");
  }
  for (const auto &s : cb::Backtest::summarize(r)) {
    checkAccuracy(s.accuracy, "summary ", check);
    check(s.coverage, "coverage");
    check(s.valueAdded, "valueAdded");
  }
}

void checkPace(const std::vector<cb::Reservation> &rows, const cb::Property &p, cb::SeriesBy by,
               FiniteCheck &check) {
  cb::PaceOptions o;
  o.asOf = d("2026-03-01");
  o.firstNight = d("2026-03-01");
  o.lastNight = d("2026-03-20");
  o.by = by;
  const cb::Pace pace = cb::Pace::build(rows, p, cb::HolidayMap{}, o);
  for (std::size_t s = 0; s < pace.series().size(); ++s)
    for (cb::Date n = o.firstNight; n <= o.lastNight; n = n + 1)
      check(pace.at(s, n).diffPct, "pace diffPct " + pace.series()[s]);
}

void checkWindow(const std::vector<cb::Reservation> &rows, FiniteCheck &check) {
  cb::BookingWindowOptions o;
  o.asOf = d("2026-03-01");
  o.firstArrival = d("2026-01-01");
  o.lastArrival = d("2026-03-20");
  for (const auto &s : cb::bookingWindow(rows, o)) {
    for (const auto &rate : s.averageRate)
      check(rate, "booking window rate " + s.series);
    for (double q : s.leadQuantiles)
      check(q, "booking window quantile " + s.series);
  }
}

} // namespace

TEST(FiniteNumbers, PropertyWithNoRooms) {
  FiniteCheck check;
  const cb::Property p = property(0);
  cb::OutlookOptions o;
  o.asOf = d("2026-03-01");
  o.days = 20;
  o.threads = 1;
  const cb::Outlook ol = cb::computeOutlook(pricedQuarter(), p, cb::CensorSources{}, {}, o);
  ASSERT_FALSE(ol.nights.empty());
  checkOutlook(ol, check);
  // Nothing sells in a hotel of 0 rooms (documented at fillCapacityFigures).
  for (const auto &n : ol.nights) {
    EXPECT_EQ(n.occupancy, 0.0);
    EXPECT_EQ(n.revpar, 0.0);
  }
  // The step alone, with nothing at all: no forecast, no spread, no rooms, no revenue.
  cb::OutlookNight bare;
  cb::fillCapacityFigures(bare, 0.0);
  cb::OutlookNight one;
  one.otb = 2;
  one.otbRevenue = 200;
  one.forecast = 3;
  cb::fillCapacityFigures(one, 110.0);
  checkOutlook(cb::Outlook{{}, "", true, {bare, one}, {}, false, nullptr}, check);
  checkPace(pricedQuarter(), p, cb::SeriesBy::Total, check);
  checkBacktest(pricedQuarter(), p, cb::SeriesBy::Total, check);
  EXPECT_GT(check.checked, 300);
}

TEST(FiniteNumbers, SegmentWithNoHistory) {
  FiniteCheck check;
  auto rows = pricedQuarter();
  // A new segment: one booking, made the day before the reading date, for a night ahead.
  auto fresh = cbtest::makeReservation("NEW1", "2026-02-28", "2026-03-10", "2026-03-12", 1, "NEW");
  fresh.rate = 90;
  rows.push_back(fresh);
  const cb::Property p = property(10);
  cb::ForecastRequest req;
  req.asOf = d("2026-03-01");
  req.horizon = 20;
  req.method = "auto";
  req.by = cb::SeriesBy::Segment;
  req.threads = 1;
  const cb::ForecastRun run = cb::ForecastRun::compute(rows, p, req);
  ASSERT_FALSE(run.values.empty());
  checkRun(run, check);
  checkPace(rows, p, cb::SeriesBy::Segment, check);
  checkWindow(rows, check);
  checkBacktest(rows, p, cb::SeriesBy::Segment, check);
  EXPECT_GT(check.checked, 300);
}

TEST(FiniteNumbers, NightsWithZeroFinalsEverywhere) {
  FiniteCheck check;
  const auto rows = allCancelled();
  const cb::Property p = property(10);
  cb::OutlookOptions o;
  o.asOf = d("2026-03-01");
  o.days = 20;
  o.threads = 1;
  checkOutlook(cb::computeOutlook(rows, p, cb::CensorSources{}, {}, o), check);
  cb::ForecastRequest req;
  req.asOf = d("2026-03-01");
  req.horizon = 20;
  req.method = "auto";
  req.by = cb::SeriesBy::Segment;
  req.threads = 1;
  checkRun(cb::ForecastRun::compute(rows, p, req), check);
  checkPace(rows, p, cb::SeriesBy::Segment, check);
  checkWindow(rows, check);
  checkBacktest(rows, p, cb::SeriesBy::Segment, check);
  // The measures themselves on all-zero finals: no percentage of nothing, no scale of nothing.
  const std::vector<double> zeros(7, 0.0), ones(7, 1.0);
  const auto a = cb::Accuracy::measure(ones, zeros, cb::naiveScale(zeros, 1));
  checkAccuracy(a, "measure ", check);
  EXPECT_FALSE(a.mape);
  EXPECT_FALSE(a.wape);
  EXPECT_FALSE(a.mase);
  EXPECT_EQ(a.mae, 1.0);
  checkAccuracy(cb::Accuracy::measure(std::vector<double>{}, std::vector<double>{}), "empty ",
                check);
  EXPECT_GT(check.checked, 200);
}
