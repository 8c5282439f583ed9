// Forecast runs and overrides: a naive forecast on a hand-made store with exact values and
// bands, auto's evidence in the stored parameters, and the store round trip.
#include "core/forecastrun.h"

#include "core/backtest.h"
#include "core/simulator.h"
#include "core/store.h"
#include "testsupport.h"

#include <nlohmann/json.hpp>

#include <cmath>

using cb::Date;

namespace {

Date d(int y, unsigned m, unsigned day) { return Date::fromYmd(y, m, day); }

/// Every night of Jan–Mar 2026: 2 CORP rooms booked 5 days ahead and 1 LEIS room booked the day
/// before, so Final = 3 and OTB(s, s − h) = 3 at h = 1, 2 at h = 2…5, 0 beyond.
std::unique_ptr<cb::Store> handStore(const cbtest::TempDir &dir) {
  cb::Property p;
  p.name = "Test";
  p.capacity = 10;
  auto store = cb::Store::create(dir / "t.curvebench", p);
  cb::Store::Transaction tx(*store);
  for (const cb::Reservation &r : cbtest::steadyQuarterRows())
    store->upsertReservation(r, 0);
  tx.commit();
  return store;
}

} // namespace

TEST(ForecastRun, NaiveValuesAndBandsThenStoredAndLoaded) {
  cbtest::TempDir dir;
  auto store = handStore(dir);
  cb::ForecastRequest req;
  req.asOf = d(2026, 3, 1);
  req.horizon = 7;
  req.method = "naive";
  cb::ForecastRun run = cb::ForecastRun::compute(store->reservations(), store->property(), req);
  ASSERT_EQ(run.values.size(), 7u);
  const int otb[] = {3, 2, 2, 2, 2, 0, 0}; // h = 1 … 7
  for (int h = 1; h <= 7; ++h) {
    const cb::ForecastValue &v = run.values[static_cast<std::size_t>(h - 1)];
    EXPECT_EQ(v.night, req.asOf + h);
    EXPECT_EQ(v.series, "ALL");
    EXPECT_EQ(v.lead, h);
    EXPECT_EQ(v.otb, otb[h - 1]);
    EXPECT_DOUBLE_EQ(v.forecast, 3.0); // the last same-weekday final
    EXPECT_EQ(v.method, "naive");
    // Every past naive error was 0, so the band is [3, 3].
    ASSERT_TRUE(v.lo && v.hi) << h;
    EXPECT_DOUBLE_EQ(*v.lo, 3.0);
    EXPECT_DOUBLE_EQ(*v.hi, 3.0);
    ASSERT_TRUE(v.sd) << h; // and the spread, the root mean square of those errors, is 0
    EXPECT_DOUBLE_EQ(*v.sd, 0.0);
  }
  ASSERT_EQ(store->reservationCount(), 180);
  run.dataVersion = cb::ForecastRun::dataVersionOf(*store, store->reservations().size());
  EXPECT_EQ(run.dataVersion, "import 0, 180 reservations");
  const std::int64_t id = run.save(*store);
  EXPECT_GT(id, 0);
  const auto runs = cb::ForecastRun::load(*store);
  ASSERT_EQ(runs.size(), 1u);
  EXPECT_EQ(runs[0].id, id);
  EXPECT_EQ(runs[0].method, "naive");
  EXPECT_EQ(runs[0].readingDate, req.asOf);
  EXPECT_EQ(runs[0].createdAt.size(), 20u); // YYYY-MM-DDTHH:MM:SSZ
  EXPECT_EQ(nlohmann::json::parse(runs[0].parameters)["options"]["horizon"], 7);
  ASSERT_EQ(runs[0].values.size(), 7u);
  EXPECT_EQ(runs[0].values[5].otb, 0);
  EXPECT_DOUBLE_EQ(*runs[0].values[6].hi, 3.0);
  EXPECT_DOUBLE_EQ(*runs[0].values[6].sd, 0.0);
}

TEST(ForecastRun, SpreadIsTheRootMeanSquareOfTheLeadBucketsBacktestErrors) {
  cbtest::TempDir dir;
  auto store = handStore(dir);
  const auto rows = store->reservations();
  cb::ForecastRequest req;
  req.asOf = d(2026, 3, 1);
  req.horizon = 14;
  req.method = "pickup-add";
  const cb::ForecastRun run = cb::ForecastRun::compute(rows, store->property(), req);
  // Recompute from a backtest set up as the run's own (reading dates asOf − 56 − 14 … asOf − 1,
  // every lead 1 … 14): errors of the lead bucket whose nights lie in the 56 days up to asOf.
  cb::BacktestOptions bo;
  bo.from = req.asOf - 56 - 14;
  bo.to = req.asOf - 1;
  bo.leads.clear();
  for (int h = 1; h <= 14; ++h)
    bo.leads.push_back(h);
  bo.methods = {"pickup-add"};
  bo.warmUp = false;
  bo.withBands = false;
  cb::CubeOptions co{rows.front().arrival, req.asOf + 14, 14 + 31, cb::SeriesBy::Total, req.asOf};
  for (const auto &r : rows)
    co.firstNight = std::min(co.firstNight, r.arrival);
  const cb::CurveCube cube = cb::CurveCube::build(rows, co);
  const cb::BacktestResult past = cb::Backtest::run(cube, store->property(), bo);
  const cb::LeadBuckets buckets;
  int checked = 0;
  for (const cb::ForecastValue &v : run.values) {
    double sum = 0;
    int n = 0;
    for (const cb::BacktestRow &r : past.rows)
      if (buckets.bucketOf(r.lead) == buckets.bucketOf(v.lead) && r.night > req.asOf - 56 &&
          r.night <= req.asOf) {
        sum += (r.final - r.forecast) * (r.final - r.forecast);
        ++n;
      }
    if (n < 10) {
      EXPECT_FALSE(v.sd) << v.lead;
      continue;
    }
    ASSERT_TRUE(v.sd) << v.lead;
    EXPECT_NEAR(*v.sd, std::sqrt(sum / n), 1e-12) << v.lead;
    ++checked;
  }
  EXPECT_GE(checked, 10);
}

TEST(ForecastRun, AutoStoresItsChoiceAndEvidence) {
  cbtest::TempDir dir;
  auto store = handStore(dir);
  cb::ForecastRequest req;
  req.asOf = d(2026, 3, 10);
  req.horizon = 3;
  req.by = cb::SeriesBy::Segment;
  const cb::ForecastRun run =
      cb::ForecastRun::compute(store->reservations(), store->property(), req);
  EXPECT_EQ(run.values.size(), 9u); // 3 nights × ALL, CORP, LEIS
  const auto params = nlohmann::json::parse(run.parameters);
  ASSERT_TRUE(params.contains("auto"));
  // Lead buckets 1 and 2–3 for each of the 3 series.
  ASSERT_EQ(params["auto"].size(), 6u);
  const auto &first = params["auto"][0];
  EXPECT_EQ(first["series"], "ALL");
  EXPECT_EQ(first["leads"], "1");
  ASSERT_FALSE(first["evidence"].empty());
  EXPECT_EQ(first["chosen"], first["evidence"][0]["method"]);
  for (const auto &v : run.values)
    EXPECT_NEAR(v.forecast,
                v.series == "ALL"    ? 3.0
                : v.series == "CORP" ? 2.0
                                     : 1.0,
                1.0)
        << v.method;
  EXPECT_THROW(
      [&] {
        cb::ForecastRequest late = req;
        late.asOf = d(2026, 4, 1);
        (void)cb::ForecastRun::compute(store->reservations(), store->property(), late);
      }(),
      cb::AsOfError);
}

TEST(ForecastRun, OverridesAreStoredWithReasonAuthorAndTime) {
  cbtest::TempDir dir;
  auto store = handStore(dir);
  cb::ForecastOverride o;
  o.night = d(2026, 4, 2);
  o.segment = "GRP";
  o.value = 40;
  o.reason = "congress";
  o.author = "ana";
  const std::int64_t id = cb::addOverride(*store, o);
  o.segment.clear();
  o.night = d(2026, 4, 1);
  o.createdAt = "2026-03-30T08:00:00Z";
  cb::addOverride(*store, o);
  const auto all = cb::overrides(*store);
  ASSERT_EQ(all.size(), 2u);
  EXPECT_EQ(all[0].night, d(2026, 4, 1));
  EXPECT_EQ(all[0].segment, "");
  EXPECT_EQ(all[0].createdAt, "2026-03-30T08:00:00Z");
  EXPECT_EQ(all[1].id, id);
  EXPECT_EQ(all[1].segment, "GRP");
  EXPECT_DOUBLE_EQ(all[1].value, 40.0);
  EXPECT_EQ(all[1].reason, "congress");
  EXPECT_EQ(all[1].author, "ana");
  EXPECT_EQ(all[1].createdAt.size(), 20u);
}

// Auto's two-part evidence (choices from the selection window's errors, then every night for
// the methods used) against the one backtest of every method over every lead it replaces: the
// same forecasts, bands, spreads and stored evidence, to the last bit. The simulated sample
// property, a short horizon and window to keep the one-part run quick.
TEST(ForecastRun, TwoPartEvidenceGivesExactlyTheOnePartRun) {
  static const cb::SampleProperty sample = cb::simulateProperty();
  cb::ForecastRequest req;
  req.asOf = sample.readingDate - 20;
  req.horizon = 16; // lead buckets 1, 2–3, 4–7, 8–14, 15–30
  req.autoSelect.windowDays = 10;
  req.autoSelect.minCount = 5;
  int calls = 0;
  std::int64_t lastDone = -1;
  req.progress = [](void *context, std::int64_t done, std::int64_t total) {
    auto *c = static_cast<std::pair<int *, std::int64_t *> *>(context);
    ++*c->first;
    EXPECT_EQ(total, 1000);
    EXPECT_GE(done, 0);
    EXPECT_LE(done, 1000);
    *c->second = done;
    return true;
  };
  std::pair<int *, std::int64_t *> seen{&calls, &lastDone};
  req.progressContext = &seen;
  const cb::ForecastRun fast = cb::ForecastRun::compute(sample.reservations, sample.property, req);
  EXPECT_GT(calls, 0);
  EXPECT_EQ(lastDone, 1000);
  cb::ForecastRequest full = req;
  full.fullEvidence = true;
  full.progress = nullptr;
  const cb::ForecastRun slow = cb::ForecastRun::compute(sample.reservations, sample.property, full);
  ASSERT_EQ(fast.values.size(), 16u);
  ASSERT_EQ(fast.values.size(), slow.values.size());
  int banded = 0;
  for (std::size_t i = 0; i < fast.values.size(); ++i) {
    const cb::ForecastValue &a = fast.values[i], &b = slow.values[i];
    EXPECT_EQ(a.night, b.night);
    EXPECT_EQ(a.method, b.method) << a.night.toIso();
    EXPECT_EQ(a.forecast, b.forecast) << a.night.toIso(); // exact: the same arithmetic
    EXPECT_EQ(a.lo, b.lo) << a.night.toIso();
    EXPECT_EQ(a.hi, b.hi) << a.night.toIso();
    EXPECT_EQ(a.sd, b.sd) << a.night.toIso();
    banded += a.lo.has_value() ? 1 : 0;
  }
  EXPECT_GT(banded, 0);
  EXPECT_EQ(fast.parameters, slow.parameters); // the evidence of every choice, as stored
}

// The simulated sample property by segment, pickup-adv on unconstrained history with its
// denials as censoring, 30 nights from 20 days before its reading date.
static cb::ForecastRequest sampleSegmentRequest(const cb::SampleProperty &sample,
                                                const cb::CensorSources &censors) {
  cb::ForecastRequest req;
  req.asOf = sample.readingDate - 20;
  req.horizon = 30;
  req.method = "pickup-adv";
  req.by = cb::SeriesBy::Segment;
  req.unconstrain = cb::UnconstrainOptions{};
  req.censoring = &censors;
  return req;
}

// A cube kept by one run is read by the next run that needs exactly that cube (another segment
// at the same reading date, as Horizon does when the user flips through segments), with the
// values of a run that builds its own; a cube of a later reading date is narrowed to the run's
// (the reading date moved back); a cube of an earlier reading date, other leads or another
// series kind is ignored.
TEST(ForecastRun, AKeptCubeIsReadWhenItFitsAndIgnoredOtherwise) {
  static const cb::SampleProperty sample = cb::simulateProperty();
  cb::CensorSources censors;
  censors.denials = sample.denials;
  cb::ForecastRequest req = sampleSegmentRequest(sample, censors);
  req.keepCube = true;
  req.series = sample.segments.at(0).code;
  const cb::ForecastRun first = cb::ForecastRun::compute(sample.reservations, sample.property, req);
  ASSERT_TRUE(first.cube);

  auto expectSameValues = [](const cb::ForecastRun &a, const cb::ForecastRun &b) {
    ASSERT_EQ(a.values.size(), b.values.size());
    ASSERT_FALSE(a.values.empty());
    for (std::size_t i = 0; i < a.values.size(); ++i) {
      EXPECT_EQ(a.values[i].series, b.values[i].series);
      EXPECT_EQ(a.values[i].night, b.values[i].night);
      EXPECT_EQ(a.values[i].otb, b.values[i].otb);
      EXPECT_EQ(a.values[i].forecast, b.values[i].forecast);
      EXPECT_EQ(a.values[i].lo, b.values[i].lo);
      EXPECT_EQ(a.values[i].hi, b.values[i].hi);
      EXPECT_EQ(a.values[i].sd, b.values[i].sd);
    }
  };

  cb::ForecastRequest next = req;
  next.series = sample.segments.at(1).code;
  const cb::ForecastRun own = cb::ForecastRun::compute(sample.reservations, sample.property, next);
  next.cube = first.cube;
  const cb::ForecastRun read = cb::ForecastRun::compute(sample.reservations, sample.property, next);
  EXPECT_EQ(read.cube.get(), first.cube.get()); // read, not built again
  expectSameValues(read, own);

  // An earlier reading date: the kept cube is narrowed to it (CurveCube::narrowed), the same
  // values as a run that builds its own.
  cb::ForecastRequest earlier = next;
  earlier.asOf = next.asOf - 3;
  const cb::ForecastRun narrowed =
      cb::ForecastRun::compute(sample.reservations, sample.property, earlier);
  ASSERT_TRUE(narrowed.cube);
  EXPECT_NE(narrowed.cube.get(), first.cube.get());
  EXPECT_EQ(narrowed.cube->asOf(), earlier.asOf);
  earlier.cube.reset();
  expectSameValues(narrowed,
                   cb::ForecastRun::compute(sample.reservations, sample.property, earlier));

  for (int variant = 0; variant < 3; ++variant) {
    cb::ForecastRequest other = next;
    if (variant == 0) { // a later reading date: the kept cube cannot hold what came after it
      other.asOf = next.asOf - 1;
      other.cube = narrowed.cube; // as of next.asOf - 3
    } else if (variant == 1)
      other.horizon = next.horizon + 1; // other nights and leads
    else {
      other.by = cb::SeriesBy::Total; // another kind of series
      other.series = "ALL";
    }
    const cb::ForecastRun ignored =
        cb::ForecastRun::compute(sample.reservations, sample.property, other);
    EXPECT_NE(ignored.cube.get(), first.cube.get()) << variant;
    EXPECT_NE(ignored.cube.get(), other.cube.get()) << variant;
    other.cube.reset();
    expectSameValues(ignored,
                     cb::ForecastRun::compute(sample.reservations, sample.property, other));
  }
}

// A run of one series (what Horizon asks for when a segment is picked) against the run of every
// series: the same values of that series, to the last bit, since each series' evidence,
// unconstrained history and choices are its own. The simulated sample property by segment, with
// its denials as censoring, so the unconstraining reads the series' own records.
TEST(ForecastRun, OneSeriesGivesItsValuesFromTheRunOfEverySeries) {
  static const cb::SampleProperty sample = cb::simulateProperty();
  cb::CensorSources censors;
  censors.denials = sample.denials;
  const cb::ForecastRequest req = sampleSegmentRequest(sample, censors);
  const cb::ForecastRun all = cb::ForecastRun::compute(sample.reservations, sample.property, req);
  std::set<std::string> names;
  for (const cb::ForecastValue &v : all.values)
    names.insert(v.series);
  ASSERT_GE(names.size(), 3u); // ALL and at least two segments
  for (const std::string &name : names) {
    cb::ForecastRequest one = req;
    one.series = name;
    const cb::ForecastRun run = cb::ForecastRun::compute(sample.reservations, sample.property, one);
    std::vector<cb::ForecastValue> expected;
    for (const cb::ForecastValue &v : all.values)
      if (v.series == name)
        expected.push_back(v);
    ASSERT_EQ(run.values.size(), expected.size()) << name;
    int banded = 0;
    for (std::size_t i = 0; i < expected.size(); ++i) {
      const cb::ForecastValue &a = run.values[i], &b = expected[i];
      EXPECT_EQ(a.series, name);
      EXPECT_EQ(a.night, b.night) << name;
      EXPECT_EQ(a.otb, b.otb) << name << " " << a.night.toIso();
      EXPECT_EQ(a.forecast, b.forecast) << name << " " << a.night.toIso();
      EXPECT_EQ(a.lo, b.lo) << name << " " << a.night.toIso();
      EXPECT_EQ(a.hi, b.hi) << name << " " << a.night.toIso();
      EXPECT_EQ(a.sd, b.sd) << name << " " << a.night.toIso();
      banded += a.lo.has_value() ? 1 : 0;
    }
    EXPECT_GT(banded, 0) << name;
    EXPECT_NE(run.parameters.find("\"series\":\"" + name + "\""), std::string::npos);
  }
  cb::ForecastRequest none = req;
  none.series = "NO-SUCH-SEGMENT";
  EXPECT_TRUE(cb::ForecastRun::compute(sample.reservations, sample.property, none).values.empty());
}
