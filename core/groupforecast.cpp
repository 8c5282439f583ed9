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
  const Outlook transient =
      computeOutlook(transientRows(reservations), property, sources, events, options);
  const GroupModel model(blocks, reservations);
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
    double expected = 0;
    for (std::size_t i = 0; i < then.blocks().size(); ++i) {
      const GroupBlock &b = then.blocks()[i].block;
      if (b.arrival <= s && s < b.departure)
        expected += then.expected(i, s, t, tentativeProbability).expected;
    }
    for (const auto &r : groupRows)
      if (!knownIds.count(r.blockId) && r.onBooks(s, t))
        expected += r.rooms;
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
  }
  return bt;
}

} // namespace cb
