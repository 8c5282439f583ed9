// Overbooking against check-values.md §7 (critical fractile with normal, Poisson and binomial
// no-shows) and the measurement of no-shows and late cancellations (core/overbooking.h) on a
// hand-made reservation list whose answers are worked out in the comments.
#include "core/overbooking.h"

#include "core/demandmath.h"

#include "testsupport.h"

#include <gtest/gtest.h>

#include <cmath>
#include <stdexcept>

using cb::Date;
using cb::OverbookingCosts;
using cb::Reservation;
using cb::ReservationStatus;

namespace {

Date d(const char *iso) { return *Date::parseIso(iso); }

TEST(Overbooking, NormalNoShows) {
  // check-values.md §7a (confirmed-in-source, secondary copies; textbook example usually
  // attributed to Jacobs & Chase): no-shows N(5, 3), Cu = room rate 80, Co = walk cost 200.
  const OverbookingCosts costs{80, 200};
  EXPECT_NEAR(cb::criticalRatio(costs), 0.285714, 1e-6);        // computed column
  EXPECT_NEAR(cb::overbookNormal(5, 3, costs), 3.302, 1e-3);    // published 5 + 3(−0.566)
  EXPECT_NEAR(cb::overbookNormal(5, 3, costs), 3.302154, 1e-6); // computed column
  EXPECT_EQ(cb::overbookNormal(5, 0, costs), 5);                // sigma 0: exactly mu
  EXPECT_THROW(cb::overbookNormal(5, -1, costs), std::invalid_argument);
}

TEST(Overbooking, PoissonNoShows) {
  // check-values.md §7b, Cachon & Terwiesch 118-room hotel example (confirmed-in-source):
  // no-shows Poisson mean 8.5, Cu = r_L = 159, Co = 350 → CR 0.312377, Y* = 7 (allow 118 + 7
  // reservations); F(6) = 0.256178 (published 25.62 %) < CR ≤ F(7) = 0.385597.
  const OverbookingCosts costs{159, 350};
  const double cr = cb::criticalRatio(costs);
  EXPECT_NEAR(cr, 0.312377, 1e-6);
  EXPECT_NEAR(cr, 0.3124, 1e-4); // published
  EXPECT_EQ(cb::overbookPoisson(8.5, costs), 7);
  EXPECT_NEAR(cb::poissonCdf(6, 8.5), 0.256178, 5e-7);
  EXPECT_NEAR(cb::poissonCdf(7, 8.5), 0.385597, 5e-7);
  EXPECT_LT(cb::poissonCdf(6, 8.5), cr);
  EXPECT_GE(cb::poissonCdf(7, 8.5), cr);
}

TEST(Overbooking, BinomialServiceLevel) {
  // check-values.md §7c (statements confirmed; answers computed, exact binomial): 300 rooms,
  // no-show prob 0.15, largest n with P(shows ≤ 300) ≥ 0.95 is 341 (P = 0.950271; 342 gives
  // 0.934238); 200 rooms, 215 reservations, show prob 0.9: P(shows ≤ 200) = 0.950358.
  EXPECT_EQ(cb::maxReservationsForServiceLevel(300, 0.85, 0.95), 341);
  EXPECT_NEAR(cb::binomialCdf(300, 341, 0.85), 0.950271, 5e-7);
  EXPECT_NEAR(cb::binomialCdf(300, 342, 0.85), 0.934238, 5e-7);
  EXPECT_NEAR(cb::binomialCdf(200, 215, 0.9), 0.950358, 5e-7);
  // Everyone shows: never more reservations than rooms (by hand).
  EXPECT_EQ(cb::maxReservationsForServiceLevel(300, 1.0, 0.95), 300);
  EXPECT_THROW(cb::maxReservationsForServiceLevel(300, 0.0, 0.95), std::invalid_argument);
  EXPECT_THROW(cb::maxReservationsForServiceLevel(300, 0.85, 1.0), std::invalid_argument);
}

TEST(Overbooking, BinomialCriticalFractile) {
  // By hand: 1 room, no-show prob 1/2, CR = 80/(80 + 20) = 0.8. P(no-shows ≤ Y) with 1 + Y
  // reservations: Y = 0 → 1/2, Y = 1 → 3/4, Y = 2 → 7/8 ≥ 0.8, so Y = 2.
  EXPECT_EQ(cb::overbookBinomial(1, 0.5, {80, 20}), 2);
  EXPECT_EQ(cb::overbookBinomial(118, 0.0, {159, 350}), 0); // nobody fails to show
  // The §7c hotel (300 rooms, no-show prob 0.15) under the §7b costs: the answer meets the
  // definition and one fewer does not (definition in core/overbooking.h).
  const OverbookingCosts costs{159, 350};
  const double cr = cb::criticalRatio(costs);
  const int y = cb::overbookBinomial(300, 0.15, costs);
  EXPECT_GE(cb::binomialCdf(y, 300 + y, 0.15), cr);
  EXPECT_LT(cb::binomialCdf(y - 1, 300 + y - 1, 0.15), cr);
  EXPECT_THROW(cb::overbookBinomial(300, 1.0, costs), std::invalid_argument);
  EXPECT_THROW(cb::overbookBinomial(-1, 0.1, costs), std::invalid_argument);
}

TEST(Overbooking, CriticalRatioNeedsBothCosts) {
  EXPECT_THROW(cb::criticalRatio({0, 350}), std::invalid_argument);
  EXPECT_THROW(cb::criticalRatio({159, 0}), std::invalid_argument);
  EXPECT_THROW(cb::overbookPoisson(8.5, {159, -1}), std::invalid_argument);
}

Reservation stay(const char *id, const char *booked, const char *arr, const char *dep, int rooms,
                 ReservationStatus status, double rate = 100) {
  Reservation r = cbtest::makeReservation(id, booked, arr, dep, rooms, "TRN");
  r.status = status;
  r.rate = rate;
  return r;
}

// Target night Tue 2026-03-24, reading date Fri 2026-03-20, late = cancelled 2 days or fewer
// before arrival. Similar nights: Tue 03-17, 03-10, 03-03, 02-24 (most recent first).
std::vector<Reservation> handSet() {
  using S = ReservationStatus;
  return {
      // Tue 03-17 (lead 0: base read at t = 03-14, late from 03-15).
      stay("R1", "2026-03-01", "2026-03-17", "2026-03-18", 2, S::CheckedOut, 100), // stay
      stay("R2", "2026-03-02", "2026-03-16", "2026-03-19", 1, S::NoShow, 90),      // no-show
      cbtest::makeReservation("R3", "2026-03-05", "2026-03-17", "2026-03-18", 3, "TRN",
                              "2026-03-16"), // late cancellation
      cbtest::makeReservation("R4", "2026-03-05", "2026-03-17", "2026-03-18", 1, "TRN",
                              "2026-03-10"), // early cancellation: never in the base
      stay("R5", "2026-03-16", "2026-03-17", "2026-03-18", 1, S::NoShow),          // booked after t
      stay("R6", "2026-03-16", "2026-03-17", "2026-03-18", 1, S::CheckedOut, 160), // after t
      stay("R7", "2026-03-01", "2026-03-17", "2026-03-17", 1, S::NoShow),          // day use
      cbtest::makeReservation("R8", "2026-03-01", "2026-03-17", "2026-03-18", 1, "TRN",
                              "2026-03-18"), // cancelled after the night: late
      stay("R10", "2026-03-10", "2026-03-17", "2026-03-18", 2, S::NoShow), // in at lead 0 only
      // Tue 03-10 (t = 03-07, late from 03-08).
      stay("S1", "2026-02-20", "2026-03-10", "2026-03-12", 4, S::CheckedOut, 120),
      cbtest::makeReservation("S2", "2026-02-25", "2026-03-10", "2026-03-11", 2, "TRN",
                              "2026-03-08"), // late: exactly 2 days before
      cbtest::makeReservation("S3", "2026-02-25", "2026-03-10", "2026-03-11", 2, "TRN",
                              "2026-03-07"), // off the books at t
      // Tue 03-03: nothing, so the night is skipped.
      // Tue 02-24: 5 rooms no-show, only inside a 4-week window.
      stay("T1", "2026-02-01", "2026-02-24", "2026-02-25", 5, S::NoShow),
      // The target night itself (after the reading date): never measured.
      stay("U1", "2026-03-01", "2026-03-24", "2026-03-25", 9, S::NoShow),
  };
}

TEST(Overbooking, MeasureNoShowsByHand) {
  cb::NoShowOptions o;
  o.weeks = 3; // 03-17, 03-10, 03-03
  const cb::NoShowMeasure m = cb::measureNoShows(handSet(), d("2026-03-24"), d("2026-03-20"), o);
  // 03-17: base R1 2 + R2 1 + R3 3 + R8 1 + R10 2 = 9; no-shows R2 1 + R10 2 = 3; late R3 3 +
  //        R8 1 = 4; lost 7. (R4 cancelled before t, R5/R6 booked after t, R7 a day use.)
  // 03-10: base S1 4 + S2 2 = 6; late S2 2; lost 2. 03-03: empty base, skipped.
  // Lost per night {7, 2}: mean 4.5, sample sd √((2.5² + 2.5²)/1) = 3.535534; rate 9/15 = 0.6;
  // no-shows 3/2 = 1.5, late 6/2 = 3 per night. Stays: R1 2 × 100 + R6 1 × 160 + S1 4 × 120 =
  // 840 over 7 rooms → ADR 120.
  EXPECT_EQ(m.nights, 2);
  EXPECT_DOUBLE_EQ(m.mean, 4.5);
  EXPECT_NEAR(m.sd, 3.535534, 1e-6);
  EXPECT_DOUBLE_EQ(m.rate, 0.6);
  EXPECT_DOUBLE_EQ(m.noShowMean, 1.5);
  EXPECT_DOUBLE_EQ(m.lateCancelMean, 3);
  EXPECT_DOUBLE_EQ(m.adr, 120);
}

TEST(Overbooking, MeasureNoShowsWindowAndLead) {
  cb::NoShowOptions o;
  o.weeks = 4; // adds 02-24: base T1 5, no-shows 5, lost 5
  cb::NoShowMeasure m = cb::measureNoShows(handSet(), d("2026-03-24"), d("2026-03-20"), o);
  // Lost {7, 2, 5}: mean 14/3, sd √((7/3)² + (8/3)² + (1/3)²)/2) = √(19/3) = 2.516611; rate
  // 14/20 = 0.7; no-shows (3 + 0 + 5)/3, late (4 + 2 + 0)/3 = 2.
  EXPECT_EQ(m.nights, 3);
  EXPECT_NEAR(m.mean, 14.0 / 3, 1e-12);
  EXPECT_NEAR(m.sd, 2.516611, 1e-6);
  EXPECT_DOUBLE_EQ(m.rate, 0.7);
  EXPECT_NEAR(m.noShowMean, 8.0 / 3, 1e-12);
  EXPECT_NEAR(m.lateCancelMean, 2, 1e-12);

  // Lead 10: the base is read 10 days out (03-07 for 03-17, 02-28 for 03-10); late still means
  // from 2 days before. 03-17: R10 (booked 03-10) leaves the base; R4 (on the books at 03-07,
  // cancelled 03-10, before the late window) is freed in time, so not in the base either →
  // base 7, lost 5. 03-10: S3 (cancelled 03-07) likewise out → base 6, lost 2.
  // Lost {5, 2}: mean 3.5, sd √4.5 = 2.121320, rate 7/13, no-shows 1/2, late 6/2.
  o.weeks = 3;
  o.lead = 10;
  m = cb::measureNoShows(handSet(), d("2026-03-24"), d("2026-03-20"), o);
  EXPECT_EQ(m.nights, 2);
  EXPECT_DOUBLE_EQ(m.mean, 3.5);
  EXPECT_NEAR(m.sd, 2.121320, 1e-6);
  EXPECT_NEAR(m.rate, 7.0 / 13, 1e-12);
  EXPECT_DOUBLE_EQ(m.noShowMean, 0.5);
  EXPECT_DOUBLE_EQ(m.lateCancelMean, 3);

  // A target night five weeks after the reading date: its first similar night on or before
  // 03-20 is 03-17 again, so the same nights are measured.
  o.lead = 0;
  const cb::NoShowMeasure far =
      cb::measureNoShows(handSet(), d("2026-03-24") + 35, d("2026-03-20"), o);
  EXPECT_EQ(far.nights, 2);
  EXPECT_DOUBLE_EQ(far.mean, 4.5);

  // Nothing measured: all zero, no NaN.
  const cb::NoShowMeasure none = cb::measureNoShows({}, d("2026-03-24"), d("2026-03-20"), o);
  EXPECT_EQ(none.nights, 0);
  EXPECT_EQ(none.rate, 0);
  EXPECT_EQ(none.adr, 0);
  o.weeks = -1;
  EXPECT_THROW(cb::measureNoShows({}, d("2026-03-24"), d("2026-03-20"), o), std::invalid_argument);
}

} // namespace
