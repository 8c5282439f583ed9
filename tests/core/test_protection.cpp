// Segment protection against check-values.md §1 (Littlewood, normal and Poisson) and §2 (EMSR-a
// and EMSR-b, Fiig et al. 2010), and the rules of core/protection.h (rounding, booking limits on
// the remaining rooms, open/close, equal rates, zero demand, bad input).
#include "core/protection.h"

#include "core/demandmath.h"

#include <gtest/gtest.h>

#include <cmath>
#include <stdexcept>

using cb::ClassDemand;
using cb::ProtectionInput;
using cb::ProtectionMethod;

namespace {

void expectRel(double got, double want, double rel) {
  EXPECT_NEAR(got, want, rel * std::abs(want)) << "want " << want;
}

TEST(Protection, LittlewoodPoissonHotelExample) {
  // check-values.md §1a, Cachon & Terwiesch, Matching Supply with Demand, revenue-management
  // chapter, 118-room example (confirmed-in-source): r_L 159, r_H 225, high-fare demand Poisson
  // mean 27.3 → protection level Q* = 24, low-fare booking limit 118 − 24 = 94.
  const int q = cb::littlewoodPoisson(225, 159, 27.3);
  EXPECT_EQ(q, 24);
  EXPECT_EQ(118 - q, 94);
  // Expected revenue with Q* = 24, as the source computes it: low-fare demand fills its booking
  // limit, so r_L·(C − Q*) from low fares, and high fares sell min(D_hi, Q*) of the protected
  // rooms: r_L·(C − Q*) + r_H·E[min(D_hi, Q*)] = 159·94 + 225·23.203932 = 20,166.88 (§1a,
  // published $20,166, the slides truncate; tolerance ±1 as §1a says).
  const double revenue = 159.0 * (118 - q) + 225.0 * cb::poissonAgainstCapacity(27.3, q).sales;
  EXPECT_NEAR(revenue, 20166.88, 1.0);
  EXPECT_NEAR(revenue, 20166, 1.0); // the published figure
}

TEST(Protection, LittlewoodNormalExercises) {
  // check-values.md §1b (computed-with-library from published exercise statements), 1e-6 rel.
  expectRel(cb::littlewoodNormal(200, 120, 70, 29), 62.652934, 1e-6); // hotel exercise A
  expectRel(cb::littlewoodNormal(650, 225, 40, 6), 42.374352, 1e-6);  // hotel exercise B
  expectRel(cb::littlewoodNormal(675, 375, 80, 35), 75.110140, 1e-6); // airline exercise C
  // Exercise C follow-ups with protection level 85 (§1b, computed): lost high-fare passengers
  // E[(D-85)+], empty protected seats E[(85-D)+], expected high-fare sales.
  const cb::CapacityOutcome at85 = cb::normalAgainstCapacity(80, 35, 85);
  expectRel(at85.spill, 11.605217, 1e-6);
  expectRel(at85.empty, 16.605217, 1e-6);
  expectRel(at85.sales, 68.394783, 1e-6);
  // sigma 0: demand is certain, protect exactly the mean (header rule).
  EXPECT_EQ(cb::littlewoodNormal(200, 120, 70, 0), 70);
}

TEST(Protection, LittlewoodTwoClassesThroughProtectRoundsHalfUp) {
  // Exercise A (§1b): y1* = 62.652934 → 63 rooms, as the check-values table rounds it; the low
  // fare may then sell 150 − 63 = 87 of the hotel's 150 rooms. EMSR-b with two classes is
  // Littlewood's rule (check-values.md §1, §2: with one class above, pbar_1 = p_1).
  ProtectionInput in;
  in.capacity = 150;
  in.classes = {{"LO", 120, 200, 40}, {"HI", 200, 70, 29}}; // listed low first: ranked inside
  const cb::ProtectionResult r = cb::protect(in);
  ASSERT_EQ(r.lines.size(), 2u);
  EXPECT_EQ(r.remaining, 150);
  EXPECT_EQ(r.lines[0].demand.code, "HI");
  EXPECT_EQ(r.lines[0].rank, 1);
  expectRel(*r.lines[0].protectionLevel, 62.652934, 1e-6);
  EXPECT_EQ(r.lines[0].protectedRooms, 63);
  EXPECT_EQ(r.lines[0].bookingLimit, 150);
  EXPECT_EQ(r.lines[1].demand.code, "LO");
  EXPECT_FALSE(r.lines[1].protectionLevel.has_value());
  EXPECT_FALSE(r.lines[1].protectedRooms.has_value());
  EXPECT_EQ(r.lines[1].bookingLimit, 87);
  EXPECT_TRUE(r.lines[1].open);
}

TEST(Protection, RoundingIsHalfUp) {
  // Certain demand of 2.5 rooms above (sd 0, so y1 = 2.5 exactly): half up protects 3, the
  // class below may sell 10 − 3 = 7 (rule of core/protection.h, worked by hand).
  ProtectionInput in;
  in.capacity = 10;
  in.classes = {{"HI", 200, 2.5, 0}, {"LO", 100, 10, 0}};
  const cb::ProtectionResult r = cb::protect(in);
  EXPECT_EQ(*r.lines[0].protectionLevel, 2.5);
  EXPECT_EQ(r.lines[0].protectedRooms, 3);
  EXPECT_EQ(r.lines[1].bookingLimit, 7);
}

// check-values.md §2a: Fiig, Isler, Hopperstad & Belobaba (2010), Table 1 inputs, capacity 100.
std::vector<ClassDemand> fiigClasses() {
  return {{"1", 1200, 31.2, 11.2}, {"2", 1000, 10.9, 6.6}, {"3", 800, 14.8, 7.7},
          {"4", 600, 19.9, 8.9},   {"5", 400, 26.9, 10.4}, {"6", 200, 36.3, 12.0}};
}

TEST(Protection, EmsrbFiigExample) {
  // check-values.md §2a, EMSR-b protection levels (computed), tolerance 1e-5.
  const std::vector<double> want = {20.364878, 35.404703, 54.338987, 80.073517, 117.435845};
  const std::vector<double> y = cb::emsrbProtection(fiigClasses());
  ASSERT_EQ(y.size(), want.size());
  for (std::size_t j = 0; j < want.size(); ++j)
    EXPECT_NEAR(y[j], want[j], 1e-5) << "y" << j + 1;
}

TEST(Protection, EmsraFiigExample) {
  // check-values.md §2a, EMSR-a protection levels (computed), tolerance 1e-5.
  const std::vector<double> want = {20.364878, 31.721154, 50.034338, 79.462764, 129.116866};
  const std::vector<double> y = cb::emsraProtection(fiigClasses());
  ASSERT_EQ(y.size(), want.size());
  for (std::size_t j = 0; j < want.size(); ++j)
    EXPECT_NEAR(y[j], want[j], 1e-5) << "y" << j + 1;
}

TEST(Protection, EmsrbBookingLimitsAndOpenClose) {
  ProtectionInput in;
  in.capacity = 100;
  in.classes = fiigClasses();
  std::swap(in.classes[0], in.classes[5]); // any order: protect() ranks by rate
  cb::ProtectionResult r = cb::protect(in);
  ASSERT_EQ(r.lines.size(), 6u);
  // check-values.md §2a: EMSR-b booking limits, classes 1..6, rounded: 100, 80, 65, 46, 20, 0
  // (as printed by the public implementation that quotes Fiig et al. Table 1).
  const int want[] = {100, 80, 65, 46, 20, 0};
  for (std::size_t i = 0; i < 6; ++i) {
    EXPECT_EQ(r.lines[i].demand.code, std::to_string(i + 1));
    EXPECT_EQ(r.lines[i].rank, static_cast<int>(i) + 1);
    EXPECT_EQ(r.lines[i].bookingLimit, want[i]) << "class " << i + 1;
    EXPECT_EQ(r.lines[i].open, want[i] > 0);
  }
  // 30 rooms sold: the same protected rooms (20, 35, 54, 80, 117) against the 70 remaining
  // (header rule) → 70, 50, 35, 16, 0, 0; classes 5 and 6 closed. Worked by hand.
  in.sold = 30;
  r = cb::protect(in);
  EXPECT_EQ(r.remaining, 70);
  const int wantSold[] = {70, 50, 35, 16, 0, 0};
  for (std::size_t i = 0; i < 6; ++i) {
    EXPECT_EQ(r.lines[i].bookingLimit, wantSold[i]) << "class " << i + 1;
    EXPECT_EQ(r.lines[i].open, wantSold[i] > 0);
  }
  // Over-sold: nothing remains, everything closed.
  in.sold = 104;
  r = cb::protect(in);
  EXPECT_EQ(r.remaining, 0);
  for (const cb::ProtectionLine &l : r.lines)
    EXPECT_FALSE(l.open);
}

TEST(Protection, EmsraBookingLimits) {
  // EMSR-a levels of §2a rounded half up: 20, 32, 50, 79, 129 → limits 100, 80, 68, 50, 21, 0
  // (worked by hand from the §2a values and the header's rounding rule).
  ProtectionInput in;
  in.capacity = 100;
  in.method = ProtectionMethod::EmsrA;
  in.classes = fiigClasses();
  const cb::ProtectionResult r = cb::protect(in);
  const int want[] = {100, 80, 68, 50, 21, 0};
  for (std::size_t i = 0; i < 6; ++i)
    EXPECT_EQ(r.lines[i].bookingLimit, want[i]) << "class " << i + 1;
  EXPECT_NEAR(*r.lines[4].protectionLevel, 129.116866, 1e-5);
}

TEST(Protection, EqualRatesShareOneLimit) {
  // B and C share a rate: ranked in the order listed, merged for the levels (header rule), so
  // the result equals that of one class BC with the summed mean and the root-sum-square sd.
  ProtectionInput tied;
  tied.capacity = 60;
  tied.classes = {{"D", 100, 30, 9}, {"B", 150, 12, 3}, {"A", 200, 10, 4}, {"C", 150, 8, 4}};
  ProtectionInput merged = tied;
  merged.classes = {{"D", 100, 30, 9}, {"BC", 150, 20, 5}, {"A", 200, 10, 4}};
  const cb::ProtectionResult t = cb::protect(tied);
  const cb::ProtectionResult m = cb::protect(merged);
  ASSERT_EQ(t.lines.size(), 4u);
  EXPECT_EQ(t.lines[0].demand.code, "A");
  EXPECT_EQ(t.lines[1].demand.code, "B"); // listed before C
  EXPECT_EQ(t.lines[2].demand.code, "C");
  EXPECT_EQ(t.lines[3].demand.code, "D");
  EXPECT_EQ(t.lines[2].rank, 3);
  // A against BC; nothing between B and C, so B carries A's level; C carries A+BC against D.
  EXPECT_DOUBLE_EQ(*t.lines[0].protectionLevel, *m.lines[0].protectionLevel);
  EXPECT_DOUBLE_EQ(*t.lines[1].protectionLevel, *m.lines[0].protectionLevel);
  EXPECT_DOUBLE_EQ(*t.lines[2].protectionLevel, *m.lines[1].protectionLevel);
  EXPECT_EQ(t.lines[1].bookingLimit, t.lines[2].bookingLimit);
  EXPECT_EQ(t.lines[1].bookingLimit, m.lines[1].bookingLimit);
  EXPECT_EQ(t.lines[3].bookingLimit, m.lines[2].bookingLimit);
  // Every class at one rate: nothing protected, all may sell every remaining room.
  ProtectionInput flat;
  flat.capacity = 40;
  flat.sold = 5;
  flat.classes = {{"X", 120, 10, 3}, {"Y", 120, 20, 5}};
  const cb::ProtectionResult f = cb::protect(flat);
  EXPECT_EQ(f.lines[0].protectedRooms, 0);
  EXPECT_EQ(f.lines[0].bookingLimit, 35);
  EXPECT_EQ(f.lines[1].bookingLimit, 35);
}

TEST(Protection, ZeroDemandNeverNaN) {
  // A top class with mean 0 and sd 0 protects nothing (y = 0): no NaN, every limit = remaining.
  ProtectionInput in;
  in.capacity = 50;
  in.classes = {{"HI", 300, 0, 0}, {"LO", 100, 20, 5}};
  for (ProtectionMethod method : {ProtectionMethod::EmsrB, ProtectionMethod::EmsrA}) {
    in.method = method;
    const cb::ProtectionResult r = cb::protect(in);
    EXPECT_EQ(*r.lines[0].protectionLevel, 0);
    EXPECT_EQ(r.lines[1].bookingLimit, 50);
  }
  // Two top classes expecting nothing but with a spread (mean 0, sd > 0): the weighted average
  // rate is undefined, the plain average is used; the level stays finite.
  in.method = ProtectionMethod::EmsrB;
  in.classes = {{"A", 300, 0, 0}, {"B", 200, 0, 4}, {"C", 100, 20, 5}};
  const cb::ProtectionResult r = cb::protect(in);
  for (std::size_t i = 0; i + 1 < r.lines.size(); ++i)
    EXPECT_TRUE(std::isfinite(*r.lines[i].protectionLevel));
  // y2 = 0 + 4·Φ⁻¹(1 − 100/250) by the rule in protection.cpp; rounds to 1 room.
  EXPECT_NEAR(*r.lines[1].protectionLevel, 4 * cb::normalQuantile(0.6), 1e-12);
  EXPECT_EQ(r.lines[2].bookingLimit, 49);
  // A negative mean (forecast below the books) is no demand to come.
  in.classes = {{"HI", 300, -4, 0}, {"LO", 100, 20, 5}};
  EXPECT_EQ(*cb::protect(in).lines[0].protectionLevel, 0);
}

TEST(Protection, NestedLimitsNeverGrowDownTheRanking) {
  // Inputs where EMSR-b's y2 falls below y1: y1 = 50 + 20·Φ⁻¹(0.4) ≈ 44.93 but y2 = 50 +
  // √1300·Φ⁻¹(1 − 119/200) ≈ 41.25 (class 2 expects nothing). Class 3 then gets no more than
  // class 2 (header rule): both protected-room counts are 45.
  ProtectionInput in;
  in.capacity = 100;
  in.classes = {{"1", 200, 50, 20}, {"2", 120, 0, 30}, {"3", 119, 40, 10}};
  const cb::ProtectionResult r = cb::protect(in);
  EXPECT_LT(*r.lines[1].protectionLevel, *r.lines[0].protectionLevel);
  EXPECT_EQ(r.lines[0].protectedRooms, 45);
  EXPECT_EQ(r.lines[1].protectedRooms, 45);
  EXPECT_EQ(r.lines[1].bookingLimit, 55);
  EXPECT_EQ(r.lines[2].bookingLimit, 55);
}

TEST(Protection, BadInput) {
  ProtectionInput in;
  in.capacity = 100;
  in.classes = {{"HI", 200, 10, 3}, {"LO", 100, 20, 5}};
  ProtectionInput bad = in;
  bad.capacity = -1;
  EXPECT_THROW(cb::protect(bad), std::invalid_argument);
  bad = in;
  bad.sold = -1;
  EXPECT_THROW(cb::protect(bad), std::invalid_argument);
  bad = in;
  bad.classes.clear();
  EXPECT_THROW(cb::protect(bad), std::invalid_argument);
  bad = in;
  bad.classes[1].rate = 0;
  EXPECT_THROW(cb::protect(bad), std::invalid_argument);
  bad = in;
  bad.classes[0].sd = -1;
  EXPECT_THROW(cb::protect(bad), std::invalid_argument);
  bad = in;
  bad.classes[0].mean = std::nan("");
  EXPECT_THROW(cb::protect(bad), std::invalid_argument);
  // The EMSR functions want classes sorted by strictly falling rate.
  EXPECT_THROW(cb::emsrbProtection({{"LO", 100, 20, 5}, {"HI", 200, 10, 3}}),
               std::invalid_argument);
  EXPECT_THROW(cb::emsraProtection({{"A", 100, 20, 5}, {"B", 100, 10, 3}}), std::invalid_argument);
  EXPECT_THROW(cb::littlewoodNormal(100, 100, 10, 3), std::invalid_argument);
  EXPECT_THROW(cb::littlewoodNormal(100, 0, 10, 3), std::invalid_argument);
  EXPECT_THROW(cb::littlewoodNormal(200, 100, 10, -3), std::invalid_argument);
  EXPECT_THROW(cb::littlewoodPoisson(100, 150, 10), std::invalid_argument);
  EXPECT_TRUE(cb::emsrbProtection({{"ONLY", 100, 20, 5}}).empty()); // one class: nothing to protect
}

} // namespace
