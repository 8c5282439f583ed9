// Group model (core/groupmodel.h): wash by lead against a hand-computed case, expected rooms of a
// future night before and after the cutoff, tentative blocks and orphan block ids.
#include "testsupport.h"

#include "core/groupmodel.h"
#include "core/grouppace.h"

namespace {

using cb::Date;
using cbtest::makeReservation;

Date d(const char *iso) { return *Date::parseIso(iso); }

cb::Reservation grp(const char *id, const char *block, const char *booked, const char *arr,
                    const char *dep, int rooms, const char *cancelled = nullptr) {
  cb::Reservation r = makeReservation(id, booked, arr, dep, rooms, "GRP", cancelled);
  r.blockId = block;
  return r;
}

cb::BlockRecord block(const char *id, const char *arr, const char *dep, int rooms,
                      const char *cutoff, cb::BlockStatus status, const char *contracted) {
  return {{id, "", "GRP", d(arr), d(dep), rooms, d(cutoff), status}, d(contracted), "STD"};
}

// Reading date 2026-03-01. Past blocks (departure on or before it):
//   A: nights 02-10 and 02-11, 10 rooms each, contracted 2025-12-01.
//      A1 4 rooms both nights, booked 01-01, stays
//      A2 3 rooms both nights, booked 01-25, stays
//      A3 2 rooms night 02-10, booked 01-05, cancelled 02-01
//      A4 1 room night 02-11, booked 02-05, stays
//      finals: 02-10 = 4 + 3 = 7; 02-11 = 4 + 3 + 1 = 8
//   B: night 02-20, 5 rooms, contracted 01-25; B1 5 rooms booked 02-01, stays (final 5).
// Wash at lead h: per night, held = min(OTB at arrival − h, block), stayed = min(final, block);
//   remaining = Σ (block − held), later = Σ max(0, stayed − held), wash = 1 − later / remaining.
//   Lead 30 (A read at 01-11; B not contracted until 01-25 > 01-21, left out):
//     A held 6 (A1 + A3) and 4 (A1) → remaining 4 + 6 = 10, later 1 + 4 = 5 → wash 0.5.
//   Lead 14 (A at 01-27, B at 02-06):
//     A held 9 (A1 + A2 + A3) and 7 → remaining 1 + 3 = 4, later 0 + 1 = 1; B held 5, remaining 0
//     → wash 1 − 1/4 = 0.75 over 2 blocks.
//   Lead 9 (A at 02-01, A3 cancelled that day so off the books; B at 02-11):
//     A held 7 and 7 → remaining 3 + 3 = 6, later 0 + 1 = 1; B remaining 0 → wash 1 − 1/6.
// Future block C: nights 03-10 and 03-11, 8 rooms, cutoff 03-03, tentative, contracted 02-01;
//   C1 2 rooms both nights booked 02-15. Seen from 03-01 (lead 9, before the cutoff):
//   expected = 2 + p × (8 − 2) × (1 − 5/6) = 2 + p → 2.5 at p = 0.5, 3 at p = 1.
class GroupModelCase : public ::testing::Test {
protected:
  GroupModelCase()
      : model({block("A", "2026-02-10", "2026-02-12", 10, "2026-01-27", cb::BlockStatus::Definite,
                     "2025-12-01"),
               block("B", "2026-02-20", "2026-02-21", 5, "2026-02-06", cb::BlockStatus::Definite,
                     "2026-01-25"),
               block("C", "2026-03-10", "2026-03-12", 8, "2026-03-03", cb::BlockStatus::Tentative,
                     "2026-02-01")},
              {grp("A1", "A", "2026-01-01", "2026-02-10", "2026-02-12", 4),
               grp("A2", "A", "2026-01-25", "2026-02-10", "2026-02-12", 3),
               grp("A3", "A", "2026-01-05", "2026-02-10", "2026-02-11", 2, "2026-02-01"),
               grp("A4", "A", "2026-02-05", "2026-02-11", "2026-02-12", 1),
               grp("B1", "B", "2026-02-01", "2026-02-20", "2026-02-21", 5),
               grp("C1", "C", "2026-02-15", "2026-03-10", "2026-03-12", 2),
               grp("X1", "GONE", "2026-02-20", "2026-03-10", "2026-03-11", 3),
               makeReservation("T1", "2026-02-20", "2026-03-10", "2026-03-11", 9, "TRN")}) {}
  cb::GroupModel model;
  const Date asOf = d("2026-03-01");
};

TEST_F(GroupModelCase, WashByLeadMatchesTheHandComputation) {
  const auto w30 = model.wash("", 30, asOf);
  EXPECT_EQ(w30.blocks, 1);
  EXPECT_DOUBLE_EQ(w30.remaining, 10);
  EXPECT_DOUBLE_EQ(w30.later, 5);
  EXPECT_DOUBLE_EQ(*w30.wash, 0.5);
  const auto w14 = model.wash("", 14, asOf);
  EXPECT_EQ(w14.blocks, 2);
  EXPECT_DOUBLE_EQ(*w14.wash, 0.75);
  EXPECT_DOUBLE_EQ(*model.wash("", 9, asOf).wash, 1.0 - 1.0 / 6.0);
  // Two GRP blocks are fewer than kMinBlocks: the segment borrows the all-segment figure.
  const auto seg = model.wash("GRP", 14, asOf);
  EXPECT_TRUE(seg.pooled);
  EXPECT_DOUBLE_EQ(*seg.wash, 0.75);
  // Read on 02-11 no block has departed yet (A leaves on 02-12): nothing to measure.
  EXPECT_EQ(model.wash("", 14, d("2026-02-11")).wash, std::nullopt);
}

TEST_F(GroupModelCase, ExpectedRoomsBeforeAndAfterTheCutoff) {
  const auto c = model.expected(2, d("2026-03-10"), asOf, 0.5);
  EXPECT_EQ(c.pickedUp, 2);
  EXPECT_NEAR(c.expected, 2.5, 1e-12);
  EXPECT_NEAR(model.expected(2, d("2026-03-10"), asOf, 1.0).expected, 3.0, 1e-12);
  // From the cutoff (03-03) on only the picked-up rooms count.
  EXPECT_DOUBLE_EQ(model.expected(2, d("2026-03-10"), d("2026-03-03"), 1.0).expected, 2.0);
  // The night of 03-10: block C (2.5) plus the orphan block id GONE (3 rooms); T1 is transient.
  EXPECT_NEAR(model.expectedRooms(d("2026-03-10"), asOf, 0.5), 5.5, 1e-12);
  EXPECT_NEAR(model.expectedRooms(d("2026-03-11"), asOf, 0.5), 2.5, 1e-12);
  // A past night: the group rooms that stayed.
  EXPECT_DOUBLE_EQ(model.expectedRooms(d("2026-02-11"), asOf, 0.5), 8.0);
  EXPECT_NEAR(model.shareOnBooks(0, d("2026-01-11")), 10.0 / 20.0, 1e-12); // 6 + 4 of 20
}

// Pickup tracking (core/grouppace.h) on the same case, read at 03-01:
//   typical pace at lead 30: only A was contracted 30 days out; its share at 01-11 was
//     (6 + 4) / 20 = 0.5 → median 0.5.
//   at lead 9: A at 02-01 had (7 + 7) / 20 = 0.7, B at 02-11 had 5 / 5 = 1 → median 0.85, lower
//     quartile (type 7) 0.7 + 0.25 × 0.3 = 0.775.
//   block C (lead 9): 2 + 2 of 16 room-nights = 0.25 < 0.775 → "well behind"; expected room-nights
//     2.5 + 2.5 = 5 at p = 0.5; cutoff 03-03 is 2 days away.
TEST_F(GroupModelCase, PickupTrackingAgainstTheTypicalPace) {
  const auto t30 = cb::typicalPace(model, 30, asOf);
  EXPECT_EQ(t30.blocks, 1);
  EXPECT_DOUBLE_EQ(*t30.median, 0.5);
  const auto t9 = cb::typicalPace(model, 9, asOf);
  EXPECT_EQ(t9.blocks, 2);
  EXPECT_NEAR(*t9.median, 0.85, 1e-12);
  EXPECT_NEAR(*t9.lowerQuartile, 0.775, 1e-12);
  const auto tracked = cb::trackBlocks(model, asOf, 0.5);
  ASSERT_EQ(tracked.size(), 1U); // A and B have departed
  const auto &c = tracked[0];
  EXPECT_EQ(model.blocks()[c.block].block.id, "C");
  EXPECT_EQ(c.lead, 9);
  EXPECT_EQ(c.daysToCutoff, 2);
  EXPECT_EQ(c.pickedRoomNights, 4);
  EXPECT_DOUBLE_EQ(c.share, 0.25);
  EXPECT_NEAR(c.expectedRoomNights, 5.0, 1e-12);
  EXPECT_EQ(c.flag, "well behind");
  // After the cutoff with rooms not picked up the block is released.
  EXPECT_EQ(cb::trackBlocks(model, d("2026-03-04"), 0.5)[0].flag, "released");
  const auto curve = cb::pickupCurve(model, 2, asOf, {30, 9, 3});
  ASSERT_EQ(curve.size(), 3U);
  EXPECT_DOUBLE_EQ(*curve[0].share, 0.0); // 02-08: nothing booked yet (C1 on 02-15)
  EXPECT_DOUBLE_EQ(*curve[1].share, 0.25);
  EXPECT_EQ(curve[2].share, std::nullopt); // 03-07 is after the reading date
}

} // namespace
