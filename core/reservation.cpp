#include "core/reservation.h"

#include <fmt/format.h>

#include <cmath>

namespace cb {

std::string_view statusName(ReservationStatus s) {
  switch (s) {
  case ReservationStatus::Booked: return "booked";
  case ReservationStatus::Cancelled: return "cancelled";
  case ReservationStatus::NoShow: return "no-show";
  case ReservationStatus::CheckedOut: return "checked-out";
  }
  return "booked";
}

std::optional<ReservationStatus> parseStatus(std::string_view name) {
  for (auto s : {ReservationStatus::Booked, ReservationStatus::Cancelled, ReservationStatus::NoShow,
                 ReservationStatus::CheckedOut})
    if (statusName(s) == name)
      return s;
  return std::nullopt;
}

std::string validateReservation(const Reservation &r, std::string *fieldOut) {
  auto fail = [&](const char *field, std::string msg) {
    if (fieldOut)
      *fieldOut = field;
    return msg;
  };
  if (r.id.empty())
    return fail("reservation_id", "reservation id is empty");
  if (r.departure < r.arrival)
    return fail("departure", fmt::format("departure {} is before arrival {}", r.departure.toIso(),
                                         r.arrival.toIso()));
  if (r.bookedOn > r.arrival)
    return fail("booked_on", fmt::format("booked on {}, after arrival {}", r.bookedOn.toIso(),
                                         r.arrival.toIso()));
  if (r.status == ReservationStatus::Cancelled && !r.cancelledOn)
    return fail("cancelled_on", "status is cancelled but cancelled_on is empty");
  if (r.status != ReservationStatus::Cancelled && r.cancelledOn)
    return fail("cancelled_on",
                fmt::format("cancelled_on is set but status is {}", statusName(r.status)));
  if (r.cancelledOn && *r.cancelledOn < r.bookedOn)
    return fail("cancelled_on", fmt::format("cancelled on {}, before it was booked on {}",
                                            r.cancelledOn->toIso(), r.bookedOn.toIso()));
  if (r.rooms < 0)
    return fail("rooms", fmt::format("rooms is negative ({})", r.rooms));
  if (r.rooms == 0)
    return fail("rooms", "rooms is 0; a reservation holds at least one room");
  if (!std::isfinite(r.rate))
    return fail("rate", "rate is not a finite number");
  if (r.rate < 0)
    return fail("rate", fmt::format("rate is negative ({})", r.rate));
  return {};
}

int Property::capacityOn(Date s) const {
  int cap = capacity;
  Date best;
  bool found = false;
  for (const auto &c : capacityChanges)
    if (c.from <= s && (!found || c.from >= best)) {
      best = c.from;
      cap = c.rooms;
      found = true;
    }
  return cap;
}

Date Property::stlyNight(Date s) const {
  if (stly == StlyAlignment::Weekday364)
    return s - 364;
  unsigned day = (s.month() == 2 && s.day() == 29) ? 28 : s.day();
  return Date::fromYmd(s.year() - 1, s.month(), day);
}

} // namespace cb
