// Rolling-origin backtest: exact rows of a hand-made property with a test method, the same rows
// whatever the thread count, progress and cancel, and the no-look-ahead proof for every method.
#include "core/backtest.h"
#include "core/simulator.h"
#include "testsupport.h"

#include <gtest/gtest.h>

#include <atomic>
#include <map>
#include <tuple>

using cb::Backtest;
using cb::BacktestOptions;
using cb::BacktestRow;
using cb::Date;

namespace {

Date d(int y, unsigned m, unsigned day) { return Date::fromYmd(y, m, day); }

/// Forecast = OTB(s, t) + 1: simple enough that every backtest row can be worked out by hand.
class OtbPlusOne : public cb::ForecastMethod {
public:
  std::string name() const override { return "otb-plus-one"; }
  std::string description() const override { return "Rooms on the books plus one."; }
  std::string formula() const override { return "F(s) = OTB(s,t) + 1"; }
  void fit(const cb::ForecastContext &) override { ++fits; }
  std::optional<double> forecast(const cb::ForecastContext &ctx, Date night) const override {
    const auto otb = ctx.otbNow(night);
    return otb ? std::optional<double>(*otb + 1.0) : std::nullopt;
  }
  static inline std::atomic<int> fits{0};
};

std::unique_ptr<cb::ForecastMethod> testFactory(std::string_view name, const cb::MethodOptions &o) {
  if (name == "otb-plus-one")
    return std::make_unique<OtbPlusOne>();
  return cb::makeMethod(name, o);
}

/// Every night of Jan–Mar 2026: 2 rooms booked 5 days ahead and 1 room booked the day before,
/// so Final = 3 and OTB(s, s − h) = 3 at h = 1, 2 at h = 2…5, 0 beyond.
std::vector<cb::Reservation> handRows() { return cbtest::steadyQuarterRows(); }

cb::Property property() {
  cb::Property p;
  p.name = "Test";
  p.capacity = 10;
  return p;
}

} // namespace

TEST(Backtest, HandMadeRowsAndSummary) {
  BacktestOptions o;
  o.from = d(2026, 2, 1);
  o.to = d(2026, 2, 10);
  o.leads = {7, 1, 3};
  o.methods = {"otb-plus-one"};
  o.factory = testFactory;
  o.warmUp = false;
  const auto rows = handRows();
  const cb::CurveCube cube = Backtest::buildCube(rows, o, cb::SeriesBy::Segment);
  OtbPlusOne::fits = 0;
  const cb::BacktestResult r = Backtest::run(cube, property(), o);
  ASSERT_FALSE(r.cancelled);
  EXPECT_EQ(r.series, (std::vector<std::string>{"ALL", "CORP", "LEIS"}));
  // fit() once per (method, reading date, series): 10 dates × 3 series.
  EXPECT_EQ(OtbPlusOne::fits, 30);
  ASSERT_EQ(r.rows.size(), 10u * 3u * 3u);
  // First rows: t = 02-01, series ALL, leads in increasing order.
  EXPECT_EQ(r.rows[0].reading, d(2026, 2, 1));
  EXPECT_EQ(r.rows[0].night, d(2026, 2, 2));
  EXPECT_EQ(r.rows[0].lead, 1);
  EXPECT_DOUBLE_EQ(r.rows[0].forecast, 4.0); // OTB 3 + 1
  EXPECT_DOUBLE_EQ(r.rows[0].final, 3.0);
  EXPECT_EQ(r.rows[1].lead, 3);
  EXPECT_DOUBLE_EQ(r.rows[1].forecast, 3.0); // OTB 2 + 1
  EXPECT_EQ(r.rows[2].lead, 7);
  EXPECT_DOUBLE_EQ(r.rows[2].forecast, 1.0); // OTB 0 + 1
  // Series LEIS (index 2) at lead 3: nothing on the books yet, final 1 → forecast 1, error 0.
  EXPECT_EQ(r.rows[7].series, 2u);
  EXPECT_EQ(r.rows[7].lead, 3);
  EXPECT_DOUBLE_EQ(r.rows[7].forecast, 1.0);
  EXPECT_DOUBLE_EQ(r.rows[7].final, 1.0);

  const auto summary = Backtest::summarize(r);
  ASSERT_EQ(summary.size(), 9u); // 3 series × 1 method × 3 leads
  // ALL: errors +1, 0, −2 at leads 1, 3, 7 on every night.
  EXPECT_EQ(summary[0].lead, 1);
  EXPECT_EQ(summary[0].accuracy.count, 10);
  EXPECT_DOUBLE_EQ(summary[0].accuracy.mae, 1.0);
  EXPECT_DOUBLE_EQ(summary[0].accuracy.bias, 1.0);
  EXPECT_DOUBLE_EQ(*summary[0].accuracy.mape, 100.0 / 3.0);
  EXPECT_DOUBLE_EQ(summary[1].accuracy.mae, 0.0);
  EXPECT_DOUBLE_EQ(summary[2].accuracy.mae, 2.0);
  EXPECT_DOUBLE_EQ(summary[2].accuracy.bias, -2.0);
  EXPECT_DOUBLE_EQ(summary[2].accuracy.rmse, 2.0);
  // Finals never change, so the seasonal-naive scale is 0 and MASE is undefined.
  EXPECT_FALSE(summary[0].accuracy.mase);
}

TEST(Backtest, BandsAndAutoUseOnlyEarlierOutcomes) {
  BacktestOptions o;
  o.from = d(2026, 2, 20);
  o.to = d(2026, 2, 28);
  o.leads = {1};
  o.methods = {"otb-plus-one", "auto"};
  o.factory = testFactory;
  o.autoSelect.windowDays = 7;
  o.autoSelect.minCount = 3;
  o.bands.windowDays = 7;
  o.bands.minCount = 3;
  const auto rows = handRows();
  const cb::CurveCube cube = Backtest::buildCube(rows, o, cb::SeriesBy::Total);
  const cb::BacktestResult r = Backtest::run(cube, property(), o);
  EXPECT_EQ(r.methods, (std::vector<std::string>{"otb-plus-one", "auto"}));
  ASSERT_EQ(r.rows.size(), 18u);
  for (const BacktestRow &row : r.rows) {
    // Every residual final − forecast is −1, so the band is [F − 1, F − 1] = [3, 3].
    ASSERT_TRUE(row.lo && row.hi);
    EXPECT_DOUBLE_EQ(*row.lo, 3.0);
    EXPECT_DOUBLE_EQ(*row.hi, 3.0);
    EXPECT_DOUBLE_EQ(row.forecast, 4.0);
  }
  ASSERT_FALSE(r.autoChoices.empty());
  EXPECT_EQ(r.autoChoices.front().choice.method, 0u);
  // Evidence at 02-20: nights 02-14 … 02-20, one lead-1 forecast each.
  EXPECT_EQ(r.autoChoices.front().choice.evidence.at(0).count, 7);
  const auto summary = Backtest::summarize(r, {{d(2026, 2, 25), "ALL", 3.0}});
  ASSERT_EQ(summary.size(), 2u);
  EXPECT_DOUBLE_EQ(*summary[0].coverage, 1.0);
  EXPECT_EQ(summary[0].overridden, 1);
  EXPECT_DOUBLE_EQ(*summary[0].valueAdded, 1.0); // |4 − 3| − |3 − 3|
}

TEST(Backtest, RefusesBadOptionsAndCancels) {
  BacktestOptions o;
  o.from = d(2026, 2, 1);
  o.to = d(2026, 2, 10);
  o.methods = {"no-such-method"};
  const auto rows = handRows();
  const cb::CurveCube cube = Backtest::buildCube(rows, o, cb::SeriesBy::Total);
  EXPECT_THROW(Backtest::run(cube, property(), o), cb::MethodError);
  o.methods = {"otb-plus-one"};
  o.factory = testFactory;
  o.leads = {};
  EXPECT_THROW(Backtest::run(cube, property(), o), std::invalid_argument);
  o.leads = {1};
  o.progress = [](void *, std::int64_t, std::int64_t) { return false; };
  const cb::BacktestResult r = Backtest::run(cube, property(), o);
  EXPECT_TRUE(r.cancelled);
  EXPECT_TRUE(r.rows.empty());
}

namespace {

struct SampleCase {
  cb::SampleProperty sample = cb::simulateProperty();
};
const SampleCase &sampleCase() {
  static const SampleCase c;
  return c;
}

using RowKey = std::tuple<Date, Date, std::uint32_t, int, std::uint32_t>;
std::map<RowKey, const BacktestRow *> byKey(const cb::BacktestResult &r) {
  std::map<RowKey, const BacktestRow *> m;
  for (const BacktestRow &row : r.rows)
    m[{row.reading, row.night, row.series, row.lead, row.method}] = &row;
  return m;
}

BacktestOptions sampleOptions(Date t) {
  BacktestOptions o;
  o.from = t - 2;
  o.to = t;
  o.leads = {1, 7, 30};
  o.methods = cb::methodNames();
  o.methods.push_back("auto");
  o.warmUp = false;
  o.autoSelect.minCount = 1;
  o.bands.minCount = 1;
  return o;
}

} // namespace

TEST(Backtest, SameRowsWithOneOrTwoThreads) {
  const auto &s = sampleCase().sample;
  BacktestOptions o = sampleOptions(d(2025, 6, 15));
  o.methods = {"naive", "pickup-add", "auto"};
  o.from = d(2025, 6, 1);
  const cb::CurveCube cube = Backtest::buildCube(s.reservations, o, cb::SeriesBy::Segment);
  o.threads = 1;
  const auto one = Backtest::run(cube, s.property, o);
  o.threads = 2;
  const auto two = Backtest::run(cube, s.property, o);
  ASSERT_EQ(one.rows.size(), two.rows.size());
  ASSERT_GT(one.rows.size(), 0u);
  for (std::size_t i = 0; i < one.rows.size(); ++i) {
    const BacktestRow &a = one.rows[i], &b = two.rows[i];
    ASSERT_EQ(
        std::tie(a.reading, a.night, a.series, a.lead, a.method, a.forecast, a.final, a.lo, a.hi),
        std::tie(b.reading, b.night, b.series, b.lead, b.method, b.forecast, b.final, b.lo, b.hi));
  }
}

// BacktestOptions::firstNight keeps exactly the rows of nights on or after it, each the same as
// in the run without it (mlp's nets included, trained only for the leads asked for).
TEST(Backtest, FirstNightKeepsExactlyTheLaterNightsRows) {
  const auto &s = sampleCase().sample;
  BacktestOptions o = sampleOptions(d(2025, 6, 15));
  o.methods = {"naive", "pickup-add", "mlp"};
  o.from = d(2025, 6, 1);
  o.warmUp = false;
  o.withBands = false;
  const cb::CurveCube cube = Backtest::buildCube(s.reservations, o, cb::SeriesBy::Total);
  const auto all = Backtest::run(cube, s.property, o);
  o.firstNight = d(2025, 6, 20);
  const auto later = Backtest::run(cube, s.property, o);
  std::vector<BacktestRow> expected;
  for (const BacktestRow &r : all.rows)
    if (r.night >= *o.firstNight)
      expected.push_back(r);
  ASSERT_GT(expected.size(), 0u);
  ASSERT_LT(expected.size(), all.rows.size());
  ASSERT_EQ(later.rows.size(), expected.size());
  for (std::size_t i = 0; i < expected.size(); ++i) {
    const BacktestRow &a = later.rows[i], &b = expected[i];
    ASSERT_EQ(std::tie(a.reading, a.night, a.series, a.lead, a.method, a.forecast, a.final),
              std::tie(b.reading, b.night, b.series, b.lead, b.method, b.forecast, b.final));
  }
}

// BacktestOptions::series: one series of a by-segment cube, with unconstrained history, bands
// and auto, gives exactly that series' rows of the backtest of every series.
TEST(Backtest, OneSeriesKeepsExactlyThatSeriesRows) {
  const auto &s = sampleCase().sample;
  cb::CensorSources censors;
  censors.denials = s.denials;
  BacktestOptions o = sampleOptions(d(2025, 6, 15));
  o.methods = {"naive", "pickup-add", "pickup-adv", "auto"};
  o.from = d(2025, 6, 1);
  o.unconstrain = cb::UnconstrainOptions{};
  o.censoring = &censors;
  const cb::CurveCube cube = Backtest::buildCube(s.reservations, o, cb::SeriesBy::Segment);
  ASSERT_GE(cube.series().size(), 3u);
  const auto all = Backtest::run(cube, s.property, o);
  for (std::size_t si : {std::size_t{0}, std::size_t{2}}) {
    o.series = si;
    const auto one = Backtest::run(cube, s.property, o);
    std::vector<BacktestRow> expected;
    for (const BacktestRow &r : all.rows)
      if (r.series == si)
        expected.push_back(r);
    ASSERT_GT(expected.size(), 0u);
    ASSERT_EQ(one.rows.size(), expected.size()) << si;
    int banded = 0;
    for (std::size_t i = 0; i < expected.size(); ++i) {
      const BacktestRow &a = one.rows[i], &b = expected[i];
      ASSERT_EQ(
          std::tie(a.reading, a.night, a.series, a.lead, a.method, a.forecast, a.final, a.lo, a.hi),
          std::tie(b.reading, b.night, b.series, b.lead, b.method, b.forecast, b.final, b.lo,
                   b.hi));
      banded += a.lo.has_value() ? 1 : 0;
    }
    EXPECT_GT(banded, 0);
  }
  o.series = cube.series().size();
  EXPECT_THROW(Backtest::run(cube, s.property, o), std::out_of_range);
}

// MethodOptions::mlpRetrainDays: the nets trained at the first reading date of each block of k
// days serve the block's later dates. The blocks are fixed by the dates alone, so one or two
// threads give the same rows; the forecasts of a block's first date are those of k = 1 (nets
// trained at that date), and later dates differ (nets from an earlier date); and nothing after
// a reading date changes its forecasts.
TEST(Backtest, MlpRetrainedPerBlockOfDaysIsThreadIndependentAndLooksNoFurther) {
  const auto &s = sampleCase().sample;
  const Date t = d(2025, 6, 15);
  BacktestOptions o = sampleOptions(t);
  o.methods = {"mlp"};
  o.from = t - 3; // reading dates t − 3 … t: blocks {t − 3, t − 2, t − 1} and {t} with k = 3
  o.leads = {7, 30};
  const cb::CurveCube cube = Backtest::buildCube(s.reservations, o, cb::SeriesBy::Total);
  const auto every = Backtest::run(cube, s.property, o);
  o.methodOptions.mlpRetrainDays = 3;
  o.threads = 1;
  const auto one = Backtest::run(cube, s.property, o);
  o.threads = 2;
  const auto two = Backtest::run(cube, s.property, o);
  ASSERT_EQ(one.rows.size(), two.rows.size());
  ASSERT_EQ(one.rows.size(), every.rows.size());
  ASSERT_EQ(one.rows.size(), 8u); // 4 reading dates × 2 leads
  int same = 0, differ = 0;
  for (std::size_t i = 0; i < one.rows.size(); ++i) {
    const BacktestRow &a = one.rows[i], &b = two.rows[i], &e = every.rows[i];
    ASSERT_EQ(std::tie(a.reading, a.night, a.lead, a.forecast),
              std::tie(b.reading, b.night, b.lead, b.forecast));
    ASSERT_EQ(std::tie(a.reading, a.lead), std::tie(e.reading, e.lead));
    if (a.reading == t - 3 || a.reading == t) {
      EXPECT_EQ(a.forecast, e.forecast) << a.reading.toIso(); // a block's first date
      ++same;
    } else {
      differ += a.forecast != e.forecast;
    }
  }
  EXPECT_EQ(same, 4);
  EXPECT_GT(differ, 0);
  // Bookings after the last reading date change nothing (the reused nets saw only older data).
  std::vector<cb::Reservation> later = s.reservations;
  for (cb::Reservation &r : later)
    if (r.bookedOn > t)
      r.rooms += 1;
  const cb::CurveCube b = Backtest::buildCube(later, o, cb::SeriesBy::Total);
  const auto changed = Backtest::run(b, s.property, o);
  ASSERT_EQ(changed.rows.size(), one.rows.size());
  for (std::size_t i = 0; i < one.rows.size(); ++i)
    EXPECT_EQ(one.rows[i].forecast, changed.rows[i].forecast);
}

// The no-look-ahead proof (issue 4): deleting and changing every kind of activity dated after t
// leaves every forecast made on or before t unchanged, for every method and for auto.
TEST(Backtest, NothingAfterTheReadingDateChangesAnyForecast) {
  const auto &s = sampleCase().sample;
  const Date t = d(2025, 6, 15);
  BacktestOptions o = sampleOptions(t);
  // sampleOptions: every method in methodNames() plus auto.

  std::vector<cb::Reservation> changed;
  int k = 0;
  for (cb::Reservation r : s.reservations) {
    ++k;
    if (r.bookedOn > t) {
      if (k % 3 == 0)
        continue; // deleted
      r.rooms += 2;
      if (k % 3 == 1)
        r.arrival = r.arrival - 1; // a night earlier (still after the booking)
    }
    if (r.cancelledOn && *r.cancelledOn > t) {
      if (k % 2 == 0) {
        r.cancelledOn.reset();
        r.status = cb::ReservationStatus::Booked;
      } else {
        r.cancelledOn = *r.cancelledOn + 1;
      }
    }
    if (r.arrival < r.bookedOn)
      r.arrival = r.bookedOn;
    changed.push_back(r);
  }
  const cb::CurveCube a = Backtest::buildCube(s.reservations, o, cb::SeriesBy::Total);
  const cb::CurveCube b = Backtest::buildCube(changed, o, cb::SeriesBy::Total);
  const auto ra = Backtest::run(a, s.property, o);
  const auto rb = Backtest::run(b, s.property, o);
  const auto ka = byKey(ra), kb = byKey(rb);
  ASSERT_EQ(ka.size(), kb.size());
  ASSERT_GT(ka.size(), 0u);
  std::map<std::uint32_t, int> perMethod;
  for (const auto &[key, row] : ka) {
    auto it = kb.find(key);
    ASSERT_NE(it, kb.end());
    EXPECT_EQ(row->forecast, it->second->forecast) << ra.methods[row->method];
    EXPECT_EQ(row->lo, it->second->lo);
    EXPECT_EQ(row->hi, it->second->hi);
    ++perMethod[row->method];
  }
  for (std::uint32_t m = 0; m < ra.methods.size(); ++m)
    EXPECT_GT(perMethod[m], 0) << ra.methods[m] << " made no forecast";
  // The change must reach the finals, or the test would prove nothing.
  int finalsChanged = 0;
  for (const auto &[key, row] : ka)
    finalsChanged += row->final != kb.at(key)->final;
  EXPECT_GT(finalsChanged, 0);
}

TEST(Backtest, UnconstrainedHistoryIsUsedAndLooksNoFurtherThanTheReadingDate) {
  // A peak reading date of the sample (sold-out July nights lie before it): every method trains
  // on the unconstrained history known at t; denials, closures and bookings after t must change
  // nothing, and the option must change the forecasts of methods that read finals.
  const auto &s = sampleCase().sample;
  const Date t = d(2025, 8, 10);
  BacktestOptions o = sampleOptions(t);
  o.methods = {"pickup-add", "mavg", "blend", "holt-winters"};
  const cb::CensorSources sources{{}, s.denials};
  o.unconstrain = cb::UnconstrainOptions{};
  o.censoring = &sources;
  std::vector<cb::Reservation> later = s.reservations;
  for (cb::Reservation &r : later)
    if (r.bookedOn > t)
      r.rooms += 1;
  cb::CensorSources laterSources = sources;
  laterSources.denials.push_back({t + 1, t - 20, t - 10, 30, "FLEX", cb::DenialKind::Denial});
  laterSources.closures.push_back({t - 5, "", t + 1, std::nullopt});
  const cb::CurveCube a = Backtest::buildCube(s.reservations, o, cb::SeriesBy::Total);
  const cb::CurveCube b = Backtest::buildCube(later, o, cb::SeriesBy::Total);
  const auto ra = Backtest::run(a, s.property, o);
  BacktestOptions ob = o;
  ob.censoring = &laterSources;
  const auto rb = Backtest::run(b, s.property, ob);
  const auto ka = byKey(ra), kb = byKey(rb);
  ASSERT_EQ(ka.size(), kb.size());
  ASSERT_GT(ka.size(), 0u);
  for (const auto &[key, row] : ka) {
    auto it = kb.find(key);
    ASSERT_NE(it, kb.end());
    EXPECT_EQ(row->forecast, it->second->forecast) << ra.methods[row->method];
  }
  // Against the observed history: the unconstrained forecasts are never lower for pickup-add
  // (every estimate is at least its final) and higher for some rows.
  BacktestOptions observed = o;
  observed.unconstrain.reset();
  const auto ro = Backtest::run(a, s.property, observed);
  const auto ko = byKey(ro);
  int higher = 0;
  for (const auto &[key, row] : ka) {
    const BacktestRow *plain = ko.at(key);
    if (ra.methods[row->method] == "pickup-add") {
      EXPECT_GE(row->forecast, plain->forecast - 1e-9);
      higher += row->forecast > plain->forecast + 1e-9;
    }
    EXPECT_EQ(row->final, plain->final); // still scored against the observed final
  }
  EXPECT_GT(higher, 0);
}
