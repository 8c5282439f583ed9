// The reservation rules and the on-the-books definition of brief section 4.
#include "core/reservation.h"

#include <gtest/gtest.h>

using cb::Date;
using cb::Reservation;
using cb::ReservationStatus;

namespace {

Date d(const char *iso) { return *Date::parseIso(iso); }

Reservation base() {
  Reservation r;
  r.id = "R1";
  r.bookedOn = d("2026-01-10");
  r.arrival = d("2026-02-01");
  r.departure = d("2026-02-03");
  r.rooms = 2;
  r.segment = "CORP";
  r.rate = 120;
  return r;
}

} // namespace

TEST(Reservation, OnTheBooksFollowsTheDefinition) {
  Reservation r = base();
  // Covers arrival ≤ s < departure: the departure night is not a stay night.
  EXPECT_TRUE(r.covers(d("2026-02-01")));
  EXPECT_TRUE(r.covers(d("2026-02-02")));
  EXPECT_FALSE(r.covers(d("2026-02-03")));
  EXPECT_FALSE(r.covers(d("2026-01-31")));
  // Booked on t counts as known on t; the day before it does not.
  EXPECT_TRUE(r.onBooks(d("2026-02-01"), d("2026-01-10")));
  EXPECT_FALSE(r.onBooks(d("2026-02-01"), d("2026-01-09")));
  // Cancelled on or before t: off the books from the cancellation date on.
  r.status = ReservationStatus::Cancelled;
  r.cancelledOn = d("2026-01-20");
  EXPECT_TRUE(r.onBooks(d("2026-02-01"), d("2026-01-19")));
  EXPECT_FALSE(r.onBooks(d("2026-02-01"), d("2026-01-20")));
  // No-shows stay on the books (brief section 4).
  Reservation ns = base();
  ns.status = ReservationStatus::NoShow;
  EXPECT_TRUE(ns.onBooks(d("2026-02-01"), d("2026-02-01")));
}

TEST(Reservation, DayUseOccupiesNoNight) {
  Reservation r = base();
  r.departure = r.arrival;
  EXPECT_TRUE(r.isDayUse());
  EXPECT_EQ(r.nights(), 0);
  EXPECT_FALSE(r.covers(r.arrival));
  EXPECT_EQ(cb::validateReservation(r), ""); // kept: a valid record
}

TEST(Reservation, ValidationNamesTheFieldAtFault) {
  struct Case {
    void (*edit)(Reservation &);
    const char *field;
    const char *message;
  };
  const Case cases[] = {
      {[](Reservation &r) { r.departure = d("2026-01-31"); }, "departure",
       "departure 2026-01-31 is before arrival 2026-02-01"},
      {[](Reservation &r) { r.bookedOn = d("2026-02-02"); }, "booked_on",
       "booked on 2026-02-02, after arrival 2026-02-01"},
      {[](Reservation &r) {
         r.status = ReservationStatus::Cancelled;
         r.cancelledOn = d("2026-01-09");
       },
       "cancelled_on", "cancelled on 2026-01-09, before it was booked on 2026-01-10"},
      {[](Reservation &r) { r.status = ReservationStatus::Cancelled; }, "cancelled_on",
       "status is cancelled but cancelled_on is empty"},
      {[](Reservation &r) { r.cancelledOn = d("2026-01-12"); }, "cancelled_on",
       "cancelled_on is set but status is booked"},
      {[](Reservation &r) { r.rooms = -1; }, "rooms", "rooms is negative (-1)"},
      {[](Reservation &r) { r.rooms = 0; }, "rooms",
       "rooms is 0; a reservation holds at least one room"},
      {[](Reservation &r) { r.rate = -5; }, "rate", "rate is negative (-5)"},
      {[](Reservation &r) { r.rate = std::numeric_limits<double>::quiet_NaN(); }, "rate",
       "rate is not a finite number"},
      {[](Reservation &r) { r.id.clear(); }, "reservation_id", "reservation id is empty"},
  };
  for (const auto &c : cases) {
    Reservation r = base();
    c.edit(r);
    std::string field;
    EXPECT_EQ(cb::validateReservation(r, &field), c.message);
    EXPECT_EQ(field, c.field) << c.message;
  }
  EXPECT_EQ(cb::validateReservation(base()), "");
}

TEST(Reservation, StatusNamesRoundTrip) {
  for (auto s : {ReservationStatus::Booked, ReservationStatus::Cancelled, ReservationStatus::NoShow,
                 ReservationStatus::CheckedOut})
    EXPECT_EQ(cb::parseStatus(cb::statusName(s)), s);
  EXPECT_FALSE(cb::parseStatus("Canceled")); // the open dataset's spelling needs a profile
}

TEST(Property, CapacityWithDatedChanges) {
  cb::Property p;
  p.capacity = 150;
  p.capacityChanges = {{d("2025-01-06"), 138, "refurbishment"}, {d("2025-03-01"), 150, "reopened"}};
  EXPECT_EQ(p.capacityOn(d("2025-01-05")), 150);
  EXPECT_EQ(p.capacityOn(d("2025-01-06")), 138);
  EXPECT_EQ(p.capacityOn(d("2025-02-28")), 138);
  EXPECT_EQ(p.capacityOn(d("2025-03-01")), 150);
}

TEST(Property, StlyNight) {
  cb::Property p;
  // 364 days keeps the weekday (common practice, no source): Sat 2026-11-14 → Sat 2025-11-15.
  EXPECT_EQ(p.stlyNight(d("2026-11-14")), d("2025-11-15"));
  EXPECT_EQ(p.stlyNight(d("2026-11-14")).isoWeekday(), 6u);
  p.stly = cb::StlyAlignment::CalendarDate;
  EXPECT_EQ(p.stlyNight(d("2026-11-14")), d("2025-11-14"));
  EXPECT_EQ(p.stlyNight(d("2028-02-29")), d("2027-02-28"));
}
