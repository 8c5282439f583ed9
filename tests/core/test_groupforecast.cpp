// Group / transient split (core/groupforecast.h): constrained figures on the capacity left after
// groups, and the group-model backtest on a hand-worked pair of nights.
#include "testsupport.h"

#include "core/groupforecast.h"

namespace {

using cb::Date;
Date d(const char *iso) { return *Date::parseIso(iso); }

// Capacity left after groups (core/groupforecast.h): capacity 140, groups 20 → 120 left for
// D ~ N(100, 20): constrained 98.333691, spill 1.666309 (check-values.md §3), total constrained
// 20 + 98.333691. Groups above capacity leave nothing: all transient demand spills.
TEST(SplitForecast, ConstrainedFiguresUseTheCapacityLeftAfterGroups) {
  cb::SplitNight n;
  n.capacity = 140;
  n.group = 20;
  n.transient = 100;
  n.transientSd = 20;
  n.lo = 80;
  n.hi = 125;
  cb::fillSplitCapacity(n);
  EXPECT_DOUBLE_EQ(n.capacityLeft, 120);
  EXPECT_NEAR(n.transientConstrained, 98.333691, 1e-6); // check-values.md §3
  EXPECT_NEAR(n.transientSpill, 1.666309, 1e-6);        // check-values.md §3
  EXPECT_NEAR(n.constrainedTotal, 118.333691, 1e-6);
  EXPECT_DOUBLE_EQ(n.total, 120);
  EXPECT_DOUBLE_EQ(*n.totalLo, 100);
  EXPECT_DOUBLE_EQ(*n.totalHi, 145);
  n.group = 150;
  cb::fillSplitCapacity(n);
  EXPECT_DOUBLE_EQ(n.capacityLeft, 0);
  EXPECT_DOUBLE_EQ(n.transientSpill, 100);
  EXPECT_DOUBLE_EQ(n.constrainedTotal, 140);
}

// Block A of tests/core/test_groupmodel.cpp alone (10 rooms on 02-10 and 02-11, cutoff 01-27):
// read 30 days ahead (01-11 for 02-10, 01-12 for 02-11) no block has departed, so there is no
// wash yet and the whole remaining block counts.
//   02-10: picked up 6 (A1 4 + A3 2) → expected 6 + 4 = 10; stayed 7 (A3 cancelled).
//   02-11: picked up 4 (A1)           → expected 4 + 6 = 10; stayed 8.
//   MAE (3 + 2) / 2 = 2.5, bias +2.5 (= the whole-block rule here); picked up only: 6 − 7 and
//   4 − 8 → MAE 2.5, bias −2.5.
TEST(GroupBacktest, HandWorkedNights) {
  auto row = [](const char *id, const char *booked, const char *arr, const char *dep, int rooms,
                const char *cancelled = nullptr) {
    cb::Reservation r = cbtest::makeReservation(id, booked, arr, dep, rooms, "GRP", cancelled);
    r.blockId = "A";
    return r;
  };
  const std::vector<cb::Reservation> rows{
      row("A1", "2026-01-01", "2026-02-10", "2026-02-12", 4),
      row("A2", "2026-01-25", "2026-02-10", "2026-02-12", 3),
      row("A3", "2026-01-05", "2026-02-10", "2026-02-11", 2, "2026-02-01"),
      row("A4", "2026-02-05", "2026-02-11", "2026-02-12", 1)};
  const std::vector<cb::BlockRecord> blocks{{{"A", "", "GRP", d("2026-02-10"), d("2026-02-12"), 10,
                                              d("2026-01-27"), cb::BlockStatus::Definite},
                                             d("2025-12-01"),
                                             ""}};
  const cb::GroupBacktest bt =
      cb::backtestGroups(rows, blocks, d("2026-02-10"), d("2026-02-11"), 30, 0.5);
  EXPECT_EQ(bt.nights, 2);
  EXPECT_DOUBLE_EQ(bt.meanActual, 7.5);
  EXPECT_DOUBLE_EQ(bt.meanExpected, 10);
  EXPECT_DOUBLE_EQ(bt.mae, 2.5);
  EXPECT_DOUBLE_EQ(bt.bias, 2.5);
  EXPECT_DOUBLE_EQ(bt.maeWholeBlock, 2.5);
  EXPECT_DOUBLE_EQ(bt.maePickedUp, 2.5);
  EXPECT_DOUBLE_EQ(bt.biasPickedUp, -2.5);
  // A block contracted after the reading date was not known then: only its rows already on the
  // books count, as picked up (6 and 4 → mean 5), with nothing for the rest of the block.
  auto late = blocks;
  late[0].contractedOn = d("2026-01-20");
  EXPECT_DOUBLE_EQ(
      cb::backtestGroups(rows, late, d("2026-02-10"), d("2026-02-11"), 30, 0.5).meanExpected, 5);
}

} // namespace
