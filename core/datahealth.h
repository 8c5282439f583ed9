// Data health: what in a property's reservation history makes its booking curves untrustworthy
// (an extract that starts after its first nights' bookings began, days with no bookings, nights
// over capacity, segments nobody set up). Shown on the Data screen and by `curvebench health`.
#pragma once

#include "core/finding.h"
#include "core/reservation.h"

#include <cstddef>
#include <string>
#include <vector>

namespace cb {

class Store;

struct HealthOptions {
  /// A run of at least this many days with no booking made is a gap (our own default: a whole
  /// week without one booking is not how a hotel in business looks).
  int gapDays = 7;
  /// A night at the start of the data counts as incomplete while at least this share of its
  /// rooms is estimated missing (1 %, our own threshold: well below the day-to-day noise of
  /// occupancy, so the nights flagged are the ones the cut really distorts).
  double rampUpShare = 0.01;
  /// The early-bookings check reports only when at least this many reservations booked
  /// before the first booking date would be expected (see checkDataHealth): with fewer, finding
  /// none is ordinary chance (e^-20 is negligible; our own threshold, kept well clear of it).
  double minExpectedMissing = 20.0;
  /// Findings listed per kind (gaps, empty nights, nights over capacity, segments); the rest are
  /// summed up in one more finding, so a broken extract does not bury the others.
  std::size_t maxListed = 20;
};

/// Checks a property's reservations and returns warnings (the curves are affected) and notes.
/// Findings carry `file` (e.g. the store path) and line 0; messages name the dates, e.g.
/// "nights 2015-07-01 to 2015-07-09 are incomplete: …". Order: start of the data, end of the
/// data, booking gaps, empty nights, nights over capacity, unknown segments.
///
/// The start of the data is checked two ways, both from the data's own distributions:
/// - in-house stays: nothing arrived before the first arrival date A0, so night A0 + k lacks
///   the guests who arrived earlier and stayed more than k nights. The share missing is
///   estimated as the share of all counted room-nights that are night k + 2 or later of their
///   stay; nights are flagged while it is at least `rampUpShare`.
/// - early bookings: nothing was booked before the first booking date B0. From the arrival
///   lead times of all reservations, the number booked before B0 that the arrivals from A0 on
///   would have had is estimated (Σ over arrival dates a of arrivals(a) × P(lead > a − B0));
///   when it reaches `minExpectedMissing`, the nights where the share of rooms so missing is at
///   least `rampUpShare` are reported. An extract cut by booking date (a new reservation
///   system, say) shows this; an honest one has B0 where its longest leads happen to end.
/// Counted room-nights are those in the finals: night s of a reservation not cancelled on or
/// before s (brief section 4), future nights as they stand on the books.
Findings checkDataHealth(const std::vector<Reservation> &reservations, const Property &property,
                         const std::vector<Segment> &segments, const HealthOptions &options = {},
                         const std::string &file = {});

/// The same for everything in a store; findings name the store's path.
Findings checkDataHealth(const Store &store, const HealthOptions &options = {});

} // namespace cb
