// One night's booking curve straight from reservations. The full curve cube (all nights,
// leads and series in one pass) replaces this for bulk work; this stays as the
// definition-level reference that tests compare the cube against.
#pragma once

#include "core/reservation.h"

#include <string>
#include <vector>

namespace cb {

struct NightCurve {
  Date night;
  /// rooms[d] = OTB(night, night − d) for d = 0 … maxLead (brief section 4).
  std::vector<int> rooms;
  std::vector<double> revenue; ///< rate × rooms on the books, same indexing
};

/// Curve of `night` over leads 0…maxLead; `segment` empty = all segments.
NightCurve bookingCurve(const std::vector<Reservation> &reservations, Date night, int maxLead,
                        const std::string &segment = {});

} // namespace cb
