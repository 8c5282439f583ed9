// Reference nights of the pickup methods: recent same-weekday nights and the seasonal window
// around the same night last year (brief section 5), checked against a calendar.
#include "core/referencenights.h"

#include <gtest/gtest.h>

using cb::Date;
using cb::MethodOptions;
using cb::ReferenceNights;

namespace {

Date d(const char *iso) { return *Date::parseIso(iso); }

std::vector<Date> dates(std::initializer_list<const char *> isos) {
  std::vector<Date> out;
  for (const char *i : isos)
    out.push_back(d(i));
  return out;
}

} // namespace

TEST(ReferenceNights, RecentSameWeekdayNewestFirst) {
  MethodOptions o;
  o.references = 3;
  ReferenceNights refs(o);
  // 2026-06-13 is a Saturday; the Saturdays on or before Monday 2026-06-08 are 06-06, 05-30,
  // 05-23 (calendar).
  EXPECT_EQ(refs.choose(d("2026-06-13"), d("2026-06-08"), d("2026-01-01"), d("2026-12-31")),
            dates({"2026-06-06", "2026-05-30", "2026-05-23"}));
  // The latest night itself counts when it has the weekday (r ≤ t).
  EXPECT_EQ(refs.choose(d("2026-06-13"), d("2026-06-06"), d("2026-01-01"), d("2026-12-31")),
            dates({"2026-06-06", "2026-05-30", "2026-05-23"}));
  // Only nights inside the cube: the first night cuts the list short.
  EXPECT_EQ(refs.choose(d("2026-06-13"), d("2026-06-08"), d("2026-05-24"), d("2026-12-31")),
            dates({"2026-06-06", "2026-05-30"}));
  EXPECT_TRUE(
      refs.choose(d("2026-06-13"), d("2026-06-08"), d("2026-06-07"), d("2026-12-31")).empty());
  // A latest night after the cube's last night is clamped to it.
  EXPECT_EQ(refs.choose(d("2026-06-13"), d("2026-06-20"), d("2026-01-01"), d("2026-06-12")),
            dates({"2026-06-06", "2026-05-30", "2026-05-23"}));
  // Default N = 8 (brief section 5).
  ReferenceNights defaults{MethodOptions{}};
  EXPECT_EQ(defaults.count(), 8);
  auto eight = defaults.choose(d("2026-06-13"), d("2026-06-08"), d("2025-01-01"), d("2026-12-31"));
  ASSERT_EQ(eight.size(), 8u);
  EXPECT_EQ(eight.back(), d("2026-04-18"));
  for (Date r : eight)
    EXPECT_EQ(r.isoWeekday(), 6u); // ISO 6 = Saturday
}

TEST(ReferenceNights, SeasonalWindowAroundLastYear) {
  MethodOptions o;
  o.seasonalReferences = true;
  o.seasonalWeeks = 2;
  ReferenceNights refs(o);
  // s = Saturday 2026-06-13; s − 364 = Saturday 2025-06-14; ± 2 weeks (calendar).
  EXPECT_EQ(refs.choose(d("2026-06-13"), d("2026-06-08"), d("2024-01-01"), d("2026-12-31")),
            dates({"2025-06-28", "2025-06-21", "2025-06-14", "2025-06-07", "2025-05-31"}));
  // Nights after the latest one or before the cube are left out.
  EXPECT_EQ(refs.choose(d("2026-06-13"), d("2025-06-21"), d("2025-06-01"), d("2026-12-31")),
            dates({"2025-06-21", "2025-06-14", "2025-06-07"}));
  EXPECT_TRUE(
      refs.choose(d("2026-06-13"), d("2026-06-08"), d("2025-07-01"), d("2026-12-31")).empty());
  o.seasonalWeeks = 0;
  EXPECT_EQ(
      ReferenceNights(o).choose(d("2026-06-13"), d("2026-06-08"), d("2024-01-01"), d("2026-12-31")),
      dates({"2025-06-14"}));
  EXPECT_NE(refs.describe().find("2 weeks"), std::string::npos);
}

TEST(ReferenceNights, RejectsInvalidOptions) {
  MethodOptions o;
  o.references = 0;
  EXPECT_THROW(ReferenceNights{o}, cb::MethodError);
  o = {};
  o.seasonalWeeks = 27;
  EXPECT_THROW(ReferenceNights{o}, cb::MethodError);
}
