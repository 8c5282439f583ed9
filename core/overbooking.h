// Overbooking (brief section 6): how many reservations beyond capacity to accept so that the
// cost of walking a guest balances the value of an empty room (critical fractile), from the
// measured no-show and late-cancellation rates of similar nights. Check values:
// check-values.md §7. Always shown with kOverbookingCaution (core/advice.h).
#pragma once

#include "core/date.h"
#include "core/reservation.h"

#include <vector>

namespace cb {

struct OverbookingCosts {
  double emptyRoomValue = 0; ///< Cu: revenue lost by a room left empty (e.g. the night's ADR)
  double walkCost = 0;       ///< Co: cost of walking a guest who shows up to a full hotel
};

/// CR = Cu / (Cu + Co). Throws std::invalid_argument unless both costs are > 0.
double criticalRatio(const OverbookingCosts &costs);

/// No-shows ~ Normal(mu, sigma): Y = mu + sigma·Φ⁻¹(CR), returned continuous and as computed (it
/// may be negative); for rooms the caller takes max(0, floor(Y)). sigma 0 gives mu. Throws
/// std::invalid_argument for sigma < 0 or a non-finite input. Example: mu 5, sigma 3, Cu 80,
/// Co 200 → 3.302154 (check-values.md §7a), i.e. 3 rooms.
double overbookNormal(double mu, double sigma, const OverbookingCosts &costs);
/// No-shows ~ Poisson(mean): smallest Y with F(Y) ≥ CR. Example: 8.5, Cu 159, Co 350 → 7 (§7b).
int overbookPoisson(double mean, const OverbookingCosts &costs);
/// Each of the capacity + Y reservations fails to show independently with probability
/// noShowProb: smallest Y ≥ 0 with P(no-shows ≤ Y) ≥ CR, no-shows ~ Binomial(capacity + Y, q).
/// Throws std::invalid_argument for capacity < 0 or noShowProb outside [0, 1).
int overbookBinomial(int capacity, double noShowProb, const OverbookingCosts &costs);
/// Service-level form: largest n with P(shows ≤ capacity) ≥ level, shows ~ Binomial(n,
/// showProb). Example: 300 rooms, show 0.85, level 0.95 → 341 (check-values.md §7c). Throws
/// std::invalid_argument for capacity < 0, showProb outside (0, 1] or level outside (0, 1).
int maxReservationsForServiceLevel(int capacity, double showProb, double level);

/// Measured losses of similar nights (see measureNoShows for the exact definition): per night,
/// rooms of the base that did not stay, as a no-show or a late cancellation.
struct NoShowMeasure {
  int nights = 0;        ///< similar nights measured
  double mean = 0;       ///< mean rooms lost per night
  double sd = 0;         ///< sample sd (n − 1) of rooms lost per night
  double rate = 0;       ///< rooms lost / rooms of the base, pooled over the nights
  double noShowMean = 0; ///< of which no-shows
  double lateCancelMean = 0;
  /// Revenue / rooms of the stays of those nights (every reservation covering the night that
  /// was neither cancelled nor a no-show, whenever booked): a value of an empty room.
  double adr = 0;
};

struct NoShowOptions {
  int weeks = 12;         ///< same-weekday nights of the last `weeks` weeks before the reading date
  int lateCancelDays = 2; ///< PropertySettings::lateCancelDays
  /// The base is read max(lead, lateCancelDays + 1) days before arrival (see measureNoShows).
  int lead = 0;
};

/// Measures the nights night − 7, night − 14, … (same weekday) that lie on or before asOf,
/// the `weeks` most recent of them. For each such night s, with t = s − max(lead,
/// lateCancelDays + 1):
/// - base: rooms on the books for s at reading date t (Reservation::onBooks), less those
///   cancelled before s − lateCancelDays (freed early enough to resell; only possible when lead
///   > lateCancelDays + 1). Reading the base before the late window starts is what lets a late
///   cancellation be counted at all: at lead 0 it is already off the books.
/// - no-shows: base rooms with status NoShow; late cancellations: base rooms cancelled on or
///   after s − lateCancelDays (a cancellation dated on or after the night counts as late too).
/// - lost = no-shows + late cancellations. Bookings made after t (short-lead business) are not
///   in the base, so their no-shows are not counted either.
/// A night with an empty base (closed, or before the data starts) is skipped, not counted as 0.
/// Outcomes are taken as the reservations record them now (the store keeps the latest status).
/// Day uses never count. Throws std::invalid_argument for a negative option.
NoShowMeasure measureNoShows(const std::vector<Reservation> &reservations, Date night, Date asOf,
                             const NoShowOptions &options = {});

} // namespace cb
