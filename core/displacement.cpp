// Displacement check of a group offer (see displacement.h).
#include "core/displacement.h"

#include "core/demandmath.h"

#include <fmt/format.h>

#include <algorithm>
#include <map>
#include <stdexcept>

namespace cb {
namespace {

double salesAgainst(const DisplacementInput &in, double capacity) {
  if (capacity <= 0)
    return 0;
  return normalAgainstCapacity(in.transientMean, in.transientSd, capacity).sales;
}

} // namespace

Displacement evaluateDisplacement(const std::vector<OfferNight> &offer,
                                  const std::vector<DisplacementInput> &inputs,
                                  double continuationShare) {
  if (offer.empty())
    throw std::invalid_argument("the offer has no nights");
  std::map<Date, DisplacementInput> byNight;
  for (const auto &in : inputs)
    byNight[in.night] = in;
  std::map<Date, OfferNight> offered;
  for (const auto &o : offer)
    offered[o.night] = o;
  Displacement out;
  out.continuationShare = continuationShare;
  auto base = [&](Date night) {
    auto it = byNight.find(night);
    if (it == byNight.end())
      return std::optional<DisplacementNight>();
    DisplacementNight n;
    n.night = night;
    n.input = it->second;
    n.capacityLeft = std::max(0.0, n.input.capacity - n.input.groupRooms);
    n.leftWithOffer = n.capacityLeft;
    return std::optional<DisplacementNight>(n);
  };
  std::map<Date, DisplacementNight> nights;
  for (const auto &[night, o] : offered) {
    auto n = base(night);
    if (!n)
      throw std::invalid_argument(
          fmt::format("no forecast for {}, a night of the offer", night.toIso()));
    n->offer = o;
    n->leftWithOffer = std::max(0.0, n->capacityLeft - o.rooms);
    n->displacedRooms =
        salesAgainst(n->input, n->capacityLeft) - salesAgainst(n->input, n->leftWithOffer);
    n->groupValue = o.rooms * (o.rate + o.otherRevenue - o.cost);
    if (o.rooms > n->capacityLeft)
      n->notes.push_back(fmt::format("the offer needs {} rooms but {:.1f} are left after groups",
                                     o.rooms, n->capacityLeft));
    if (n->leftWithOffer < n->input.transientOtb)
      n->notes.push_back(fmt::format("{} transient rooms are already on the books: taking the "
                                     "offer means overbooking",
                                     n->input.transientOtb));
    nights[night] = *n;
  }
  const Date first = offered.begin()->first;
  const Date last = offered.rbegin()->first;
  auto shoulder = [&](Date night, Date neighbour) {
    if (offered.count(night))
      return;
    auto n = base(night);
    if (!n)
      return;
    n->shoulder = true;
    n->offer.night = night;
    const double pFull =
        n->capacityLeft <= 0
            ? 1.0
            : normalAgainstCapacity(n->input.transientMean, n->input.transientSd, n->capacityLeft)
                  .pFull;
    n->displacedRooms = nights[neighbour].displacedRooms * continuationShare * (1.0 - pFull);
    nights[night] = *n;
  };
  shoulder(first - 1, first);
  shoulder(last + 1, last);
  double offerRooms = 0, offerExtras = 0;
  for (auto &[night, n] : nights) {
    n.displacedValue = n.displacedRooms * n.input.transientRate;
    n.net = n.groupValue - n.displacedValue;
    out.groupValue += n.groupValue;
    out.displacedValue += n.displacedValue;
    offerRooms += n.offer.rooms;
    offerExtras += n.offer.rooms * (n.offer.otherRevenue - n.offer.cost);
    out.nights.push_back(n);
  }
  out.net = out.groupValue - out.displacedValue;
  out.worthIt = out.net > 0;
  if (offerRooms > 0)
    out.breakEvenRate = (out.displacedValue - offerExtras) / offerRooms;
  return out;
}

double continuationShare(const std::vector<Reservation> &reservations, Date asOf) {
  double continued = 0, roomNights = 0;
  for (const auto &r : reservations) {
    if (!r.blockId.empty() || r.status == ReservationStatus::Cancelled || r.nights() <= 0 ||
        r.arrival > asOf || r.arrival <= asOf - 365)
      continue;
    continued += static_cast<double>(r.rooms) * (r.nights() - 1);
    roomNights += static_cast<double>(r.rooms) * r.nights();
  }
  return roomNights > 0 ? continued / roomNights : 0.0;
}

double transientAdr(const std::vector<Reservation> &reservations, Date asOf) {
  double revenue = 0, rooms = 0;
  const Date from = asOf - 364;
  for (const auto &r : reservations) {
    if (!r.blockId.empty() || r.departure <= from || r.arrival > asOf)
      continue;
    for (Date s = std::max(r.arrival, from); s < r.departure && s <= asOf; ++s)
      if (r.onBooks(s, s)) {
        revenue += r.rate * r.rooms;
        rooms += r.rooms;
      }
  }
  return rooms > 0 ? revenue / rooms : 0.0;
}

Displacement displacementFromData(const std::vector<Reservation> &reservations,
                                  const std::vector<BlockRecord> &blocks, const Property &property,
                                  const CensorSources &sources,
                                  const std::vector<EventNote> &events,
                                  const std::vector<OfferNight> &offer, OutlookOptions options) {
  if (offer.empty())
    throw std::invalid_argument("the offer has no nights");
  Date last = offer.front().night;
  for (const auto &o : offer) {
    if (o.night <= options.asOf)
      throw std::invalid_argument(fmt::format("offer night {} is not after the reading date {}",
                                              o.night.toIso(), options.asOf.toIso()));
    last = std::max(last, o.night);
  }
  options.days = (last + 1) - options.asOf;
  const SplitForecast split =
      computeSplitForecast(reservations, blocks, property, sources, events, options);
  const double rate = transientAdr(reservations, options.asOf);
  std::vector<DisplacementInput> inputs;
  for (const SplitNight &n : split.nights)
    inputs.push_back(
        {n.night, n.capacity, n.group, n.transient, n.transientSd, rate, n.transientOtb});
  return evaluateDisplacement(offer, inputs, continuationShare(reservations, options.asOf));
}

} // namespace cb
