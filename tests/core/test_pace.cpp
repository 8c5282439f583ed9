// Pace against figures worked out by hand from the definitions (brief section 4: OTB, STLY),
// and against the definition-level booking curve on the sample property.
#include "core/pace.h"

#include "core/bookingcurve.h"
#include "core/simulator.h"

#include "testsupport.h"

#include <gtest/gtest.h>

#include <random>

using cb::Date;
using cb::HolidayMap;
using cb::Reservation;
using cbtest::makeReservation;

namespace {

Date d(const char *iso) { return *Date::parseIso(iso); }

// Reading date Mon 2026-06-15; nights 06-16 … 06-20 (leads 1 … 5). With the 364-day alignment
// every STLY cell is read on 2025-06-16.
std::vector<Reservation> handSet() {
  return {
      // This year.
      makeReservation("A", "2026-05-01", "2026-06-19", "2026-06-21", 3, "CORP"),
      makeReservation("B", "2026-06-10", "2026-06-20", "2026-06-21", 2, "FLEX"),
      makeReservation("C", "2026-06-01", "2026-06-20", "2026-06-21", 4, "FLEX",
                      "2026-06-12"),                                             // gone by t
      makeReservation("D", "2026-06-16", "2026-06-20", "2026-06-21", 5, "FLEX"), // after t
      makeReservation("H", "2026-06-14", "2026-06-17", "2026-06-18", 1, "CORP"),
      // Last year.
      makeReservation("E", "2025-06-01", "2025-06-20", "2025-06-22", 2, "CORP"),
      makeReservation("F", "2025-06-17", "2025-06-21", "2025-06-22", 6,
                      "FLEX"), // a day after the STLY read
      makeReservation("G", "2025-06-10", "2025-06-21", "2025-06-22", 1, "FLEX",
                      "2025-06-18"), // still on
      makeReservation("I", "2025-06-01", "2025-06-13", "2025-06-14", 4, "CORP"),
      makeReservation("J", "2025-06-08", "2025-06-12", "2025-06-13", 2, "FLEX"),
  };
}

cb::PaceOptions opts(cb::SeriesBy by = cb::SeriesBy::Total) {
  cb::PaceOptions o;
  o.asOf = d("2026-06-15");
  o.firstNight = d("2026-06-16");
  o.lastNight = d("2026-06-20");
  o.by = by;
  return o;
}

} // namespace

TEST(Pace, AgainstSameTimeLastYearByHand) {
  cb::Property p;
  auto pace = cb::Pace::build(handSet(), p, HolidayMap{}, opts());
  ASSERT_EQ(pace.series(), std::vector<std::string>{"ALL"});
  // Sat 2026-06-20, lead 5: OTB = A 3 + B 2 = 5; STLY = OTB(Sat 2025-06-21, 2025-06-16) = E 2 +
  // G 1.
  const auto &c20 = pace.at(0, d("2026-06-20"));
  EXPECT_EQ(c20.dba, 5);
  EXPECT_EQ(c20.otb, 5);
  EXPECT_EQ(c20.stlyNight, d("2025-06-21"));
  EXPECT_FALSE(c20.paired);
  EXPECT_EQ(c20.stlyOtb, 3);
  EXPECT_EQ(c20.diffRooms, 2);
  EXPECT_DOUBLE_EQ(*c20.diffPct, 200.0 / 3);
  // 2026-06-19: A 3 against E 2 on 2025-06-20.
  const auto &c19 = pace.at(0, d("2026-06-19"));
  EXPECT_EQ(c19.otb, 3);
  EXPECT_EQ(c19.stlyOtb, 2);
  EXPECT_DOUBLE_EQ(*c19.diffPct, 50.0);
  // 2026-06-17: H 1 against nothing: the difference is 1 room, the percentage undefined.
  const auto &c17 = pace.at(0, d("2026-06-17"));
  EXPECT_EQ(c17.otb, 1);
  EXPECT_EQ(c17.stlyOtb, 0);
  EXPECT_EQ(c17.diffRooms, 1);
  EXPECT_FALSE(c17.diffPct.has_value());
  const auto &c16 = pace.at(0, d("2026-06-16"));
  EXPECT_EQ(c16.otb, 0);
  EXPECT_EQ(c16.diffRooms, 0);
  EXPECT_FALSE(c16.diffPct.has_value());
  EXPECT_THROW((void)pace.at(0, d("2026-06-21")), std::out_of_range);
}

TEST(Pace, BySegment) {
  auto pace = cb::Pace::build(handSet(), cb::Property{}, HolidayMap{}, opts(cb::SeriesBy::Segment));
  ASSERT_EQ(pace.series(), (std::vector<std::string>{"ALL", "CORP", "FLEX"}));
  const auto &corp = pace.at(1, d("2026-06-20")); // A 3 against E 2
  EXPECT_EQ(corp.otb, 3);
  EXPECT_EQ(corp.stlyOtb, 2);
  EXPECT_DOUBLE_EQ(*corp.diffPct, 50.0);
  const auto &flex = pace.at(2, d("2026-06-20")); // B 2 against G 1
  EXPECT_EQ(flex.otb, 2);
  EXPECT_EQ(flex.stlyOtb, 1);
  EXPECT_DOUBLE_EQ(*flex.diffPct, 100.0);
  EXPECT_EQ(pace.at(0, d("2026-06-20")).otb, 5);
}

TEST(Pace, CalendarDateAlignment) {
  cb::Property p;
  p.stly = cb::StlyAlignment::CalendarDate;
  auto pace = cb::Pace::build(handSet(), p, HolidayMap{}, opts());
  // Sat 2026-06-20 against Fri 2025-06-20 read on 2025-06-15: E 2.
  const auto &c = pace.at(0, d("2026-06-20"));
  EXPECT_EQ(c.stlyNight, d("2025-06-20"));
  EXPECT_EQ(c.stlyOtb, 2);
  EXPECT_EQ(c.diffRooms, 3);
  EXPECT_DOUBLE_EQ(*c.diffPct, 150.0);
}

TEST(Pace, MovingEventComparesWithItsOwnNights) {
  // "Harbour Jazz" ran Thu–Fri 2025-06-12…13 and runs Fri–Sat 2026-06-19…20.
  auto map = HolidayMap::fromEvents({{d("2025-06-12"), d("2025-06-13"), "Harbour Jazz"},
                                     {d("2026-06-19"), d("2026-06-20"), "Harbour Jazz"}});
  auto pace = cb::Pace::build(handSet(), cb::Property{}, map, opts());
  // 2026-06-20 (lead 5) against 2025-06-13 read on 2025-06-08: I 4.
  const auto &c20 = pace.at(0, d("2026-06-20"));
  EXPECT_TRUE(c20.paired);
  EXPECT_EQ(c20.stlyNight, d("2025-06-13"));
  EXPECT_EQ(c20.stlyOtb, 4);
  EXPECT_DOUBLE_EQ(*c20.diffPct, 25.0);
  // 2026-06-19 (lead 4) against 2025-06-12 read on 2025-06-08: J 2, booked that very day.
  const auto &c19 = pace.at(0, d("2026-06-19"));
  EXPECT_EQ(c19.stlyNight, d("2025-06-12"));
  EXPECT_EQ(c19.stlyOtb, 2);
  EXPECT_DOUBLE_EQ(*c19.diffPct, 50.0);
  // Nights outside the event keep the 364-day alignment.
  EXPECT_FALSE(pace.at(0, d("2026-06-18")).paired);
  EXPECT_EQ(pace.at(0, d("2026-06-18")).stlyNight, d("2025-06-19"));
  // An explicit pair overrides the event.
  map.addPair(d("2026-06-20"), d("2025-06-20"));
  auto paired = cb::Pace::build(handSet(), cb::Property{}, map, opts());
  EXPECT_EQ(paired.at(0, d("2026-06-20")).stlyNight, d("2025-06-20"));
  EXPECT_EQ(paired.at(0, d("2026-06-20")).stlyOtb, 2); // E, read on 2025-06-15
}

TEST(Pace, Refusals) {
  auto o = opts();
  o.asOf = d("2026-06-17"); // the newest activity is D, booked 2026-06-16
  o.firstNight = d("2026-06-17");
  EXPECT_THROW(cb::Pace::build(handSet(), cb::Property{}, HolidayMap{}, o), cb::AsOfError);
  o = opts();
  o.firstNight = d("2026-06-14"); // before the reading date
  EXPECT_THROW(cb::Pace::build(handSet(), cb::Property{}, HolidayMap{}, o), std::invalid_argument);
  o = opts();
  o.lastNight = d("2026-06-10");
  EXPECT_THROW(cb::Pace::build(handSet(), cb::Property{}, HolidayMap{}, o), std::invalid_argument);
}

class PaceSample : public ::testing::Test {
protected:
  static void SetUpTestSuite() { sample_ = new cb::SampleProperty(cb::simulateProperty()); }
  static void TearDownTestSuite() {
    delete sample_;
    sample_ = nullptr;
  }
  static cb::SampleProperty *sample_;
};
cb::SampleProperty *PaceSample::sample_ = nullptr;

TEST_F(PaceSample, MatchesTheDefinitionLevelCurve) {
  const auto &rs = sample_->reservations;
  const auto map = HolidayMap::fromEvents(sample_->events);
  cb::PaceOptions o;
  o.asOf = d("2026-03-01");
  o.firstNight = o.asOf;
  o.lastNight = o.asOf + 120; // takes in the trade fair of 2026-04-21…23
  o.by = cb::SeriesBy::Segment;
  auto pace = cb::Pace::build(rs, sample_->property, map, o);
  ASSERT_GT(pace.series().size(), 3u);
  int paired = 0, undefinedPct = 0;
  for (Date s = o.firstNight; s <= o.lastNight; ++s) {
    const int h = s - o.asOf;
    for (std::size_t i = 0; i < pace.series().size(); ++i) {
      const std::string seg = i == 0 ? "" : pace.series()[i];
      const auto &c = pace.at(i, s);
      const Date ref = map.referenceNight(sample_->property, s);
      ASSERT_EQ(c.stlyNight, ref);
      ASSERT_EQ(c.otb, cb::bookingCurve(rs, s, h, seg).rooms[static_cast<std::size_t>(h)])
          << s.toIso() << " " << pace.series()[i];
      ASSERT_EQ(c.stlyOtb, cb::bookingCurve(rs, ref, h, seg).rooms[static_cast<std::size_t>(h)])
          << s.toIso() << " " << pace.series()[i];
      ASSERT_EQ(c.diffRooms, c.otb - *c.stlyOtb);
      if (*c.stlyOtb == 0) {
        ++undefinedPct;
        ASSERT_FALSE(c.diffPct.has_value());
      } else {
        ASSERT_DOUBLE_EQ(*c.diffPct, 100.0 * (c.otb - *c.stlyOtb) / *c.stlyOtb);
      }
      paired += c.paired && i == 0;
    }
  }
  EXPECT_EQ(paired, 3); // the three fair nights
  EXPECT_EQ(pace.at(0, d("2026-04-22")).stlyNight, d("2025-03-26"));
  EXPECT_GT(undefinedPct, 0); // small segments have empty STLY nights
}

TEST_F(PaceSample, NothingDatedAfterTheReadingDateChangesIt) {
  const Date t = sample_->readingDate - 150;
  std::vector<Reservation> truncated;
  for (auto r : sample_->reservations) {
    if (r.bookedOn > t)
      continue;
    if (r.cancelledOn && *r.cancelledOn > t) {
      r.cancelledOn.reset();
      r.status = cb::ReservationStatus::Booked;
    }
    truncated.push_back(r);
  }
  ASSERT_LT(truncated.size(), sample_->reservations.size());
  const auto map = HolidayMap::fromEvents(sample_->events);
  for (cb::SeriesBy by : {cb::SeriesBy::Total, cb::SeriesBy::Channel, cb::SeriesBy::RoomType}) {
    cb::PaceOptions o;
    o.asOf = t;
    o.firstNight = t;
    o.lastNight = t + 90;
    o.by = by;
    auto full = cb::Pace::build(sample_->reservations, sample_->property, map, o);
    auto cut = cb::Pace::build(truncated, sample_->property, map, o);
    ASSERT_EQ(full.series(), cut.series());
    for (std::size_t i = 0; i < full.series().size(); ++i)
      for (Date s = o.firstNight; s <= o.lastNight; ++s)
        ASSERT_EQ(full.at(i, s), cut.at(i, s)) << s.toIso();
  }
}
