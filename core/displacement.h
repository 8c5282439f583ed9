// Displacement check of a group offer (issue 7): for each night of the offer, and the shoulder
// nights either side, the transient rooms the group would displace (expected, from the transient
// demand distribution and the capacity left after the groups already held) times their expected
// rate, against the group's value. Advisory: printed with kAdvisoryCaution.
#pragma once

#include "core/groupforecast.h"

#include <optional>
#include <string>
#include <vector>

namespace cb {

/// One night of the offer: rooms, rate per room-night, other revenue per room-night (meeting
/// rooms, meals) and cost per room-night (commission, amenities, complimentary rooms).
struct OfferNight {
  Date night;
  int rooms = 0;
  double rate = 0;
  double otherRevenue = 0;
  double cost = 0;
};

/// What the check needs to know of one night (from the split forecast, or given by a test).
struct DisplacementInput {
  Date night;
  int capacity = 0;
  double groupRooms = 0;    ///< expected rooms of the groups already held
  double transientMean = 0; ///< unconstrained transient demand D ~ Normal(mean, sd)
  double transientSd = 0;
  double transientRate = 0; ///< expected rate of a transient room-night
  int transientOtb = 0;     ///< transient rooms already on the books
};

struct DisplacementNight {
  Date night;
  bool shoulder = false; ///< the night before arrival or the night of departure
  OfferNight offer;      ///< rooms 0 on a shoulder night
  DisplacementInput input;
  double capacityLeft = 0;   ///< L = max(0, capacity − group rooms)
  double leftWithOffer = 0;  ///< L' = max(0, L − offer rooms)
  double displacedRooms = 0; ///< E[min(D, L)] − E[min(D, L')]; shoulder: see evaluate
  double displacedValue = 0; ///< displaced rooms × transient rate
  double groupValue = 0;     ///< offer rooms × (rate + other revenue − cost)
  double net = 0;            ///< group value − displaced value
  std::vector<std::string> notes;
};

struct Displacement {
  std::vector<DisplacementNight> nights; ///< shoulder before, offer nights, shoulder after
  double groupValue = 0, displacedValue = 0, net = 0;
  /// The group rate per room-night at which the whole offer breaks even (other revenue and
  /// cost as offered); nullopt for an offer of no rooms.
  std::optional<double> breakEvenRate;
  double continuationShare = 0; ///< used for the shoulder nights
  bool worthIt = false;         ///< net > 0
};

/// The check from given figures. `inputs` must hold every offer night and may hold the shoulder
/// nights (the night before the first offer night, the night after the last); a shoulder night
/// without input is left out. On an offer night the displaced rooms are
///   E[min(D, L)] − E[min(D, L')]   (normalAgainstCapacity, D ~ Normal(mean, sd)).
/// A transient guest turned away on an offer night may also have wanted the shoulder night: on
/// a shoulder night the displaced rooms are (displaced rooms of the next offer night) ×
/// continuationShare × (1 − P(D ≥ L) on the shoulder night), since a room freed on a night
/// that would sell out anyway is sold to someone else. The group brings no value there.
/// Throws std::invalid_argument when an offer night has no input or the offer is empty.
Displacement evaluateDisplacement(const std::vector<OfferNight> &offer,
                                  const std::vector<DisplacementInput> &inputs,
                                  double continuationShare);

/// Share of transient room-nights whose stay goes on to the next night: Σ rooms × (nights − 1)
/// / Σ rooms × nights over transient stays (not cancelled) arriving in the 365 days up to asOf.
/// 0 when there are none.
double continuationShare(const std::vector<Reservation> &reservations, Date asOf);
/// ADR of transient finals (rooms on the books on the night itself, no block id) over nights
/// asOf − 364 … asOf; 0 when there are none.
double transientAdr(const std::vector<Reservation> &reservations, Date asOf);

/// The check from a store's data: the split forecast of the nights up to the offer's last night
/// + 1 gives each night's capacity, group rooms and transient distribution; the transient rate
/// is transientAdr() (one figure for every night). Offer nights must be after options.asOf.
/// Throws std::invalid_argument for an empty offer or a night on or before the reading date.
Displacement displacementFromData(const std::vector<Reservation> &reservations,
                                  const std::vector<BlockRecord> &blocks, const Property &property,
                                  const CensorSources &sources,
                                  const std::vector<EventNote> &events,
                                  const std::vector<OfferNight> &offer, OutlookOptions options);

} // namespace cb
