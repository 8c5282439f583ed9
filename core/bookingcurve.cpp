#include "core/bookingcurve.h"

namespace cb {

NightCurve bookingCurve(const std::vector<Reservation> &reservations, Date night, int maxLead,
                        const std::string &segment) {
  NightCurve c;
  c.night = night;
  c.rooms.assign(static_cast<std::size_t>(maxLead) + 1, 0);
  c.revenue.assign(static_cast<std::size_t>(maxLead) + 1, 0.0);
  for (const auto &r : reservations) {
    if (!r.covers(night) || (!segment.empty() && r.segment != segment))
      continue;
    // On the books from lead (night − bookedOn) down to just after the cancellation.
    for (int d = 0; d <= maxLead; ++d) {
      if (r.onBooks(night, night - d)) {
        c.rooms[static_cast<std::size_t>(d)] += r.rooms;
        c.revenue[static_cast<std::size_t>(d)] += r.rate * r.rooms;
      }
    }
  }
  return c;
}

} // namespace cb
