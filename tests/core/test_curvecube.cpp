// The curve cube against the definitions (brief section 4), counted another way: straight from
// the reservation rows with Reservation::onBooks / bookingCurve, by hand, and (for the open
// dataset) by an independent pandas script whose output is committed under tests/reference/.
#include "core/curvecube.h"

#include "core/bookingcurve.h"
#include "core/reservationimporter.h"
#include "core/simulator.h"
#include "core/store.h"
#include "testsupport.h"

#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <map>
#include <random>
#include <sstream>

using cb::CubeOptions;
using cb::CurveCube;
using cb::Date;
using cb::Reservation;
using cb::ReservationStatus;
using cb::SeriesBy;

namespace {

Date d(const char *iso) { return *Date::parseIso(iso); }

Reservation res(const char *id, const char *booked, const char *arr, const char *dep, int rooms,
                double rate, const char *seg, const char *cancelled = nullptr) {
  Reservation r;
  r.id = id;
  r.bookedOn = d(booked);
  r.arrival = d(arr);
  r.departure = d(dep);
  r.rooms = rooms;
  r.rate = rate;
  r.segment = seg;
  r.channel = "WEB";
  r.roomType = "STD";
  if (cancelled) {
    r.status = ReservationStatus::Cancelled;
    r.cancelledOn = d(cancelled);
  }
  return r;
}

double seconds(std::chrono::steady_clock::time_point t0) {
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
}

const std::string &codeOf(const Reservation &r, SeriesBy by) {
  switch (by) {
  case SeriesBy::Segment: return r.segment;
  case SeriesBy::Channel: return r.channel;
  default: return r.roomType;
  }
}

std::pair<Date, Date> stayRange(const std::vector<Reservation> &rs) {
  Date lo = rs.front().arrival, hi = rs.front().arrival;
  for (const auto &r : rs) {
    lo = std::min(lo, r.arrival);
    hi = std::max(hi, r.departure - 1);
  }
  return {lo, hi};
}

/// Compares `cells` random (night, lead, series) cells, and every series of a few whole nights,
/// with a count straight from the rows: Reservation::onBooks per row, or bookingCurve for the
/// segment split — code paths that share nothing with the cube's intervals.
void crossCheck(const std::vector<Reservation> &rs, const CurveCube &cube, int cells,
                unsigned seed) {
  // Rows by night covered, so the brute force stays affordable; the count itself is onBooks.
  std::vector<std::vector<const Reservation *>> byNight(static_cast<std::size_t>(cube.nights()));
  for (const auto &r : rs)
    for (Date s = std::max(r.arrival, cube.firstNight());
         s < std::min(r.departure, cube.lastNight() + 1); ++s)
      byNight[static_cast<std::size_t>(s - cube.firstNight())].push_back(&r);

  std::mt19937 rng(seed);
  std::uniform_int_distribution<int> night(0, cube.nights() - 1);
  std::uniform_int_distribution<int> lead(0, cube.maxDba());
  std::uniform_int_distribution<std::size_t> series(0, cube.series().size() - 1);
  int checked = 0, nonZero = 0;
  for (int k = 0; k < cells; ++k) {
    const Date s = cube.firstNight() + night(rng);
    const int h = lead(rng);
    const std::size_t i = series(rng);
    if (!cube.known(s, h)) {
      EXPECT_EQ(cube.otbRooms(i, s, h), 0) << "unknown cells read 0";
      continue;
    }
    const std::string &name = cube.series()[i];
    int rooms = 0;
    double revenue = 0;
    for (const Reservation *r : byNight[static_cast<std::size_t>(s - cube.firstNight())]) {
      if (i != 0 && codeOf(*r, cube.by()) != (name == "(none)" ? std::string() : name))
        continue;
      if (r->onBooks(s, s - h)) {
        rooms += r->rooms;
        revenue += r->rate * r->rooms;
      }
    }
    ASSERT_EQ(cube.otbRooms(i, s, h), rooms) << name << " " << s.toIso() << " d=" << h;
    ASSERT_NEAR(cube.otbRevenue(i, s, h), revenue, 1e-6 * std::max(1.0, revenue))
        << name << " " << s.toIso() << " d=" << h;
    ++checked;
    nonZero += rooms > 0;
  }
  EXPECT_GT(checked, cells / 4);
  EXPECT_GT(nonZero, checked / 4) << "the sample of cells should mostly hold bookings";

  if (cube.by() != SeriesBy::Segment && cube.by() != SeriesBy::Total)
    return;
  // Whole curves of a few known nights through bookingCurve (segment filter or the total).
  for (int k = 0; k < 20; ++k) {
    const Date s = std::min(cube.firstNight() + night(rng), cube.asOf());
    if (s < cube.firstNight())
      continue;
    const std::size_t i = series(rng);
    const std::string &name = cube.series()[i];
    cb::NightCurve c = cb::bookingCurve(rs, s, cube.maxDba(), i == 0 ? std::string() : name);
    for (int h = 0; h <= cube.maxDba(); ++h) {
      ASSERT_EQ(cube.otbRooms(i, s, h), c.rooms[static_cast<std::size_t>(h)])
          << name << " " << s.toIso() << " d=" << h;
      ASSERT_NEAR(cube.otbRevenue(i, s, h), c.revenue[static_cast<std::size_t>(h)],
                  1e-6 * std::max(1.0, c.revenue[static_cast<std::size_t>(h)]));
    }
  }
}

/// The total equals the sum of the split in every cell, finals and actuals included.
void checkTotalIsSumOfSplit(const CurveCube &cube) {
  ASSERT_GT(cube.series().size(), 2u);
  for (Date s = cube.firstNight(); s <= cube.lastNight(); ++s) {
    for (int h = 0; h <= cube.maxDba(); ++h) {
      int rooms = 0;
      double revenue = 0;
      for (std::size_t i = 1; i < cube.series().size(); ++i) {
        rooms += cube.otbRooms(i, s, h);
        revenue += cube.otbRevenue(i, s, h);
      }
      ASSERT_EQ(cube.otbRooms(0, s, h), rooms) << s.toIso() << " d=" << h;
      ASSERT_NEAR(cube.otbRevenue(0, s, h), revenue, 1e-6 * std::max(1.0, revenue));
    }
    if (s > cube.asOf())
      continue;
    int actual = 0;
    for (std::size_t i = 1; i < cube.series().size(); ++i)
      actual += *cube.actual(i, s);
    ASSERT_EQ(*cube.actual(0, s), actual) << s.toIso();
  }
}

/// Σ finals over every night up to the reading date = room-nights of the bookings not
/// cancelled, counted per row; Σ actuals = the same less the no-shows' room-nights.
void checkFinalsAreRoomNights(const std::vector<Reservation> &rs, Date asOf) {
  auto [first, last] = stayRange(rs);
  last = std::min(last, asOf);
  CubeOptions o{first, last, 0, SeriesBy::Total, asOf};
  CurveCube cube = CurveCube::build(rs, o);
  std::int64_t roomNights = 0, noShowNights = 0;
  for (const auto &r : rs) {
    // Every cancellation here falls before arrival, so "not cancelled" and "not cancelled by
    // the night" are the same rows.
    ASSERT_TRUE(!r.cancelledOn || *r.cancelledOn <= r.arrival) << r.id;
    if (r.status == ReservationStatus::Cancelled || r.bookedOn > asOf)
      continue;
    const std::int64_t n = std::max(0, std::min(r.departure, last + 1) - r.arrival);
    roomNights += n * r.rooms;
    if (r.status == ReservationStatus::NoShow)
      noShowNights += n * r.rooms;
  }
  std::int64_t finals = 0, actuals = 0;
  for (Date s = first; s <= last; ++s) {
    finals += *cube.final(0, s);
    actuals += *cube.actual(0, s);
  }
  EXPECT_GT(roomNights, 0);
  EXPECT_GT(noShowNights, 0);
  EXPECT_EQ(finals, roomNights);
  EXPECT_EQ(actuals, roomNights - noShowNights);
}

const cb::SampleProperty &sample() {
  static const cb::SampleProperty s = cb::simulateProperty();
  return s;
}

CubeOptions wholeRange(const std::vector<Reservation> &rs, SeriesBy by, int maxDba = 365) {
  auto [first, last] = stayRange(rs);
  return CubeOptions{first, last, maxDba, by, std::nullopt};
}

} // namespace

TEST(CurveCube, SeriesByNamesRoundTrip) {
  for (SeriesBy by : {SeriesBy::Total, SeriesBy::Segment, SeriesBy::Channel, SeriesBy::RoomType})
    EXPECT_EQ(cb::parseSeriesBy(cb::seriesByName(by)), by);
  EXPECT_EQ(cb::seriesByName(SeriesBy::RoomType), "room-type");
  EXPECT_FALSE(cb::parseSeriesBy("rooms"));
}

TEST(CurveCube, MatchesHandComputedOtb) {
  // Night s = 2026-06-13; the same rows as the bookingCurve test, worked out by hand.
  std::vector<Reservation> rs = {
      res("a", "2026-06-03", "2026-06-12", "2026-06-14", 3, 100, "CORP"), // from d = 10
      res("b", "2026-06-11", "2026-06-13", "2026-06-14", 2, 150, "FLEX"), // from d = 2
      res("c", "2026-06-01", "2026-06-13", "2026-06-15", 4, 90, "FLEX", "2026-06-08"), // d 12..6
      res("x", "2026-06-01", "2026-06-13", "2026-06-13", 5, 50, "FLEX"),     // day use: no night
      res("y", "2026-06-01", "2026-06-11", "2026-06-13", 6, 50, "FLEX"),     // departs on s
      res("z", "2026-06-12", "2026-06-14", "2026-06-15", 7, 50, "FLEX"),     // arrives after s
      res("n", "2026-06-02", "2026-06-13", "2026-06-14", 1, 80, ""),         // no-show, no segment
      res("later", "2026-06-20", "2026-07-01", "2026-07-02", 1, 10, "FLEX"), // sets the as-of
  };
  rs[6].status = ReservationStatus::NoShow;
  CurveCube cube = CurveCube::build(
      rs, CubeOptions{d("2026-06-10"), d("2026-06-16"), 14, SeriesBy::Segment, std::nullopt});
  EXPECT_EQ(cube.asOf(), d("2026-06-20"));
  EXPECT_EQ(cube.nights(), 7);
  ASSERT_EQ(cube.series(), (std::vector<std::string>{"ALL", "(none)", "CORP", "FLEX"}));
  const Date s = d("2026-06-13");
  const int all[15] = {6, 6, 6, 4, 4, 4, 8, 8, 8, 8, 8, 5, 4, 0, 0};
  const int flex[15] = {2, 2, 2, 0, 0, 0, 4, 4, 4, 4, 4, 4, 4, 0, 0};
  for (int h = 0; h <= 14; ++h) {
    EXPECT_EQ(cube.otbRooms(0, s, h), all[h]) << "d " << h;
    EXPECT_EQ(cube.otbRooms(3, s, h), flex[h]) << "d " << h;
    EXPECT_EQ(cube.otbRooms(2, s, h), h <= 10 ? 3 : 0) << "d " << h;
    EXPECT_EQ(cube.otbRooms(1, s, h), h <= 11 ? 1 : 0) << "d " << h;
  }
  EXPECT_DOUBLE_EQ(cube.otbRevenue(0, s, 0), 3 * 100.0 + 2 * 150.0 + 80.0);
  EXPECT_DOUBLE_EQ(cube.otbRevenue(0, s, 7), 3 * 100.0 + 4 * 90.0 + 80.0);
  EXPECT_DOUBLE_EQ(cube.otbRevenue(3, s, 12), 4 * 90.0);
  EXPECT_DOUBLE_EQ(cube.otbRevenue(0, s, 14), 0.0);
  EXPECT_EQ(cube.final(0, s), 6);
  EXPECT_EQ(cube.actual(0, s), 5); // the no-show's room was on the books but not occupied
  EXPECT_EQ(cube.actual(1, s), 0);
  EXPECT_EQ(cube.actual(3, s), 2);
  // Night 2026-06-12: a (3) and y (6); the day use on 06-13 never counts.
  EXPECT_EQ(cube.final(0, d("2026-06-12")), 9);
  EXPECT_EQ(cube.final(0, d("2026-06-16")), 0);
  EXPECT_EQ(cube.seriesIndex("FLEX"), 3u);
  EXPECT_FALSE(cube.seriesIndex("GRP"));
  EXPECT_THROW(cube.otbRooms(4, s, 0), std::out_of_range);
  EXPECT_THROW(cube.otbRooms(0, d("2026-06-17"), 0), std::out_of_range);
  EXPECT_THROW(cube.otbRooms(0, s, 15), std::out_of_range);
}

TEST(CurveCube, AsOfHidesLaterCellsAndFinals) {
  std::vector<Reservation> rs = {
      res("a", "2026-06-01", "2026-06-10", "2026-06-12", 2, 100, "CORP"),
      res("b", "2026-06-05", "2026-06-10", "2026-06-11", 1, 100, "CORP", "2026-06-09"),
      res("c", "2026-06-11", "2026-06-20", "2026-06-21", 1, 100, "CORP"),
  };
  CurveCube cube = CurveCube::build(
      rs, CubeOptions{d("2026-06-08"), d("2026-06-12"), 10, SeriesBy::Total, d("2026-06-08")});
  const Date s = d("2026-06-10");
  EXPECT_TRUE(cube.known(s, 2));
  EXPECT_FALSE(cube.known(s, 1));
  EXPECT_EQ(cube.otbRooms(0, s, 2), 3); // b is still on the books on 06-08
  EXPECT_EQ(cube.otbRooms(0, s, 1), 0); // read on 06-09: unknown as of 06-08
  EXPECT_FALSE(cube.final(0, s));
  EXPECT_FALSE(cube.actual(0, s));
  EXPECT_EQ(cube.final(0, d("2026-06-09")), std::nullopt);
  EXPECT_EQ(cube.final(0, d("2026-06-08")), 0);

  // A code first seen in a row booked after the reading date is not a series yet.
  rs.push_back(res("d", "2026-06-11", "2026-06-12", "2026-06-13", 1, 100, "GRP"));
  CurveCube bySegment = CurveCube::build(
      rs, CubeOptions{d("2026-06-08"), d("2026-06-12"), 10, SeriesBy::Segment, d("2026-06-08")});
  EXPECT_EQ(bySegment.series(), (std::vector<std::string>{"ALL", "CORP"}));
}

TEST(CurveCube, RefusesReadingDateAfterTheDataAndBadOptions) {
  std::vector<Reservation> rs = {
      res("a", "2026-10-01", "2026-11-10", "2026-11-12", 2, 100, "CORP", "2026-10-31"),
      res("b", "2026-10-20", "2026-11-10", "2026-11-11", 1, 100, "CORP"),
  };
  EXPECT_EQ(cb::newestActivity(rs), d("2026-10-31"));
  CubeOptions o{d("2026-11-01"), d("2026-11-30"), 30, SeriesBy::Total, d("2026-11-05")};
  try {
    CurveCube::build(rs, o);
    ADD_FAILURE() << "a reading date after the data must be refused";
  } catch (const cb::AsOfError &e) {
    EXPECT_STREQ(e.what(), "reading date 2026-11-05 is after the newest booking or cancellation "
                           "in the data (2026-10-31)");
  }
  o.asOf = d("2026-10-31");
  EXPECT_NO_THROW(CurveCube::build(rs, o));
  o.lastNight = d("2026-10-30");
  EXPECT_THROW(CurveCube::build(rs, o), cb::AsOfError);
  o.lastNight = d("2026-11-30");
  o.maxDba = -1;
  EXPECT_THROW(CurveCube::build(rs, o), cb::AsOfError);
  EXPECT_THROW(CurveCube::build({}, CubeOptions{d("2026-11-01"), d("2026-11-30"), 30,
                                                SeriesBy::Total, std::nullopt}),
               cb::AsOfError);
}

TEST(CurveCube, SampleMatchesRowCountsForEverySplit) {
  const auto &rs = sample().reservations;
  for (SeriesBy by : {SeriesBy::Segment, SeriesBy::Channel, SeriesBy::RoomType}) {
    auto t0 = std::chrono::steady_clock::now();
    CurveCube cube = CurveCube::build(rs, wholeRange(rs, by));
    std::printf("[ timing   ] sample cube by %s (%zu rows, %d nights, %zu series) in %.3f s\n",
                std::string(cb::seriesByName(by)).c_str(), rs.size(), cube.nights(),
                cube.series().size(), seconds(t0));
    EXPECT_EQ(cube.asOf(), sample().readingDate);
    crossCheck(rs, cube, 4000, 7u + static_cast<unsigned>(by));
    checkTotalIsSumOfSplit(cube);
  }
}

TEST(CurveCube, SampleFinalsAreTheRoomNightsNotCancelled) {
  checkFinalsAreRoomNights(sample().reservations, sample().readingDate);
}

namespace {

void expectSameKnownFigures(const CurveCube &a, const CurveCube &b) {
  ASSERT_EQ(a.series(), b.series());
  ASSERT_EQ(a.asOf(), b.asOf());
  int knownCells = 0;
  for (std::size_t i = 0; i < a.series().size(); ++i) {
    for (Date s = a.firstNight(); s <= a.lastNight(); ++s) {
      for (int h = 0; h <= a.maxDba(); ++h) {
        if (!a.known(s, h))
          continue;
        ++knownCells;
        ASSERT_EQ(a.otbRooms(i, s, h), b.otbRooms(i, s, h)) << s.toIso() << " d=" << h;
        ASSERT_EQ(a.otbRevenue(i, s, h), b.otbRevenue(i, s, h)) << s.toIso() << " d=" << h;
      }
      ASSERT_EQ(a.final(i, s), b.final(i, s)) << s.toIso();
      ASSERT_EQ(a.actual(i, s), b.actual(i, s)) << s.toIso();
    }
  }
  EXPECT_GT(knownCells, 100000);
}

} // namespace

TEST(CurveCube, AsOfIgnoresEverythingDatedLater) {
  const auto &all = sample().reservations;
  // T: a day with bookings, so the cut extract still reaches it; well inside the history.
  const Date t = d("2025-06-17");
  std::vector<Reservation> cut = cbtest::cutAt(all, t);
  ASSERT_EQ(cb::newestActivity(cut), t);
  ASSERT_LT(cut.size(), all.size());
  ASSERT_TRUE(std::any_of(all.begin(), all.end(), [&](const Reservation &r) {
    return r.cancelledOn && *r.cancelledOn > t && r.bookedOn <= t;
  })) << "the check needs cancellations that come after T";
  for (SeriesBy by : {SeriesBy::Total, SeriesBy::Segment}) {
    CubeOptions o = wholeRange(all, by);
    o.asOf = t;
    CurveCube fromAll = CurveCube::build(all, o);
    CurveCube fromCut = CurveCube::build(cut, o);
    expectSameKnownFigures(fromAll, fromCut);
    crossCheck(all, fromAll, 2000, 31u + static_cast<unsigned>(by));
    EXPECT_TRUE(fromAll.final(0, t));
    EXPECT_FALSE(fromAll.final(0, t + 1));
    // The newest data does change figures as of T would have hidden: finals after T appear.
    o.asOf.reset();
    CurveCube now = CurveCube::build(all, o);
    EXPECT_TRUE(now.final(0, t + 30));
  }
}

using cbtest::expectSameCube;

// A cube as of the newest date, narrowed to an earlier reading date and fewer nights, against
// the cube built from the reservations for that date (what Horizon does when the reading date
// moves back). Cell for cell, unknown cells included.
TEST(CurveCube, NarrowedIsTheCubeBuiltAtTheEarlierDate) {
  const auto &all = sample().reservations;
  const Date newest = *cb::newestActivity(all);
  for (SeriesBy by : {SeriesBy::Total, SeriesBy::Segment}) {
    CubeOptions o = wholeRange(all, by);
    o.lastNight = newest + 90;
    o.maxDba = 121;
    o.asOf = newest;
    const CurveCube wide = CurveCube::build(all, o);
    for (int back : {0, 1, 40, 400}) {
      CubeOptions earlier = o;
      earlier.asOf = newest - back;
      earlier.lastNight = newest - back + 90;
      ASSERT_TRUE(wide.canNarrowTo(earlier)) << back;
      expectSameCube(wide.narrowed(earlier), CurveCube::build(all, earlier));
    }
    // Fewer leads and a later first night, with an earlier date too: a cell at lead d is
    // OTB(s, s − d) whatever the longest lead.
    for (int lead : {121, 120, 30, 0}) {
      CubeOptions fewer = o;
      fewer.maxDba = lead;
      fewer.firstNight = o.firstNight + 200;
      fewer.asOf = newest - 10;
      fewer.lastNight = newest + 20;
      ASSERT_TRUE(wide.canNarrowTo(fewer)) << lead;
      expectSameCube(wide.narrowed(fewer), CurveCube::build(all, fewer));
    }
    // Not from a cube of an earlier date, more leads, another split or a later last night.
    CubeOptions later = o;
    later.asOf = newest - 1;
    EXPECT_FALSE(CurveCube::build(all, later).canNarrowTo(o));
    CubeOptions other = o;
    other.maxDba = 122;
    EXPECT_FALSE(wide.canNarrowTo(other));
    EXPECT_FALSE(wide.canNarrowTo(other, CurveCube::Outside::Empty));
    other = o;
    other.by = by == SeriesBy::Total ? SeriesBy::Segment : SeriesBy::Total;
    EXPECT_FALSE(wide.canNarrowTo(other));
    other = o;
    other.lastNight = o.lastNight + 1;
    EXPECT_FALSE(wide.canNarrowTo(other));
    EXPECT_THROW((void)wide.narrowed(other), std::invalid_argument);
    other = o;
    other.firstNight = o.firstNight - 1;
    EXPECT_FALSE(wide.canNarrowTo(other));
    other = o;
    other.asOf.reset();
    EXPECT_FALSE(wide.canNarrowTo(other));
  }
}

// A segment first booked after the earlier date is not a series of the narrowed cube, as it is
// not one of the cube built for that date; a no-show booked after its night (invalid data the
// cube still takes) makes a cube that is not narrowed.
TEST(CurveCube, NarrowedKeepsTheSeriesBookedByThen) {
  std::vector<Reservation> rows = {
      res("1", "2026-03-01", "2026-03-10", "2026-03-12", 2, 100.0, "CORP"),
      res("2", "2026-03-03", "2026-03-11", "2026-03-13", 1, 80.0, "LEIS", "2026-03-08"),
      res("3", "2026-03-06", "2026-03-10", "2026-03-11", 3, 90.0, "GRP"),
      res("4", "2026-03-09", "2026-03-12", "2026-03-14", 1, 120.0, "CORP"),
  };
  CubeOptions o{d("2026-03-08"), d("2026-03-16"), 10, SeriesBy::Segment, d("2026-03-09")};
  const CurveCube wide = CurveCube::build(rows, o);
  EXPECT_EQ(wide.series(), (std::vector<std::string>{"ALL", "CORP", "GRP", "LEIS"}));
  for (const char *t : {"2026-03-02", "2026-03-05", "2026-03-06", "2026-03-08"}) {
    CubeOptions earlier = o;
    earlier.asOf = d(t);
    earlier.lastNight = d("2026-03-13");
    ASSERT_TRUE(wide.canNarrowTo(earlier)) << t;
    expectSameCube(wide.narrowed(earlier), CurveCube::build(rows, earlier));
  }
  CubeOptions early = o;
  early.asOf = d("2026-03-05");
  EXPECT_EQ(wide.narrowed(early).series(), (std::vector<std::string>{"ALL", "CORP", "LEIS"}));

  rows.push_back(res("5", "2026-03-09", "2026-03-08", "2026-03-09", 1, 70.0, "CORP"));
  rows.back().status = ReservationStatus::NoShow;
  EXPECT_FALSE(CurveCube::build(rows, o).canNarrowTo(early));
  // At its own date a cube with a late no-show still gives fewer nights or leads.
  CubeOptions same = o;
  same.lastNight = d("2026-03-12");
  same.maxDba = 4;
  const CurveCube withLate = CurveCube::build(rows, o);
  ASSERT_TRUE(withLate.canNarrowTo(same));
  expectSameCube(withLate.narrowed(same), CurveCube::build(rows, same));
}

// A cube over every night stayed (nights from the first to the last, or to the reading date +
// leads) gives nights outside its own: they are empty, as build() finds them. What the kept
// cube beside a store relies on (core/keptcube.h).
TEST(CurveCube, NarrowedOutsideAnEmptyRangeGivesEmptyNights) {
  const std::vector<Reservation> rows = {
      res("1", "2026-03-01", "2026-03-10", "2026-03-12", 2, 100.0, "CORP"),
      res("2", "2026-03-03", "2026-03-11", "2026-03-13", 1, 80.0, "LEIS", "2026-03-08"),
      res("3", "2026-03-06", "2026-03-10", "2026-03-11", 3, 90.0, "GRP"),
      res("4", "2026-03-09", "2026-03-12", "2026-03-30", 1, 120.0, "CORP"),
  };
  // Nights 03-10 … 03-19 (the reading date 03-09 + 10 leads; 03-20 … 03-29 are unknown).
  for (SeriesBy by : {SeriesBy::Total, SeriesBy::Segment}) {
    const CubeOptions o{d("2026-03-10"), d("2026-03-19"), 10, by, d("2026-03-09")};
    const CurveCube all = CurveCube::build(rows, o);
    for (const char *t : {"2026-03-09", "2026-03-07", "2026-02-20"})
      for (int lead : {10, 6}) {
        const CubeOptions wider{d("2026-03-01"), d("2026-04-15"), lead, by, d(t)};
        EXPECT_FALSE(all.canNarrowTo(wider));
        ASSERT_TRUE(all.canNarrowTo(wider, CurveCube::Outside::Empty)) << t;
        expectSameCube(all.narrowed(wider, CurveCube::Outside::Empty),
                       CurveCube::build(rows, wider));
      }
    // A range too large for build() (over 250 million cells) is not made by narrowing either.
    const CurveCube deep =
        CurveCube::build(rows, {d("2026-03-10"), d("2026-03-29"), 3650, by, d("2026-03-09")});
    const CubeOptions huge{d("1900-01-01"), d("2400-01-01"), 3650, by, d("2026-03-09")};
    EXPECT_FALSE(deep.canNarrowTo(huge, CurveCube::Outside::Empty));
    EXPECT_THROW((void)CurveCube::build(rows, huge), cb::AsOfError);
  }
}

// ---- The open city dataset: Antonio, de Almeida & Nunes, "Hotel booking demand datasets",
// Data in Brief 22 (2019) 41–49, doi:10.1016/j.dib.2018.11.126, CC BY 4.0. ----

namespace {

class OpenCity : public ::testing::Test {
protected:
  static void SetUpTestSuite() {
    const auto csv = cbtest::openCityCsv();
    if (!std::filesystem::exists(csv)) {
      const char *allow = std::getenv("CURVEBENCH_ALLOW_MISSING_SHARED");
      skip_ = allow != nullptr && std::string_view(allow) == "1";
      missing_ = "open dataset not found at " + csv.string() +
                 (skip_ ? " (skipped: CURVEBENCH_ALLOW_MISSING_SHARED=1)"
                        : "; put the shared folder beside the clone, or set "
                          "CURVEBENCH_ALLOW_MISSING_SHARED=1 to skip this test");
      return;
    }
    cbtest::TempDir dir;
    cb::Property p;
    p.name = "City hotel (open data)";
    p.capacity = 400;
    auto store = cb::Store::create(dir / "open.curvebench", p);
    cb::ImportOptions opt;
    opt.profile = "hotel-bookings-open-data";
    cb::ImportReport rep = cb::importReservations(*store, csv, opt);
    ASSERT_TRUE(rep.written);
    rows_ = new std::vector<Reservation>(store->reservations());
  }
  static void TearDownTestSuite() {
    delete rows_;
    rows_ = nullptr;
  }
  void SetUp() override {
    if (!missing_.empty()) {
      if (skip_)
        GTEST_SKIP() << missing_;
      FAIL() << missing_;
    }
    ASSERT_NE(rows_, nullptr) << "the import failed";
  }
  static const std::vector<Reservation> &rows() { return *rows_; }

private:
  static inline std::vector<Reservation> *rows_ = nullptr;
  static inline std::string missing_;
  static inline bool skip_ = false;
};

} // namespace

TEST_F(OpenCity, CubeMatchesRowCountsForEverySplit) {
  // 79,330 bookings (Antonio et al. 2019, Table 1).
  ASSERT_EQ(rows().size(), 79330u);
  for (SeriesBy by : {SeriesBy::Segment, SeriesBy::Channel, SeriesBy::RoomType}) {
    auto t0 = std::chrono::steady_clock::now();
    CurveCube cube = CurveCube::build(rows(), wholeRange(rows(), by));
    std::printf("[ timing   ] open city cube by %s (%zu rows, %d nights, %zu series) in %.3f s\n",
                std::string(cb::seriesByName(by)).c_str(), rows().size(), cube.nights(),
                cube.series().size(), seconds(t0));
    crossCheck(rows(), cube, 4000, 101u + static_cast<unsigned>(by));
    checkTotalIsSumOfSplit(cube);
  }
}

TEST_F(OpenCity, FinalsAreTheRoomNightsNotCancelled) {
  checkFinalsAreRoomNights(rows(), *cb::newestActivity(rows()));
}

TEST_F(OpenCity, CurvesMatchThePandasReference) {
  // tests/reference/open_city_curves.csv: OTB of four nights, d = 0…60, total and by
  // market_segment, computed from the raw CSV with pandas by tests/reference/open_city_curves.py
  // (its own date derivations; no Curvebench code involved).
  std::istringstream in(
      cbtest::readFile(cbtest::sourceDir() / "tests" / "reference" / "open_city_curves.csv"));
  CurveCube cube = CurveCube::build(
      rows(), CubeOptions{d("2016-03-12"), d("2017-05-06"), 60, SeriesBy::Segment, std::nullopt});
  std::string line;
  std::getline(in, line);
  while (!line.empty() && line[0] == '#')
    std::getline(in, line);
  ASSERT_EQ(line, "stay_date,series,dba,otb_rooms");
  std::map<std::string, int> perSeries;
  int compared = 0;
  while (std::getline(in, line)) {
    std::istringstream fields(line);
    std::string night, series, dba, rooms;
    std::getline(fields, night, ',');
    std::getline(fields, series, ',');
    std::getline(fields, dba, ',');
    std::getline(fields, rooms, ',');
    auto i = cube.seriesIndex(series);
    ASSERT_TRUE(i) << "series missing from the cube: " << series;
    ASSERT_TRUE(cube.known(d(night.c_str()), std::stoi(dba)));
    ASSERT_EQ(cube.otbRooms(*i, d(night.c_str()), std::stoi(dba)), std::stoi(rooms)) << line;
    ++perSeries[series];
    ++compared;
  }
  EXPECT_EQ(compared, 4 * 9 * 61); // 4 nights × (ALL + 8 segments) × d = 0…60
  EXPECT_EQ(perSeries.size(), cube.series().size()) << "every cube series is in the reference";
}

// boundsOf, by hand: the newest activity is a cancellation date when that is the latest; a day
// use that arrives first counts for firstArrival, not for firstStay; a cube given the newest
// activity (CubeOptions::newest) holds the same cells as one that finds it itself.
TEST(CurveCube, BoundsOfTheReservationsInOnePass) {
  std::vector<Reservation> rs = {
      res("1", "2026-05-01", "2026-06-10", "2026-06-12", 2, 100, "TRN"),
      res("2", "2026-05-20", "2026-06-05", "2026-06-05", 1, 50, "TRN"), // day use, first arrival
      res("3", "2026-05-03", "2026-06-08", "2026-06-09", 1, 90, "GRP", "2026-06-01"),
      res("4", "2026-05-25", "2026-06-12", "2026-06-14", 3, 80, "GRP")};
  const cb::ReservationBounds b = cb::boundsOf(rs);
  EXPECT_EQ(b.newest, d("2026-06-01"));
  EXPECT_EQ(b.newest, cb::newestActivity(rs));
  EXPECT_EQ(b.firstArrival, d("2026-06-05"));
  EXPECT_EQ(b.firstStay, d("2026-06-08"));
  const cb::ReservationBounds none = cb::boundsOf(std::vector<cb::Reservation>{});
  EXPECT_FALSE(none.newest || none.firstArrival || none.firstStay);

  CubeOptions o{d("2026-06-05"), d("2026-06-14"), 20, SeriesBy::Segment, d("2026-05-28")};
  const CurveCube found = CurveCube::build(rs, o);
  o.newest = b.newest;
  const CurveCube given = CurveCube::build(rs, o);
  ASSERT_EQ(found.series(), given.series());
  int nonZero = 0;
  for (std::size_t si = 0; si < found.series().size(); ++si)
    for (Date s = o.firstNight; s <= o.lastNight; ++s)
      for (int k = 0; k <= o.maxDba; ++k) {
        EXPECT_EQ(found.otbRooms(si, s, k), given.otbRooms(si, s, k));
        nonZero += found.otbRooms(si, s, k) != 0;
      }
  EXPECT_GT(nonZero, 0);
  o.asOf = d("2026-06-02"); // after the newest activity: refused either way
  EXPECT_THROW(CurveCube::build(rs, o), cb::AsOfError);
}
