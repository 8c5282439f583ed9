// Comparable nights: the selection rule (core/comparablenights.h) by hand, a band worked out by
// hand (quantiles checked with R 4.2.2, tests/reference/quantile_type7.R, samples band_*), and the
// band against the definition-level curve on the sample property, and the night-index path against
// the full cube.
#include "core/comparablenights.h"

#include "core/bookingcurve.h"
#include "core/quantile.h"
#include "core/simulator.h"

#include <gtest/gtest.h>

using cb::ComparableNights;
using cb::ComparableOptions;
using cb::Date;
using cb::HolidayMap;
using cb::Reservation;

namespace {

Date d(const char *iso) { return *Date::parseIso(iso); }

std::vector<Date> dates(std::initializer_list<const char *> isos) {
  std::vector<Date> out;
  for (const char *s : isos)
    out.push_back(d(s));
  return out;
}

Reservation res(const char *id, const char *booked, const char *arr, int rooms,
                const char *cancelled = nullptr) {
  Reservation r;
  r.id = id;
  r.bookedOn = d(booked);
  r.arrival = d(arr);
  r.departure = r.arrival + 1;
  r.rooms = rooms;
  r.segment = "FLEX";
  if (cancelled) {
    r.status = cb::ReservationStatus::Cancelled;
    r.cancelledOn = d(cancelled);
  }
  return r;
}

ComparableOptions weeks(int n) {
  ComparableOptions o;
  o.weeks = n;
  return o;
}

} // namespace

TEST(ComparableNights, SelectionByHand) {
  // Sat 2026-06-20 as of Mon 2026-06-15, ±2 weeks: this year only the Saturdays already past;
  // last year the Saturdays around Sat 2025-06-21 (364 days back).
  cb::Property p;
  auto refs =
      ComparableNights::select(d("2026-06-20"), d("2026-06-15"), p, HolidayMap{}, {}, weeks(2));
  EXPECT_EQ(refs, dates({"2025-06-07", "2025-06-14", "2025-06-21", "2025-06-28", "2025-07-05",
                         "2026-06-06", "2026-06-13"}));
  // Calendar alignment gives Fri 2025-06-20; the nearest Saturday is the next day: same set.
  p.stly = cb::StlyAlignment::CalendarDate;
  EXPECT_EQ(
      ComparableNights::select(d("2026-06-20"), d("2026-06-15"), p, HolidayMap{}, {}, weeks(2)),
      refs);
  // A night already past takes the Saturdays on both sides, never itself.
  p.stly = cb::StlyAlignment::Weekday364;
  EXPECT_EQ(
      ComparableNights::select(d("2026-05-30"), d("2026-06-15"), p, HolidayMap{}, {}, weeks(2)),
      dates({"2025-05-17", "2025-05-24", "2025-05-31", "2025-06-07", "2025-06-14", "2026-05-16",
             "2026-05-23", "2026-06-06", "2026-06-13"}));
}

TEST(ComparableNights, EventsAndHolidayPairs) {
  cb::Property p;
  std::vector<cb::EventNote> events = {{d("2025-06-13"), d("2025-06-15"), "Regatta"}};
  auto o = weeks(2);
  o.excludeEvents = true;
  EXPECT_EQ(
      ComparableNights::select(d("2026-06-20"), d("2026-06-15"), p, HolidayMap{}, events, o),
      dates({"2025-06-07", "2025-06-21", "2025-06-28", "2025-07-05", "2026-06-06", "2026-06-13"}));
  o.excludeEvents = false; // events listed but not excluded: the Regatta Saturday stays
  EXPECT_EQ(
      ComparableNights::select(d("2026-06-20"), d("2026-06-15"), p, HolidayMap{}, events, o).size(),
      7u);
  // Paired with Wed 2025-06-11: the nearest Saturday is 2025-06-14 (3 days on).
  HolidayMap map;
  map.addPair(d("2026-06-20"), d("2025-06-11"));
  EXPECT_EQ(ComparableNights::select(d("2026-06-20"), d("2026-06-15"), p, map, {}, weeks(2)),
            dates({"2025-05-31", "2025-06-07", "2025-06-14", "2025-06-21", "2025-06-28",
                   "2026-06-06", "2026-06-13"}));
  EXPECT_THROW(ComparableNights::select(d("2026-06-20"), d("2026-06-15"), p, map, {}, weeks(-1)),
               std::invalid_argument);
}

TEST(ComparableNights, BandByHand) {
  // Sat 2026-06-20 as of 2026-06-15, ±1 week: references 2026-06-13, 2025-06-14, 2025-06-21,
  // 2025-06-28. Their curves at leads 0 … 3:
  //   2026-06-13: 3 3 2 2 (final 3)     2025-06-14: 4 4 0 0 (final 4)
  //   2025-06-21: 0 0 0 0 (final 0)     2025-06-28: 1 0 5 5 (final 1; 5 rooms cancelled at lead 1)
  std::vector<Reservation> rs = {
      res("a", "2026-06-01", "2026-06-13", 2),
      res("b", "2026-06-12", "2026-06-13", 1),
      res("c", "2025-06-13", "2025-06-14", 4),
      res("d", "2025-06-20", "2025-06-28", 5, "2025-06-27"),
      res("e", "2025-06-28", "2025-06-28", 1),
      res("f", "2026-06-15", "2026-06-20", 9), // the night itself never counts
  };
  auto o = weeks(1);
  o.maxDba = 3;
  auto c = ComparableNights::build(rs, d("2026-06-20"), d("2026-06-15"), cb::Property{},
                                   HolidayMap{}, {}, o);
  EXPECT_EQ(c.references(), dates({"2025-06-14", "2025-06-21", "2025-06-28", "2026-06-13"}));
  ASSERT_EQ(c.band().size(), 4u);
  const double tol = 1e-12;
  // Rooms at lead 0: {3, 4, 0, 1} → R: 0.3, 2, 3.7.
  const auto &b0 = c.band()[0];
  EXPECT_EQ(b0.count, 4);
  EXPECT_NEAR(*b0.low, 0.3, tol);
  EXPECT_NEAR(*b0.median, 2, tol);
  EXPECT_NEAR(*b0.high, 3.7, tol);
  // % of final at lead 0 is 100 for every reference with a final; 2025-06-21 (final 0) is out.
  EXPECT_EQ(b0.countPct, 3);
  EXPECT_NEAR(*b0.lowPct, 100, tol);
  EXPECT_NEAR(*b0.highPct, 100, tol);
  // Lead 1: rooms {3, 4, 0, 0} → 0, 1.5, 3.7; % {100, 100, 0} → 20, 100, 100.
  const auto &b1 = c.band()[1];
  EXPECT_NEAR(*b1.low, 0, tol);
  EXPECT_NEAR(*b1.median, 1.5, tol);
  EXPECT_NEAR(*b1.high, 3.7, tol);
  EXPECT_NEAR(*b1.lowPct, 20, tol);
  EXPECT_NEAR(*b1.medianPct, 100, tol);
  // Lead 2: rooms {2, 0, 0, 5} → 0, 1, 4.1; % {66.67, 0, 500} → 13.33, 66.67, 413.33.
  const auto &b2 = c.band()[2];
  EXPECT_NEAR(*b2.median, 1, tol);
  EXPECT_NEAR(*b2.high, 4.1, tol);
  EXPECT_NEAR(*b2.lowPct, 13.333333333333332, tol);
  EXPECT_NEAR(*b2.medianPct, 66.666666666666671, tol);
  EXPECT_NEAR(*b2.highPct, 413.33333333333326, 1e-9);

  // Other quantiles on request: the 25 % / 75 % band of lead 0, {0, 1, 3, 4} → 0.75, 3.25.
  o.lowProbability = 0.25;
  o.highProbability = 0.75;
  auto q = ComparableNights::build(rs, d("2026-06-20"), d("2026-06-15"), cb::Property{},
                                   HolidayMap{}, {}, o);
  EXPECT_NEAR(*q.band()[0].low, 0.75, tol);
  EXPECT_NEAR(*q.band()[0].high, 3.25, tol);
  // A segment nobody booked: 0 rooms on every reference, no % band.
  auto none = ComparableNights::build(rs, d("2026-06-20"), d("2026-06-15"), cb::Property{},
                                      HolidayMap{}, {}, weeks(1), cb::SeriesBy::Segment, "CORP");
  EXPECT_EQ(none.band()[0].count, 4);
  EXPECT_EQ(*none.band()[0].high, 0);
  EXPECT_EQ(none.band()[0].countPct, 0);
  EXPECT_FALSE(none.band()[0].medianPct.has_value());
}

TEST(ComparableNights, SampleBandMatchesTheDefinitionLevelCurves) {
  auto sample = cb::simulateProperty();
  const auto &rs = sample.reservations;
  const auto map = HolidayMap::fromEvents(sample.events);
  ComparableOptions o;
  o.maxDba = 120;
  o.excludeEvents = true;
  const Date asOf = sample.readingDate;
  for (Date night : {asOf + 10, asOf + 45, asOf - 30}) {
    for (const std::string seg : {"", "CORP"}) {
      auto c = ComparableNights::build(rs, night, asOf, sample.property, map, sample.events, o,
                                       seg.empty() ? cb::SeriesBy::Total : cb::SeriesBy::Segment,
                                       seg.empty() ? "ALL" : seg);
      ASSERT_GE(c.references().size(), 8u) << night.toIso();
      std::vector<cb::NightCurve> curves;
      for (Date r : c.references()) {
        ASSERT_EQ(r.isoWeekday(), night.isoWeekday());
        ASSERT_LE(r, asOf);
        ASSERT_NE(r, night);
        for (const auto &e : sample.events) {
          ASSERT_FALSE(e.from <= r && r <= e.to) << r.toIso() << " is in " << e.label;
        }
        curves.push_back(cb::bookingCurve(rs, r, o.maxDba, seg));
      }
      for (int dba = 0; dba <= o.maxDba; ++dba) {
        std::vector<double> rooms, pct;
        for (const auto &cv : curves) {
          rooms.push_back(cv.rooms[static_cast<std::size_t>(dba)]);
          if (cv.rooms[0] > 0)
            pct.push_back(100.0 * cv.rooms[static_cast<std::size_t>(dba)] / cv.rooms[0]);
        }
        const auto &b = c.band()[static_cast<std::size_t>(dba)];
        ASSERT_EQ(b.count, static_cast<int>(rooms.size()));
        ASSERT_DOUBLE_EQ(*b.median, cb::quantileType7(rooms, 0.5)) << dba;
        ASSERT_DOUBLE_EQ(*b.low, cb::quantileType7(rooms, 0.1)) << dba;
        ASSERT_DOUBLE_EQ(*b.high, cb::quantileType7(rooms, 0.9)) << dba;
        ASSERT_LE(*b.low, *b.median);
        ASSERT_LE(*b.median, *b.high);
        ASSERT_EQ(b.countPct, static_cast<int>(pct.size()));
        if (!pct.empty()) {
          ASSERT_DOUBLE_EQ(*b.medianPct, cb::quantileType7(pct, 0.5)) << dba;
        }
      }
    }
  }
}

TEST(ComparableNights, NothingDatedAfterTheReadingDateChangesIt) {
  auto sample = cb::simulateProperty();
  const Date t = sample.readingDate - 200;
  std::vector<Reservation> truncated;
  for (auto r : sample.reservations) {
    if (r.bookedOn > t)
      continue;
    if (r.cancelledOn && *r.cancelledOn > t) {
      r.cancelledOn.reset();
      r.status = cb::ReservationStatus::Booked;
    }
    truncated.push_back(r);
  }
  ComparableOptions o;
  o.maxDba = 60;
  for (Date night : {t + 3, t + 30}) {
    auto full = ComparableNights::build(sample.reservations, night, t, sample.property,
                                        HolidayMap{}, {}, o, cb::SeriesBy::Segment, "FLEX");
    auto cut = ComparableNights::build(truncated, night, t, sample.property, HolidayMap{}, {}, o,
                                       cb::SeriesBy::Segment, "FLEX");
    ASSERT_EQ(full.references(), cut.references());
    for (int dba = 0; dba <= o.maxDba; ++dba) {
      const auto &a = full.band()[static_cast<std::size_t>(dba)];
      const auto &b = cut.band()[static_cast<std::size_t>(dba)];
      ASSERT_EQ(a.median, b.median);
      ASSERT_EQ(a.low, b.low);
      ASSERT_EQ(a.high, b.high);
      ASSERT_EQ(a.medianPct, b.medianPct);
    }
  }
}

// The night-index path (what Date Study uses at each night switch) gives exactly what a cube of
// every reservation gives: on the sample property, three reading dates, nights before and after
// each, the hotel, every segment, a segment no row has, and the split named "ALL"; with and
// without the events left out, at leads up to 400 (beyond the data's first bookings).
TEST(ComparableNights, NightIndexPathEqualsTheFullCube) {
  auto sample = cb::simulateProperty();
  const auto &rs = sample.reservations;
  const cb::NightIndex index(rs);
  const auto newest = cb::newestActivity(rs);
  const auto map = HolidayMap::fromEvents(sample.events);
  auto same = [](const std::optional<double> &a, const std::optional<double> &b) {
    return a.has_value() == b.has_value() && (!a || *a == *b); // exact: the same arithmetic
  };
  int compared = 0;
  for (Date asOf : {sample.readingDate, sample.readingDate - 200, sample.readingDate - 700}) {
    for (int offset : {-400, -30, 1, 17, 45, 200}) {
      const Date night = asOf + offset;
      for (const std::string seg : {"", "FLEX", "CORP", "ADV", "GRP", "WHL", "NOSUCH", "ALL"}) {
        for (bool excludeEvents : {false, true}) {
          ComparableOptions o;
          o.maxDba = offset > 0 ? std::max(90, offset + 30) : 90;
          o.excludeEvents = excludeEvents;
          const auto by = seg.empty() ? cb::SeriesBy::Total : cb::SeriesBy::Segment;
          const std::string series = seg.empty() ? "ALL" : seg;
          auto full = ComparableNights::build(rs, night, asOf, sample.property, map, sample.events,
                                              o, by, series);
          auto fast = ComparableNights::build(rs, index, newest, night, asOf, sample.property, map,
                                              sample.events, o, by, series);
          ASSERT_EQ(full.night(), fast.night());
          ASSERT_EQ(full.references(), fast.references());
          ASSERT_EQ(full.band().size(), fast.band().size());
          for (std::size_t k = 0; k < full.band().size(); ++k) {
            const auto &a = full.band()[k];
            const auto &b = fast.band()[k];
            ASSERT_EQ(a.dba, b.dba);
            ASSERT_EQ(a.count, b.count) << night.toIso() << " " << seg << " lead " << k;
            ASSERT_EQ(a.countPct, b.countPct) << night.toIso() << " " << seg << " lead " << k;
            ASSERT_TRUE(same(a.low, b.low) && same(a.median, b.median) && same(a.high, b.high))
                << night.toIso() << " " << seg << " lead " << k;
            ASSERT_TRUE(same(a.lowPct, b.lowPct) && same(a.medianPct, b.medianPct) &&
                        same(a.highPct, b.highPct))
                << night.toIso() << " " << seg << " lead " << k;
          }
          ++compared;
        }
      }
    }
  }
  EXPECT_EQ(compared, 3 * 6 * 8 * 2);
  // The band is not empty where it matters: the hotel's band a month out has rooms in it.
  ComparableOptions o;
  auto hotel = ComparableNights::build(rs, index, newest, sample.readingDate + 30,
                                       sample.readingDate, sample.property, map, sample.events, o);
  ASSERT_GE(hotel.references().size(), 8u);
  EXPECT_GT(*hotel.band()[0].median, 0.0);
  // The errors of build(): a reading date after the newest activity, and no data.
  EXPECT_THROW(ComparableNights::build(rs, index, newest, *newest + 10, *newest + 1,
                                       sample.property, map, sample.events, o),
               cb::AsOfError);
  EXPECT_THROW(ComparableNights::build({}, cb::NightIndex(), std::nullopt, *newest, *newest,
                                       sample.property, map, sample.events, o),
               cb::AsOfError);
}
