// One night's curve against figures worked out by hand from the definitions (brief section 4).
#include "core/bookingcurve.h"

#include <gtest/gtest.h>

using cb::Date;
using cb::Reservation;

namespace {

Date d(const char *iso) { return *Date::parseIso(iso); }

Reservation res(const char *id, const char *booked, const char *arr, const char *dep, int rooms,
                double rate, const char *seg, const char *cancelled = nullptr) {
  Reservation r;
  r.id = id;
  r.bookedOn = d(booked);
  r.arrival = d(arr);
  r.departure = d(dep);
  r.rooms = rooms;
  r.rate = rate;
  r.segment = seg;
  if (cancelled) {
    r.status = cb::ReservationStatus::Cancelled;
    r.cancelledOn = d(cancelled);
  }
  return r;
}

} // namespace

TEST(BookingCurve, MatchesHandComputedOtb) {
  // Night s = 2026-06-13.
  std::vector<Reservation> rs = {
      res("a", "2026-06-03", "2026-06-12", "2026-06-14", 3, 100, "CORP"), // from d = 10
      res("b", "2026-06-11", "2026-06-13", "2026-06-14", 2, 150, "FLEX"), // from d = 2
      res("c", "2026-06-01", "2026-06-13", "2026-06-15", 4, 90, "FLEX", "2026-06-08"), // d 12..6
      res("x", "2026-06-01", "2026-06-13", "2026-06-13", 5, 50, "FLEX"), // day use: no night
      res("y", "2026-06-01", "2026-06-11", "2026-06-13", 6, 50, "FLEX"), // departs on s
      res("z", "2026-06-12", "2026-06-14", "2026-06-15", 7, 50, "FLEX"), // arrives after s
  };
  cb::NightCurve c = cb::bookingCurve(rs, d("2026-06-13"), 14);
  const int expected[15] = {5, 5, 5, 3, 3, 3, 7, 7, 7, 7, 7, 4, 4, 0, 0};
  for (int lead = 0; lead <= 14; ++lead)
    EXPECT_EQ(c.rooms[static_cast<std::size_t>(lead)], expected[lead]) << "lead " << lead;
  // Revenue = rate × rooms of what is on the books.
  EXPECT_DOUBLE_EQ(c.revenue[0], 3 * 100.0 + 2 * 150.0);
  EXPECT_DOUBLE_EQ(c.revenue[7], 3 * 100.0 + 4 * 90.0);
  EXPECT_DOUBLE_EQ(c.revenue[12], 4 * 90.0);

  cb::NightCurve flex = cb::bookingCurve(rs, d("2026-06-13"), 14, "FLEX");
  EXPECT_EQ(flex.rooms[0], 2);
  EXPECT_EQ(flex.rooms[7], 4);
  EXPECT_EQ(flex.rooms[11], 4);
  cb::NightCurve none = cb::bookingCurve(rs, d("2026-06-13"), 14, "GRP");
  EXPECT_EQ(none.rooms[0], 0);
}
