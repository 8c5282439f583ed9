#include "core/date.h"

#include <gtest/gtest.h>

using cb::Date;

TEST(Date, IsoRoundTripAndArithmetic) {
  auto d = Date::parseIso("2016-02-29");
  ASSERT_TRUE(d);
  EXPECT_EQ(d->toIso(), "2016-02-29");
  EXPECT_EQ((*d + 1).toIso(), "2016-03-01");
  EXPECT_EQ(Date::fromYmd(2026, 12, 1) - Date::fromYmd(2026, 11, 1), 30);
  EXPECT_EQ(Date::fromYmd(1970, 1, 1).days(), 0);
}

TEST(Date, RejectsImpossibleOrMalformedDates) {
  EXPECT_FALSE(Date::parseIso("2015-02-29")); // not a leap year
  EXPECT_FALSE(Date::parseIso("2015-13-01"));
  EXPECT_FALSE(Date::parseIso("2015-1-01"));
  EXPECT_FALSE(Date::parseIso("01/07/2015"));
  EXPECT_FALSE(Date::parseIso("2015-07-01x"));
  EXPECT_FALSE(Date::parseIso(""));
}

TEST(Date, IsoWeekday) {
  // 2015-07-01 was a Wednesday and 2026-12-01 is a Tuesday (calendar facts).
  EXPECT_EQ(Date::fromYmd(2015, 7, 1).isoWeekday(), 3u);
  EXPECT_EQ(Date::fromYmd(2026, 12, 1).isoWeekday(), 2u);
  // 364 days later keeps the weekday: the basis of STLY alignment.
  EXPECT_EQ((Date::fromYmd(2026, 12, 1) - 364).isoWeekday(), 2u);
}

TEST(Date, PatternsAndMonthNames) {
  EXPECT_EQ(Date::parse("01/07/2015", "%d/%m/%Y")->toIso(), "2015-07-01");
  EXPECT_EQ(Date::parse("2015 July 1", "%Y %B %d")->toIso(), "2015-07-01");
  EXPECT_EQ(cb::monthFromEnglishName("August"), 8u);
  EXPECT_EQ(cb::monthFromEnglishName("dec"), 12u);
  EXPECT_FALSE(cb::monthFromEnglishName("Julember"));
}
