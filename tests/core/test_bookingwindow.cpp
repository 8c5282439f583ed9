// Booking-window statistics on a hand-made set (figures worked out by hand; the lead quantiles
// also checked with R 4.2.2, tests/reference/quantile_type7.R, samples window_*), and
// invariants on the sample property.
#include "core/bookingwindow.h"

#include "core/simulator.h"

#include <gtest/gtest.h>

using cb::Date;
using cb::Reservation;

namespace {

Date d(const char *iso) { return *Date::parseIso(iso); }

Reservation res(const char *id, const char *booked, const char *arr, int nights, int rooms,
                const char *seg, double rate, const char *cancelled = nullptr) {
  Reservation r;
  r.id = id;
  r.bookedOn = d(booked);
  r.arrival = d(arr);
  r.departure = r.arrival + nights;
  r.rooms = rooms;
  r.segment = seg;
  r.rate = rate;
  if (cancelled) {
    r.status = cb::ReservationStatus::Cancelled;
    r.cancelledOn = d(cancelled);
  }
  return r;
}

// Reading date 2026-07-01; arrivals in July 2026. Lead and weight (rooms × nights) beside each.
std::vector<Reservation> handSet() {
  return {
      res("a", "2026-06-30", "2026-07-01", 2, 1, "CORP", 100),              // lead 1, weight 2
      res("b", "2026-06-25", "2026-07-01", 1, 3, "CORP", 120),              // lead 6, weight 3
      res("c", "2026-05-01", "2026-07-10", 4, 1, "FLEX", 90),               // lead 70, weight 4
      res("d", "2026-06-01", "2026-07-05", 2, 5, "FLEX", 95, "2026-06-15"), // cancelled: out
      res("e", "2026-06-10", "2026-07-05", 1, 1, "FLEX", 80, "2026-07-02"), // lead 25, still on
      res("f", "2026-06-30", "2026-07-03", 0, 1, "CORP", 40),  // day use: weighs nothing
      res("g", "2026-07-01", "2026-07-01", 1, 2, "FLEX", 150), // lead 0, weight 2
      res("h", "2026-01-01", "2026-08-01", 3, 1, "GRP", 70),   // arrives after the range
      res("i", "2025-12-01", "2026-07-20", 1, 2, "CORP", 200), // lead 231, weight 2
      res("k", "2026-07-02", "2026-07-04", 1, 1, "WALK", 99),  // booked after the reading date
      res("l", "2026-06-28", "2026-07-01", 1, 1, "FLEX", 60),  // lead 3, weight 1
  };
}

cb::BookingWindowOptions julyOptions() {
  cb::BookingWindowOptions o;
  o.asOf = d("2026-07-01");
  o.firstArrival = d("2026-07-01");
  o.lastArrival = d("2026-07-31");
  return o;
}

} // namespace

TEST(BookingWindow, Buckets) {
  // 0, 1–3, 4–7, 8–14, 15–30, 31–60, 61–90, 91–180, 181+ (common practice, no source).
  EXPECT_EQ(cb::leadBucketOf(0), 0u);
  EXPECT_EQ(cb::leadBucketOf(1), 1u);
  EXPECT_EQ(cb::leadBucketOf(3), 1u);
  EXPECT_EQ(cb::leadBucketOf(4), 2u);
  EXPECT_EQ(cb::leadBucketOf(14), 3u);
  EXPECT_EQ(cb::leadBucketOf(15), 4u);
  EXPECT_EQ(cb::leadBucketOf(60), 5u);
  EXPECT_EQ(cb::leadBucketOf(90), 6u);
  EXPECT_EQ(cb::leadBucketOf(180), 7u);
  EXPECT_EQ(cb::leadBucketOf(181), 8u);
  EXPECT_EQ(cb::leadBucketOf(5000), 8u);
  EXPECT_STREQ(cb::kLeadBuckets[8].label, "181+");
}

TEST(BookingWindow, HandMadeSetBySegment) {
  auto stats = cb::bookingWindow(handSet(), julyOptions());
  // GRP is known at the reading date (booked in January) but has no July arrivals; WALK is not.
  ASSERT_EQ(stats.size(), 4u);
  EXPECT_EQ(stats[0].series, "ALL");
  EXPECT_EQ(stats[1].series, "CORP");
  EXPECT_EQ(stats[2].series, "FLEX");
  EXPECT_EQ(stats[3].series, "GRP");

  const auto &all = stats[0];
  EXPECT_EQ(all.roomNights, 15); // 2 + 3 + 4 + 1 + 2 + 2 + 1
  const std::array<std::int64_t, 9> hist = {2, 3, 3, 0, 1, 0, 4, 0, 2};
  EXPECT_EQ(all.histogram, hist);
  EXPECT_DOUBLE_EQ(*all.averageRate[0], 150);
  EXPECT_DOUBLE_EQ(*all.averageRate[1], (100.0 * 2 + 60.0 * 1) / 3); // a and l
  EXPECT_DOUBLE_EQ(*all.averageRate[2], 120);
  EXPECT_FALSE(all.averageRate[3].has_value());
  EXPECT_DOUBLE_EQ(*all.averageRate[4], 80);
  EXPECT_DOUBLE_EQ(*all.averageRate[6], 90);
  EXPECT_DOUBLE_EQ(*all.averageRate[8], 200);
  // Leads per room-night 0 0 1 1 3 6 6 6 25 70 70 70 70 231 231; R 4.2.2 quantile(type = 7):
  // 2, 6, 70, 166.59999999999994.
  ASSERT_EQ(all.leadQuantiles.size(), 4u);
  EXPECT_NEAR(all.leadQuantiles[0], 2, 1e-12);
  EXPECT_NEAR(all.leadQuantiles[1], 6, 1e-12);
  EXPECT_NEAR(all.leadQuantiles[2], 70, 1e-12);
  EXPECT_NEAR(all.leadQuantiles[3], 166.59999999999994, 1e-12);

  const auto &corp = stats[1]; // 1 1 6 6 6 231 231 → R: 3.5, 6, 118.5, 231
  EXPECT_EQ(corp.roomNights, 7);
  EXPECT_NEAR(corp.leadQuantiles[0], 3.5, 1e-12);
  EXPECT_NEAR(corp.leadQuantiles[1], 6, 1e-12);
  EXPECT_NEAR(corp.leadQuantiles[2], 118.5, 1e-12);
  EXPECT_NEAR(corp.leadQuantiles[3], 231, 1e-12);
  const auto &flex = stats[2]; // 0 0 3 25 70 70 70 70 → R: 2.25, 47.5, 70, 70
  EXPECT_EQ(flex.roomNights, 8);
  EXPECT_NEAR(flex.leadQuantiles[0], 2.25, 1e-12);
  EXPECT_NEAR(flex.leadQuantiles[1], 47.5, 1e-12);
  EXPECT_NEAR(flex.leadQuantiles[2], 70, 1e-12);
  EXPECT_NEAR(flex.leadQuantiles[3], 70, 1e-12);
  EXPECT_DOUBLE_EQ(*flex.averageRate[1], 60);
  const auto &grp = stats[3];
  EXPECT_EQ(grp.roomNights, 0);
  EXPECT_TRUE(grp.leadQuantiles.empty());
  EXPECT_FALSE(grp.averageRate[0].has_value());
}

TEST(BookingWindow, ReadingDateDecidesWhatCounts) {
  auto o = julyOptions();
  o.asOf = d("2026-07-02"); // e is now cancelled, k is booked
  o.by = cb::SeriesBy::Total;
  auto stats = cb::bookingWindow(handSet(), o);
  ASSERT_EQ(stats.size(), 1u);
  EXPECT_EQ(stats[0].roomNights, 15 - 1 + 1);
  EXPECT_EQ(stats[0].histogram[4], 0);     // e's 25-day lead is gone
  EXPECT_EQ(stats[0].histogram[2], 3);     // b
  EXPECT_EQ(stats[0].histogram[1], 3 + 1); // a, l and k (lead 2)
  o.asOf = d("2026-07-03");
  EXPECT_THROW(cb::bookingWindow(handSet(), o), cb::AsOfError);
  o.asOf = d("2026-07-01");
  o.lastArrival = d("2026-06-30");
  EXPECT_THROW(cb::bookingWindow(handSet(), o), std::invalid_argument);
  o.lastArrival = d("2026-07-31");
  o.probabilities = {1.2};
  EXPECT_THROW(cb::bookingWindow(handSet(), o), std::invalid_argument);
}

TEST(BookingWindow, SamplePropertyInvariants) {
  auto sample = cb::simulateProperty();
  const auto &rs = sample.reservations;
  cb::BookingWindowOptions o;
  o.asOf = sample.readingDate;
  o.firstArrival = sample.readingDate - 365;
  o.lastArrival = sample.readingDate + 90;
  for (cb::SeriesBy by : {cb::SeriesBy::Segment, cb::SeriesBy::Channel, cb::SeriesBy::RoomType}) {
    o.by = by;
    auto stats = cb::bookingWindow(rs, o);
    ASSERT_GT(stats.size(), 2u);
    std::int64_t direct = 0;
    double revenue = 0;
    for (const auto &r : rs)
      if (!r.cancelledOn && r.arrival >= o.firstArrival && r.arrival <= o.lastArrival) {
        direct += std::int64_t{r.rooms} * r.nights();
        revenue += r.rate * r.rooms * r.nights();
      }
    EXPECT_EQ(stats[0].roomNights, direct);
    std::int64_t parts = 0;
    double bucketRevenue = 0;
    for (std::size_t b = 0; b < cb::kLeadBuckets.size(); ++b)
      if (stats[0].averageRate[b])
        bucketRevenue += *stats[0].averageRate[b] * static_cast<double>(stats[0].histogram[b]);
    EXPECT_NEAR(bucketRevenue, revenue, 1e-6 * revenue);
    for (std::size_t i = 1; i < stats.size(); ++i) {
      parts += stats[i].roomNights;
      std::int64_t hist = 0;
      for (auto h : stats[i].histogram)
        hist += h;
      EXPECT_EQ(hist, stats[i].roomNights) << stats[i].series;
      if (!stats[i].leadQuantiles.empty()) {
        EXPECT_LE(stats[i].leadQuantiles[0], stats[i].leadQuantiles[1]);
        EXPECT_LE(stats[i].leadQuantiles[1], stats[i].leadQuantiles[2]);
        EXPECT_LE(stats[i].leadQuantiles[2], stats[i].leadQuantiles[3]);
      }
    }
    EXPECT_EQ(parts, stats[0].roomNights);
  }
}
