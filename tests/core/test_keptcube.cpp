// The kept cube (core/keptcube.h): every cube the command line asks of it is the cube built from
// the reservations, cell for cell; its file refuses other data and damage; an import keeps it
// current. These compare the shortcut with the computation it replaces (the cube itself is
// checked against the definitions in test_curvecube.cpp), so they name no outside source.
#include "core/keptcube.h"

#include "core/backtest.h"
#include "core/nativeformat.h"
#include "core/reservationimporter.h"
#include "core/simulator.h"
#include "core/store.h"
#include "testsupport.h"

#include <gtest/gtest.h>

#include <fstream>
#include <sstream>

namespace fs = std::filesystem;
using cb::CubeOptions;
using cb::CurveCube;
using cb::Date;
using cb::KeptCube;
using cb::Reservation;
using cb::SeriesBy;
using cbtest::expectSameCube;

namespace {

Date d(const char *iso) { return *Date::parseIso(iso); }

const cb::SampleProperty &sample() {
  static const cb::SampleProperty s = cb::simulateProperty();
  return s;
}

/// The kept cube of the sample property's reservations (built once).
const KeptCube &sampleKept() {
  static const KeptCube k = *cb::keptCubeOf(sample().reservations);
  return k;
}

void expectSameKept(const KeptCube &a, const KeptCube &b) {
  EXPECT_EQ(a.bounds.newest, b.bounds.newest);
  EXPECT_EQ(a.bounds.firstArrival, b.bounds.firstArrival);
  EXPECT_EQ(a.bounds.firstStay, b.bounds.firstStay);
  EXPECT_EQ(a.bounds.lastStay, b.bounds.lastStay);
  expectSameCube(a.cube, b.cube);
}

} // namespace

TEST(KeptCube, IsTheTotalOverEveryNightStayedAsOfTheNewestDate) {
  const auto &rows = sample().reservations;
  const KeptCube &k = sampleKept();
  const cb::ReservationBounds b = cb::boundsOf(rows);
  EXPECT_EQ(k.bounds.newest, b.newest);
  EXPECT_EQ(k.bounds.firstArrival, b.firstArrival);
  EXPECT_EQ(k.bounds.firstStay, b.firstStay);
  Date last = *b.firstStay;
  for (const Reservation &r : rows)
    if (!r.isDayUse())
      last = std::max(last, r.departure - 1);
  EXPECT_EQ(k.bounds.lastStay, last);
  const CubeOptions o{*b.firstStay, std::min(last, *b.newest + 365), 365, SeriesBy::Total,
                      b.newest};
  expectSameCube(k.cube, CurveCube::build(rows, o));
}

// A daily import builds the kept cube from the rows' facts (dates, rooms, rate, status) read
// from the snapshot's columns: the same cube, bounds and cells, as from the reservations.
TEST(KeptCube, FromTheFactsOfTheRowsIsTheSameAsFromTheRows) {
  const auto &rows = sample().reservations;
  std::vector<cb::ReservationFacts> facts;
  for (const Reservation &r : rows)
    facts.push_back(cb::ReservationFacts::of(r));
  const std::optional<KeptCube> fromFacts = cb::keptCubeOf(facts);
  ASSERT_TRUE(fromFacts);
  expectSameKept(*fromFacts, sampleKept());
  // No row, or day uses only: no kept cube either way.
  EXPECT_FALSE(cb::keptCubeOf(std::span<const cb::ReservationFacts>()));
  Reservation dayUse = rows.front();
  dayUse.departure = dayUse.arrival;
  const std::vector<cb::ReservationFacts> dayUseOnly = {cb::ReservationFacts::of(dayUse)};
  EXPECT_FALSE(cb::keptCubeOf(dayUseOnly));
  // A split needs the codes, which the facts do not carry.
  CubeOptions o = sampleKept().cube.options();
  o.by = SeriesBy::Segment;
  EXPECT_THROW(CurveCube::buildTotal(facts, o), std::invalid_argument);
}

// What `curves`, `finals` and `backtest` ask for, and a few ranges besides, against the cube
// built from the reservations.
TEST(KeptCube, GivesTheCubesTheCommandsAskFor) {
  const auto &rows = sample().reservations;
  const KeptCube &k = sampleKept();
  const Date newest = *k.bounds.newest;
  std::vector<CubeOptions> asked = {
      // curves with its defaults, then with --as-of a month back
      {*k.bounds.firstStay, std::min(*k.bounds.lastStay, newest + 365), 365, SeriesBy::Total,
       std::nullopt},
      {*k.bounds.firstStay, newest - 30 + 365, 365, SeriesBy::Total, newest - 30},
      // finals (no leads), --from / --to and --max-dba
      {*k.bounds.firstStay, newest, 0, SeriesBy::Total, std::nullopt},
      {newest - 100, newest + 50, 90, SeriesBy::Total, newest - 7},
      // nights before the first night stayed and after the last
      {*k.bounds.firstStay - 40, *k.bounds.lastStay + 40, 60, SeriesBy::Total, std::nullopt},
  };
  cb::BacktestOptions bo;
  bo.from = newest - 365;
  bo.to = newest;
  asked.push_back(cb::Backtest::cubeOptions(k.bounds, bo, SeriesBy::Total));
  for (const CubeOptions &o : asked) {
    SCOPED_TRACE(o.firstNight.toIso() + " " + o.lastNight.toIso() + " " + std::to_string(o.maxDba));
    const std::optional<CurveCube> c = k.cubeFor(o);
    ASSERT_TRUE(c);
    expectSameCube(*c, CurveCube::build(rows, o));
  }
  // The backtest's cube through the kept one is the one Backtest::buildCube builds.
  expectSameCube(*k.cubeFor(cb::Backtest::cubeOptions(k.bounds, bo, SeriesBy::Total)),
                 cb::Backtest::buildCube(rows, bo, SeriesBy::Total));

  // Not from the kept cube: a split, a date after the data, more leads, an empty range.
  CubeOptions o = asked.front();
  o.by = SeriesBy::Segment;
  EXPECT_FALSE(k.cubeFor(o));
  o = asked.front();
  o.asOf = newest + 1;
  EXPECT_FALSE(k.cubeFor(o));
  o = asked.front();
  o.maxDba = 366;
  EXPECT_FALSE(k.cubeFor(o));
  o = asked.front();
  o.lastNight = o.firstNight - 1;
  EXPECT_FALSE(k.cubeFor(o));
}

// A day use before the first night stayed moves the backtest's first night before the kept
// cube's: those nights are empty, as build() finds them.
TEST(KeptCube, DayUsesAndNoNightStayed) {
  std::vector<Reservation> rows = {
      cbtest::makeReservation("1", "2026-03-01", "2026-03-10", "2026-03-12", 2, "CORP"),
      cbtest::makeReservation("2", "2026-03-02", "2026-03-05", "2026-03-05", 1, "CORP"),
      cbtest::makeReservation("3", "2026-03-08", "2026-03-11", "2026-03-14", 1, "LEIS"),
  };
  const std::optional<KeptCube> k = cb::keptCubeOf(rows);
  ASSERT_TRUE(k);
  EXPECT_EQ(k->bounds.firstArrival, d("2026-03-05"));
  EXPECT_EQ(k->bounds.firstStay, d("2026-03-10"));
  EXPECT_EQ(k->bounds.lastStay, d("2026-03-13"));
  cb::BacktestOptions bo;
  bo.from = d("2026-03-06");
  bo.to = d("2026-03-08");
  bo.leads = {1, 3};
  expectSameCube(*k->cubeFor(cb::Backtest::cubeOptions(k->bounds, bo, SeriesBy::Total)),
                 cb::Backtest::buildCube(rows, bo, SeriesBy::Total));

  EXPECT_FALSE(cb::keptCubeOf(std::vector<Reservation>{}));
  EXPECT_FALSE(cb::keptCubeOf(std::vector<Reservation>{rows[1]})); // a day use only: no night
}

TEST(KeptCube, FileKeepsEveryCellAndRefusesOtherDataAndDamage) {
  const KeptCube &k = sampleKept();
  const std::string bytes = cb::encodeKeptCube(42, k);
  const std::optional<KeptCube> back = cb::decodeKeptCube(bytes, 42);
  ASSERT_TRUE(back);
  expectSameKept(*back, k);
  EXPECT_FALSE(cb::decodeKeptCube(bytes, 43)) << "another stamp";
  for (std::size_t cut :
       {std::size_t{0}, std::size_t{63}, std::size_t{64}, bytes.size() / 2, bytes.size() - 1}) {
    EXPECT_FALSE(cb::decodeKeptCube(std::string_view(bytes).substr(0, cut), 42)) << cut;
  }
  for (std::size_t at :
       {std::size_t{0}, std::size_t{9}, std::size_t{70}, bytes.size() / 2, bytes.size() - 1}) {
    std::string damaged = bytes;
    damaged[at] = static_cast<char>(damaged[at] ^ 0x20);
    EXPECT_FALSE(cb::decodeKeptCube(damaged, 42)) << at;
  }
  EXPECT_FALSE(cb::decodeKeptCube(bytes + "x", 42)) << "a longer payload than the header says";
  // Whole and checked, but not what keptCubeOf makes (a split; another reading date): refused.
  KeptCube split = k;
  CubeOptions o = k.cube.options();
  o.by = SeriesBy::Segment;
  split.cube = CurveCube::build(sample().reservations, o);
  EXPECT_FALSE(cb::decodeKeptCube(cb::encodeKeptCube(42, split), 42));
  KeptCube earlier = k;
  earlier.cube =
      k.cube.narrowed({o.firstNight, o.lastNight, o.maxDba, SeriesBy::Total, *k.bounds.newest - 1});
  EXPECT_FALSE(cb::decodeKeptCube(cb::encodeKeptCube(42, earlier), 42));

  cbtest::TempDir dir;
  const fs::path file = cb::keptCubePathFor(dir / "h.curvebench");
  EXPECT_EQ(file.filename(), "h.curvebench.cube");
  EXPECT_FALSE(cb::readKeptCube(file, 42)) << "no file";
  ASSERT_TRUE(cb::writeKeptCube(file, 42, k));
  const std::optional<KeptCube> read = cb::readKeptCube(file, 42);
  ASSERT_TRUE(read);
  expectSameKept(*read, k);
  EXPECT_FALSE(cb::readKeptCube(file, 7));
}

// An import into a new store and one that changes a few rows each leave the kept cube of the
// rows they committed, under the store's new stamp.
TEST(KeptCube, AnImportKeepsItCurrent) {
  cbtest::TempDir dir;
  const fs::path path = dir / "h.curvebench";
  auto store = cb::Store::create(path, sample().property);
  std::vector<Reservation> rows = sample().reservations;
  auto importRows = [&](const std::vector<Reservation> &rs, const char *name) {
    std::ofstream out(dir / name);
    cb::writeNativeCsv(out, rs);
    out.close();
    const cb::ImportReport rep = cb::importReservations(*store, dir / name, {});
    ASSERT_TRUE(rep.written);
  };
  auto expectCurrent = [&] {
    const std::optional<KeptCube> kept =
        cb::readKeptCube(cb::keptCubePathFor(path), store->reservationStamp());
    ASSERT_TRUE(kept);
    expectSameKept(*kept, *cb::keptCubeOf(store->reservations()));
  };
  importRows(rows, "first.csv");
  expectCurrent();

  // A daily extract: two cancellations and a new booking on a later day.
  std::vector<Reservation> extract;
  const Date day = *cb::boundsOf(rows).newest + 1;
  for (std::size_t i = 0; i < rows.size() && extract.size() < 2; ++i)
    if (rows[i].status == cb::ReservationStatus::Booked) {
      Reservation r = rows[i];
      r.status = cb::ReservationStatus::Cancelled;
      r.cancelledOn = day;
      extract.push_back(r);
    }
  ASSERT_EQ(extract.size(), 2u);
  Reservation added = extract.front();
  added.id = "NEW-1";
  added.status = cb::ReservationStatus::Booked;
  added.cancelledOn.reset();
  added.bookedOn = day;
  extract.push_back(added);
  const std::uint64_t before = store->reservationStamp();
  importRows(extract, "daily.csv");
  ASSERT_NE(store->reservationStamp(), before);
  expectCurrent();
  EXPECT_EQ(cb::readKeptCube(cb::keptCubePathFor(path), store->reservationStamp())->bounds.newest,
            day);
}
