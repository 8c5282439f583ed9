// Group / transient split of the forecast (see groupforecast.h).
#include "core/groupforecast.h"

#include "core/demandmath.h"

#include <algorithm>
#include <cmath>
#include <set>

namespace cb {

std::vector<Reservation> transientRows(const std::vector<Reservation> &reservations) {
  std::vector<Reservation> out;
  out.reserve(reservations.size());
  for (const auto &r : reservations)
    if (r.blockId.empty())
      out.push_back(r);
  return out;
}

Property transientProperty(const Property &property, const GroupModel &model,
                           const std::vector<Reservation> &reservations, Date asOf) {
  Property p = property;
  if (reservations.empty())
    return p;
  Date first = asOf;
  for (const auto &r : reservations)
    first = std::min(first, r.arrival);
  bool changed = false; // the night before carries a group change
  for (Date s = first; s <= asOf; ++s) {
    const double group = model.expectedRooms(s, asOf, 1.0);
    if (group <= 0 && !changed)
      continue;
    const int full = property.capacityOn(s);
    p.capacityChanges.push_back(
        {s, std::max(0, full - static_cast<int>(std::lround(group))), "group rooms"});
    changed = group > 0;
  }
  if (changed)
    p.capacityChanges.push_back({asOf + 1, property.capacityOn(asOf + 1), "group rooms"});
  return p;
}

void fillSplitCapacity(SplitNight &n) {
  n.capacityLeft = std::max(0.0, n.capacity - n.group);
  n.total = n.group + n.transient;
  if (n.lo)
    n.totalLo = n.group + *n.lo;
  if (n.hi)
    n.totalHi = n.group + *n.hi;
  const double groupSold = std::min(n.group, static_cast<double>(n.capacity));
  if (n.capacityLeft <= 0) {
    n.transientConstrained = 0;
    n.transientSpill = n.transient;
    n.pSellout = 1;
  } else {
    const CapacityOutcome o = normalAgainstCapacity(n.transient, n.transientSd, n.capacityLeft);
    n.transientConstrained = o.sales;
    n.transientSpill = o.spill;
    n.pSellout = o.pFull;
  }
  n.constrainedTotal = groupSold + n.transientConstrained;
}

SplitForecast computeSplitForecast(const std::vector<Reservation> &reservations,
                                   const std::vector<BlockRecord> &blocks, const Property &property,
                                   const CensorSources &sources,
                                   const std::vector<EventNote> &events,
                                   const OutlookOptions &options) {
  const GroupModel model(blocks, reservations);
  const Outlook transient = computeOutlook(
      transientRows(reservations), transientProperty(property, model, reservations, options.asOf),
      sources, events, options);
  SplitForecast out;
  out.asOf = options.asOf;
  out.method = transient.method;
  out.tentativeProbability = property.settings.tentativeProbability;
  for (const OutlookNight &t : transient.nights) {
    SplitNight n;
    n.night = t.night;
    n.lead = t.lead;
    n.capacity = t.capacity;
    for (std::size_t i = 0; i < model.blocks().size(); ++i) {
      const GroupBlock &b = model.blocks()[i].block;
      if (b.arrival <= t.night && t.night < b.departure) {
        n.groupBlocked += b.roomsPerNight;
        n.groupOtb += model.pickedUp(i, t.night, options.asOf);
      }
    }
    n.group = model.expectedRooms(t.night, options.asOf, out.tentativeProbability);
    n.transientOtb = t.otb;
    n.transient = t.forecast;
    n.lo = t.lo;
    n.hi = t.hi;
    n.transientSd = t.sd;
    n.transientAdr = t.adr;
    fillSplitCapacity(n);
    out.nights.push_back(n);
  }
  return out;
}

GroupBacktest backtestGroups(const std::vector<Reservation> &reservations,
                             const std::vector<BlockRecord> &blocks, Date from, Date to, int lead,
                             double tentativeProbability) {
  GroupBacktest bt;
  bt.lead = lead;
  const GroupModel all(blocks, reservations);
  std::vector<Reservation> groupRows;
  for (const auto &r : reservations)
    if (!r.blockId.empty())
      groupRows.push_back(r);
  double absSum = 0, sum = 0, actualSum = 0, expectedSum = 0;
  for (Date s = from; s <= to; ++s) {
    const Date t = s - lead;
    // Only blocks contracted by the reading date were known then; rooms already on the books at
    // t under any other block id count as picked-up group rooms (as orphans do).
    std::vector<BlockRecord> known;
    for (const auto &b : blocks)
      if (!b.contractedOn || *b.contractedOn <= t)
        known.push_back(b);
    std::set<std::string> knownIds;
    for (const auto &b : known)
      knownIds.insert(b.block.id);
    const GroupModel then(known, groupRows);
    const double actual = all.expectedRooms(s, s, tentativeProbability);
    double expected = 0, whole = 0, picked = 0;
    for (std::size_t i = 0; i < then.blocks().size(); ++i) {
      const GroupBlock &b = then.blocks()[i].block;
      if (b.arrival <= s && s < b.departure) {
        const BlockNight bn = then.expected(i, s, t, tentativeProbability);
        expected += bn.expected;
        picked += bn.pickedUp;
        const double weight = b.status == BlockStatus::Tentative ? tentativeProbability : 1.0;
        whole += bn.pickedUp +
                 (t < b.cutoff ? weight * std::max(0, b.roomsPerNight - bn.pickedUp) : 0.0);
      }
    }
    for (const auto &r : groupRows)
      if (!knownIds.count(r.blockId) && r.onBooks(s, t)) {
        expected += r.rooms;
        whole += r.rooms;
        picked += r.rooms;
      }
    bt.maeWholeBlock += std::abs(whole - actual);
    bt.biasWholeBlock += whole - actual;
    bt.maePickedUp += std::abs(picked - actual);
    bt.biasPickedUp += picked - actual;
    ++bt.nights;
    absSum += std::abs(expected - actual);
    sum += expected - actual;
    actualSum += actual;
    expectedSum += expected;
  }
  if (bt.nights > 0) {
    bt.mae = absSum / bt.nights;
    bt.bias = sum / bt.nights;
    bt.meanActual = actualSum / bt.nights;
    bt.meanExpected = expectedSum / bt.nights;
    bt.maeWholeBlock /= bt.nights;
    bt.biasWholeBlock /= bt.nights;
    bt.maePickedUp /= bt.nights;
    bt.biasPickedUp /= bt.nights;
  }
  return bt;
}

} // namespace cb
