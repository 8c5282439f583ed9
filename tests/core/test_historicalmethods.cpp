// The historical forecast methods (brief section 5) on hand-made curve cubes whose answers are
// derived in the comments, and the no-look-ahead property on the sample property.
#include "core/historicalmethods.h"

#include "core/curvecube.h"
#include "core/simulator.h"

#include "testsupport.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <string>
#include <vector>

using cb::CubeOptions;
using cb::CurveCube;
using cb::Date;
using cb::ForecastContext;
using cb::MethodOptions;
using cb::Reservation;
using cb::ReservationStatus;
using cb::SeriesBy;

namespace {

Date d(const char *iso) { return *Date::parseIso(iso); }

/// A one-night stay of `rooms` rooms booked `lead` days ahead: it makes Final(night) = rooms.
Reservation stay(Date night, int rooms, int lead = 5) {
  static int next = 0;
  Reservation r;
  r.id = "r" + std::to_string(++next);
  r.bookedOn = night - lead;
  r.arrival = night;
  r.departure = night + 1;
  r.rooms = rooms;
  r.rate = 100;
  r.segment = "LEIS";
  r.channel = "WEB";
  r.roomType = "STD";
  return r;
}

/// Nights from `first` on with the given finals, plus one booking made on the reading date for
/// a later night (so the data reaches the reading date and the cube has future nights).
std::vector<Reservation> nights(Date first, const std::vector<int> &finals, Date asOf) {
  std::vector<Reservation> rs;
  for (std::size_t i = 0; i < finals.size(); ++i)
    if (finals[i] > 0)
      rs.push_back(stay(first + static_cast<int>(i), finals[i]));
  rs.push_back(stay(asOf + 8, 1, 8));
  return rs;
}

std::optional<double> forecastOf(const std::string &method, const ForecastContext &ctx, Date s,
                                 const MethodOptions &options = {}) {
  auto m = cb::makeMethod(method, options);
  m->fit(ctx);
  return m->forecast(ctx, s);
}

const cb::Property &property() {
  static const cb::Property p = cb::simulateProperty().property;
  return p;
}

// Three weeks, 2026-03-02 (Monday) … 2026-03-22 (Sunday), Mon..Sun each week; every weekday rises
// by 2 a week: Mondays 10, 12, 14; Sundays 15, 17, 19.
const std::vector<int> threeWeeks = {10, 11, 12, 13, 20, 30, 15, 12, 13, 14, 15,
                                     22, 32, 17, 14, 15, 16, 17, 24, 34, 19};

struct Weekly : ::testing::Test {
  Date first = d("2026-03-02"), asOf = d("2026-03-22");
  CurveCube cube = CurveCube::build(nights(first, threeWeeks, asOf),
                                    CubeOptions{first, d("2026-04-30"), 30, SeriesBy::Total, asOf});
  ForecastContext ctx{cube, 0, asOf, property()};
};

} // namespace

TEST(HistoricalMethods, RegistryNamesDescriptionsAndFormulas) {
  for (const char *name : {"naive", "last-year", "mavg", "ses", "holt-winters", "ar"}) {
    auto m = cb::makeHistoricalMethod(name, {});
    ASSERT_TRUE(m) << name;
    EXPECT_EQ(m->name(), name);
    EXPECT_GT(m->description().size(), 40u) << name;
    EXPECT_NE(m->formula().find('='), std::string::npos) << name;
  }
  EXPECT_FALSE(cb::makeHistoricalMethod("pickup-add", {}));
  MethodOptions bad;
  bad.movingAverageK = 0;
  EXPECT_THROW(cb::makeHistoricalMethod("mavg", bad), cb::MethodError);
  bad = {};
  bad.maxArOrder = 0;
  EXPECT_THROW(cb::makeHistoricalMethod("ar", bad), cb::MethodError);
}

TEST_F(Weekly, HandMadeFinalsAreWhatTheMethodsSee) {
  ASSERT_EQ(ctx.finals().size(), 21u);
  EXPECT_EQ(ctx.finals()[14], 14); // Monday 2026-03-16
}

TEST_F(Weekly, Naive) {
  // Monday 03-23 (h = 1): the newest known Monday is 03-16, final 14.
  EXPECT_EQ(forecastOf("naive", ctx, d("2026-03-23")), 14);
  // Monday 04-06 (h = 15): still 03-16, the newest Monday ≤ t.
  EXPECT_EQ(forecastOf("naive", ctx, d("2026-04-06")), 14);
  // Sunday 03-29 (h = 7): Sunday 03-22, the reading date itself, final 19.
  EXPECT_EQ(forecastOf("naive", ctx, d("2026-03-29")), 19);
}

TEST_F(Weekly, LastYearIsUnknownWithoutAYearOfData) {
  EXPECT_FALSE(forecastOf("last-year", ctx, d("2026-03-23")));
}

TEST(HistoricalMethods, LastYearIsTheNight364DaysBefore) {
  // One stay of 9 rooms on Tuesday 2025-03-24; reading date Sunday 2026-03-22.
  const Date asOf = d("2026-03-22");
  auto rs = nights(d("2025-03-24"), {9}, asOf);
  CurveCube cube = CurveCube::build(
      rs, CubeOptions{d("2025-03-24"), d("2026-04-30"), 30, SeriesBy::Total, asOf});
  ForecastContext ctx{cube, 0, asOf, property()};
  EXPECT_EQ(forecastOf("last-year", ctx, d("2026-03-23")), 9); // 2026-03-23 − 364 = 2025-03-24
  EXPECT_EQ(forecastOf("last-year", ctx, d("2026-03-24")), 0); // 2025-03-25: stayed, no rooms
  EXPECT_FALSE(forecastOf("last-year", ctx, d("2027-03-23"))); // 2026-03-23: after the reading date
}

TEST_F(Weekly, MovingAverage) {
  // k = 4 by default, but only three Mondays are known: (14 + 12 + 10) / 3 = 12.
  EXPECT_DOUBLE_EQ(*forecastOf("mavg", ctx, d("2026-03-23")), 12);
  // Sundays: (19 + 17 + 15) / 3 = 17.
  EXPECT_DOUBLE_EQ(*forecastOf("mavg", ctx, d("2026-03-29")), 17);
  MethodOptions two;
  two.movingAverageK = 2; // the two newest Mondays: (14 + 12) / 2 = 13
  EXPECT_DOUBLE_EQ(*forecastOf("mavg", ctx, d("2026-04-06"), two), 13);
}

TEST_F(Weekly, SesFollowsASteadyRiseWithFullWeight) {
  // Monday series 10, 12, 14 with l0 = 10: errors 0, 2, 4 − 2a, so SSE = 4 + (4 − 2a)², least
  // at a = 1 (the bound): the level is the newest Monday, 14. Same for Sundays: 19.
  EXPECT_NEAR(*forecastOf("ses", ctx, d("2026-03-23")), 14, 1e-6);
  EXPECT_NEAR(*forecastOf("ses", ctx, d("2026-04-06")), 14, 1e-6);
  EXPECT_NEAR(*forecastOf("ses", ctx, d("2026-03-29")), 19, 1e-6);
}

TEST_F(Weekly, HoltWintersAndArNeedFourWeeks) {
  EXPECT_FALSE(forecastOf("holt-winters", ctx, d("2026-03-23")));
  EXPECT_FALSE(forecastOf("ar", ctx, d("2026-03-23")));
}

TEST(HistoricalMethods, ExactWeeklyPatternIsForecastExactly) {
  // Five identical weeks, Mon..Sun 10, 11, 12, 13, 20, 30, 15, 2026-03-02 … 04-05.
  // Holt–Winters: the seasonal start gives l0 = 111/7, b0 = 0, s = pattern − l0, so every
  // one-step error is 0 whatever the weights, and F(t + h) = l0 + s of the weekday.
  // AR: finals less weekday means are all 0, so c = φ = 0 and F = the weekday mean.
  // SES per weekday: constant series, level = that constant.
  const std::vector<int> week = {10, 11, 12, 13, 20, 30, 15};
  std::vector<int> finals;
  for (int w = 0; w < 5; ++w)
    finals.insert(finals.end(), week.begin(), week.end());
  const Date first = d("2026-03-02"), asOf = d("2026-04-05");
  CurveCube cube = CurveCube::build(nights(first, finals, asOf),
                                    CubeOptions{first, d("2026-05-31"), 30, SeriesBy::Total, asOf});
  ForecastContext ctx{cube, 0, asOf, property()};
  for (const char *method : {"holt-winters", "ar", "ses", "naive", "mavg"}) {
    EXPECT_NEAR(*forecastOf(method, ctx, d("2026-04-06")), 10, 1e-6) << method; // Monday, h = 1
    EXPECT_NEAR(*forecastOf(method, ctx, d("2026-04-11")), 30, 1e-6) << method; // Saturday
    EXPECT_NEAR(*forecastOf(method, ctx, d("2026-04-26")), 15, 1e-6) << method; // Sunday, h = 21
  }
}

TEST(HistoricalMethods, ForecastsAreNeverNegative) {
  // Finals falling by 2 a night, 100 … 32 over five weeks: Holt–Winters' trend (≈ −2 a night)
  // and AR's recursion carry the fall on; 100 nights later it would be far below 0.
  std::vector<int> finals;
  for (int i = 0; i < 35; ++i)
    finals.push_back(100 - 2 * i);
  const Date first = d("2026-03-02"), asOf = d("2026-04-05");
  CurveCube cube = CurveCube::build(nights(first, finals, asOf),
                                    CubeOptions{first, d("2026-08-31"), 30, SeriesBy::Total, asOf});
  ForecastContext ctx{cube, 0, asOf, property()};
  auto hw = forecastOf("holt-winters", ctx, asOf + 100);
  ASSERT_TRUE(hw);
  EXPECT_EQ(*hw, 0);
  EXPECT_GT(*forecastOf("holt-winters", ctx, asOf + 1), 20); // 30 next if the fall goes on
  for (const char *method : {"naive", "last-year", "mavg", "ses", "holt-winters", "ar"}) {
    for (int h : {1, 7, 50, 100, 140}) {
      if (auto f = forecastOf(method, ctx, asOf + h)) {
        EXPECT_GE(*f, 0) << method << " h=" << h;
      }
    }
  }
}

// ---- No look-ahead: the sample property, cut at reading date t. ----

namespace {

const cb::SampleProperty &sample() {
  static const cb::SampleProperty s = cb::simulateProperty();
  return s;
}

} // namespace

TEST(HistoricalMethods, NoLookAhead) {
  const auto &all = sample().reservations;
  Date lo = all.front().arrival, hi = all.front().arrival;
  for (const auto &r : all) {
    lo = std::min(lo, r.arrival);
    hi = std::max(hi, r.departure - 1);
  }
  for (const char *iso : {"2025-06-17", "2024-12-10"}) {
    const Date t = d(iso);
    const auto cut = cbtest::cutAt(all, t);
    ASSERT_LT(cut.size(), all.size());
    for (SeriesBy by : {SeriesBy::Total, SeriesBy::Segment}) {
      // Same night range for both; finals need no leads, so maxDba is small.
      CurveCube fromAll = CurveCube::build(all, CubeOptions{lo, hi, 7, by, std::nullopt});
      CurveCube fromCut = CurveCube::build(cut, CubeOptions{lo, hi, 7, by, t});
      ASSERT_GT(fromAll.asOf(), t);
      int compared = 0;
      for (std::size_t i = 0; i < fromCut.series().size(); ++i) {
        const auto j = fromAll.seriesIndex(fromCut.series()[i]);
        ASSERT_TRUE(j) << fromCut.series()[i];
        ForecastContext a(fromAll, *j, t, sample().property);
        ForecastContext b(fromCut, i, t, sample().property);
        for (const auto &name : {"naive", "last-year", "mavg", "ses", "holt-winters", "ar"}) {
          auto ma = cb::makeMethod(name), mb = cb::makeMethod(name);
          ma->fit(a);
          mb->fit(b);
          for (int h : {1, 3, 7, 14, 30, 60, 90, 200}) {
            const auto fa = ma->forecast(a, t + h), fb = mb->forecast(b, t + h);
            ASSERT_EQ(fa.has_value(), fb.has_value()) << name << " " << iso << " h=" << h;
            if (fa) {
              EXPECT_EQ(*fa, *fb) << name << " " << iso << " h=" << h << " " << fromCut.series()[i];
              EXPECT_GE(*fa, 0);
              ++compared;
            }
          }
        }
      }
      // Most forecasts exist (so the comparison is not vacuous): every method at every lead but
      // last-year beyond its year, 6 × 8 per series less a few.
      std::printf("[ compared ] %s by %s: %d forecasts over %zu series\n", iso,
                  std::string(cb::seriesByName(by)).c_str(), compared, fromCut.series().size());
      EXPECT_GT(compared, static_cast<int>(fromCut.series().size()) * 6 * 7) << iso;
    }
  }
}
