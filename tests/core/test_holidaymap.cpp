// The holiday map's rule (core/holidaymap.h) on hand-made events and on the sample property's
// moving trade fair.
#include "core/holidaymap.h"

#include "core/simulator.h"

#include <gtest/gtest.h>

using cb::Date;
using cb::EventNote;
using cb::HolidayMap;

namespace {

Date d(const char *iso) { return *Date::parseIso(iso); }

EventNote ev(const char *from, const char *to, const char *label) {
  return {d(from), d(to), label};
}

} // namespace

TEST(HolidayMap, MovingFourNightFairComparesWithItsOwnDates) {
  // 2025: Wed 12 – Sat 15 March; 2026: Wed 18 – Sat 21 March (six days later than 364 days back).
  auto map = HolidayMap::fromEvents(
      {ev("2025-03-12", "2025-03-15", "Boat Fair"), ev("2026-03-18", "2026-03-21", "Boat Fair")});
  EXPECT_EQ(map.lastYearNight(d("2026-03-18")), d("2025-03-12"));
  EXPECT_EQ(map.lastYearNight(d("2026-03-19")), d("2025-03-13"));
  EXPECT_EQ(map.lastYearNight(d("2026-03-20")), d("2025-03-14"));
  EXPECT_EQ(map.lastYearNight(d("2026-03-21")), d("2025-03-15"));
  EXPECT_EQ(map.lastYearNight(d("2026-03-17")), std::nullopt);
  EXPECT_EQ(map.lastYearNight(d("2026-03-22")), std::nullopt);
  // Last year's fair has no 2024 fair to compare with.
  EXPECT_EQ(map.lastYearNight(d("2025-03-12")), std::nullopt);
  EXPECT_EQ(map.pairs().size(), 4u);

  cb::Property p; // 364-day alignment by default
  EXPECT_EQ(map.referenceNight(p, d("2026-03-18")), d("2025-03-12"));
  EXPECT_EQ(map.referenceNight(p, d("2026-03-22")), d("2025-03-23")); // 364 days back
  p.stly = cb::StlyAlignment::CalendarDate;
  EXPECT_EQ(map.referenceNight(p, d("2026-03-22")), d("2025-03-22"));
  EXPECT_EQ(map.referenceNight(p, d("2026-03-20")), d("2025-03-14"));
}

TEST(HolidayMap, LongerEventClampsToLastYearsLength) {
  auto map = HolidayMap::fromEvents({ev("2026-05-04", "2026-05-08", "  market WEEK "),
                                     ev("2025-05-10", "2025-05-12", "Market Week")});
  // Labels match ignoring case and surrounding spaces; last year had 3 nights, this year 5.
  EXPECT_EQ(map.lastYearNight(d("2026-05-04")), d("2025-05-10"));
  EXPECT_EQ(map.lastYearNight(d("2026-05-06")), d("2025-05-12"));
  EXPECT_EQ(map.lastYearNight(d("2026-05-07")), d("2025-05-12"));
  EXPECT_EQ(map.lastYearNight(d("2026-05-08")), d("2025-05-12"));
}

TEST(HolidayMap, OnlyTheSameLabelInThePreviousYear) {
  auto map = HolidayMap::fromEvents({ev("2024-06-01", "2024-06-02", "Fair"),
                                     ev("2026-06-03", "2026-06-04", "Fair"), // no 2025 fair
                                     ev("2025-06-10", "2025-06-10", "Concert"),
                                     ev("2026-06-12", "2026-06-12", "Opera")});
  EXPECT_TRUE(map.empty());
  EXPECT_EQ(map.lastYearNight(d("2026-06-03")), std::nullopt);
  EXPECT_EQ(map.lastYearNight(d("2026-06-12")), std::nullopt);
}

TEST(HolidayMap, SeveralMatchesTakeTheNearestTo364DaysBack) {
  // A monthly market: 2026-07-04 aims at 2025-07-05; the July market wins over June and August.
  auto map = HolidayMap::fromEvents(
      {ev("2025-06-07", "2025-06-07", "Market"), ev("2025-07-06", "2025-07-06", "Market"),
       ev("2025-08-02", "2025-08-02", "Market"), ev("2026-07-04", "2026-07-04", "Market")});
  EXPECT_EQ(map.lastYearNight(d("2026-07-04")), d("2025-07-06"));
}

TEST(HolidayMap, FirstListedEventWinsAndExplicitPairsOverride) {
  auto map = HolidayMap::fromEvents(
      {ev("2025-10-01", "2025-10-03", "Expo"), ev("2025-10-20", "2025-10-20", "Gala"),
       ev("2026-10-05", "2026-10-07", "Expo"), ev("2026-10-07", "2026-10-07", "Gala")});
  EXPECT_EQ(map.lastYearNight(d("2026-10-07")), d("2025-10-03")); // Expo is listed first
  map.addPair(d("2026-10-07"), d("2025-10-20"));
  map.addPair(d("2026-12-24"), d("2025-12-24"));
  EXPECT_EQ(map.lastYearNight(d("2026-10-07")), d("2025-10-20"));
  EXPECT_EQ(map.lastYearNight(d("2026-12-24")), d("2025-12-24"));
  EXPECT_EQ(map.pairs().at(d("2026-10-07")), d("2025-10-20"));
  EXPECT_EQ(map.pairs().size(), 4u);
  EXPECT_THROW(map.addPair(d("2026-01-01"), d("2026-01-01")), std::invalid_argument);
  EXPECT_THROW(map.addPair(d("2026-01-01"), d("2026-02-01")), std::invalid_argument);
}

TEST(HolidayMap, SamplePropertysMovingTradeFair) {
  auto sample = cb::simulateProperty();
  auto map = HolidayMap::fromEvents(sample.events);
  // sample_property/events.csv: the Quillon Maritime Trade Fair ran 2025-03-25…27 and runs
  // 2026-04-21…23, 392 days later; each night compares with its own fair night.
  EXPECT_EQ(map.lastYearNight(d("2026-04-21")), d("2025-03-25"));
  EXPECT_EQ(map.lastYearNight(d("2026-04-22")), d("2025-03-26"));
  EXPECT_EQ(map.lastYearNight(d("2026-04-23")), d("2025-03-27"));
  // New Year's Eve 2026-12-31…2027-01-01 starts in 2026, so it matches 2025-12-31…2026-01-01.
  EXPECT_EQ(map.lastYearNight(d("2027-01-01")), d("2026-01-01"));
  // A night outside any event keeps the 364-day alignment.
  EXPECT_EQ(map.referenceNight(sample.property, d("2026-05-01")), d("2025-05-02"));
}
