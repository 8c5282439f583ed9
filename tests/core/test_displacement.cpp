// Displacement check of a group offer (core/displacement.h) on a hand-worked example built on
// the spill / sales table of check-values.md §3, and the measured transient rate and share of
// stays that go on to the next night.
#include "testsupport.h"

#include "core/displacement.h"

namespace {

using cb::Date;
Date d(const char *iso) { return *Date::parseIso(iso); }

// Offer: 20 rooms on 2026-05-11 and 05-12 at rate 90, other revenue 15, cost 10 per room-night
// → group value 20 × (90 + 15 − 10) = 1900 a night, 3800 in all. Transient rate 150.
// 05-11: capacity 130, groups 10 → L = 120, with the offer L' = 100; D ~ N(100, 20).
//   check-values.md §3 (mu 100, sigma 20): E[min(D,120)] = 98.333691, E[min(D,100)] = 92.021154
//   → displaced 6.312537 rooms, × 150 = 946.88055; net 1900 − 946.88055 = 953.11945.
// 05-12: capacity 120, groups 20 → L = 100, L' = 80; E[min(D,80)] = 78.333691 (§3)
//   → displaced 92.021154 − 78.333691 = 13.687463, × 150 = 2053.11945; net −153.11945.
// Shoulder 05-10: capacity 120, groups 20 → L = 100, D ~ N(100, 20) → P(D ≥ L) = 0.5; with a
//   continuation share of 0.4: 6.312537 × 0.4 × (1 − 0.5) = 1.2625074 rooms, × 150 = 189.37611.
// Shoulder 05-13: L = 120, D = 130 for certain (sd 0) → the night sells out anyway: 0 displaced.
// Total: displaced value 946.88055 + 2053.11945 + 189.37611 = 3189.37611; net 3800 − that =
// 610.62389 > 0. Break-even group rate: (3189.37611 − 40 × (15 − 10)) / 40 = 74.73440275.
TEST(Displacement, HandWorkedOfferOnTheSpillTable) {
  const std::vector<cb::OfferNight> offer{{d("2026-05-11"), 20, 90, 15, 10},
                                          {d("2026-05-12"), 20, 90, 15, 10}};
  const std::vector<cb::DisplacementInput> in{{d("2026-05-10"), 120, 20, 100, 20, 150, 0},
                                              {d("2026-05-11"), 130, 10, 100, 20, 150, 0},
                                              {d("2026-05-12"), 120, 20, 100, 20, 150, 85},
                                              {d("2026-05-13"), 120, 0, 130, 0, 150, 0}};
  const cb::Displacement r = cb::evaluateDisplacement(offer, in, 0.4);
  ASSERT_EQ(r.nights.size(), 4U);
  EXPECT_TRUE(r.nights[0].shoulder);
  EXPECT_TRUE(r.nights[3].shoulder);
  EXPECT_NEAR(r.nights[1].displacedRooms, 6.312537, 1e-6);  // check-values.md §3
  EXPECT_NEAR(r.nights[2].displacedRooms, 13.687463, 1e-6); // check-values.md §3
  // The table's rooms are rounded to 6 decimals; × 150 a value may be 1.5e-4 off.
  EXPECT_NEAR(r.nights[1].net, 953.11945, 2e-4);
  EXPECT_NEAR(r.nights[2].net, -153.11945, 2e-4);
  EXPECT_NEAR(r.nights[0].displacedRooms, 1.2625074, 1e-6);
  EXPECT_NEAR(r.nights[0].net, -189.37611, 2e-4);
  EXPECT_DOUBLE_EQ(r.nights[3].displacedRooms, 0.0);
  EXPECT_DOUBLE_EQ(r.groupValue, 3800);
  EXPECT_NEAR(r.displacedValue, 3189.37611, 5e-4);
  EXPECT_NEAR(r.net, 610.62389, 5e-4);
  EXPECT_TRUE(r.worthIt);
  EXPECT_NEAR(*r.breakEvenRate, 74.73440275, 5e-4 / 40);
  // 85 transient rooms on the books of 05-12 but only 80 left with the offer: said so.
  ASSERT_EQ(r.nights[2].notes.size(), 1U);
  EXPECT_NE(r.nights[2].notes[0].find("overbooking"), std::string::npos);
  // An offer night without a forecast cannot be judged.
  EXPECT_THROW(cb::evaluateDisplacement({{d("2026-06-01"), 5, 90, 0, 0}}, in, 0.4),
               std::invalid_argument);
}

// Transient rows (no block id), read at 2026-03-31:
//   T1 2 rooms 03-01 → 03-04 (3 nights) at 100; T2 1 room 03-10 → 03-11 at 160;
//   T3 1 room 03-20 → 03-22 at 80, cancelled 03-05 (never stays); G1 a block row (left out).
// Continuation share: (2 × 2 + 1 × 0) / (2 × 3 + 1 × 1) = 4 / 7.
// ADR of the finals: (6 room-nights × 100 + 1 × 160) / 7 = 760 / 7.
TEST(Displacement, TransientRateAndContinuationShare) {
  using cbtest::makeReservation;
  auto t1 = makeReservation("T1", "2026-02-01", "2026-03-01", "2026-03-04", 2, "TRN");
  t1.rate = 100;
  auto t2 = makeReservation("T2", "2026-02-01", "2026-03-10", "2026-03-11", 1, "TRN");
  t2.rate = 160;
  auto t3 = makeReservation("T3", "2026-02-01", "2026-03-20", "2026-03-22", 1, "TRN", "2026-03-05");
  t3.rate = 80;
  auto g1 = makeReservation("G1", "2026-02-01", "2026-03-01", "2026-03-05", 10, "GRP");
  g1.blockId = "B";
  g1.rate = 50;
  const std::vector<cb::Reservation> rows{t1, t2, t3, g1};
  EXPECT_NEAR(cb::continuationShare(rows, d("2026-03-31")), 4.0 / 7.0, 1e-12);
  EXPECT_NEAR(cb::transientAdr(rows, d("2026-03-31")), 760.0 / 7.0, 1e-12);
}

} // namespace
