// Group pickup tracking (see grouppace.h).
#include "core/grouppace.h"

#include "core/quantile.h"

#include <algorithm>
#include <cmath>

namespace cb {

TypicalPace typicalPace(const GroupModel &model, int lead, Date asOf) {
  TypicalPace p;
  p.lead = lead;
  std::vector<double> shares;
  for (std::size_t j = 0; j < model.blocks().size(); ++j) {
    const BlockRecord &br = model.blocks()[j];
    const GroupBlock &b = br.block;
    const Date at = b.arrival - lead;
    if (b.departure > asOf || b.roomsPerNight <= 0 || (br.contractedOn && *br.contractedOn > at))
      continue;
    shares.push_back(model.shareOnBooks(j, at));
  }
  p.blocks = static_cast<int>(shares.size());
  if (!shares.empty()) {
    p.median = quantileType7(shares, 0.5);
    p.lowerQuartile = quantileType7(shares, 0.25);
  }
  return p;
}

std::vector<BlockPace> trackBlocks(const GroupModel &model, Date asOf,
                                   double tentativeProbability) {
  std::vector<BlockPace> out;
  for (std::size_t i = 0; i < model.blocks().size(); ++i) {
    const GroupBlock &b = model.blocks()[i].block;
    if (b.departure <= asOf)
      continue;
    BlockPace p;
    p.block = i;
    p.lead = b.arrival - asOf;
    p.daysToCutoff = b.cutoff - asOf;
    p.blockedRoomNights = b.roomsPerNight * (b.departure - b.arrival);
    p.share = model.shareOnBooks(i, asOf);
    p.pickedRoomNights = static_cast<int>(std::lround(p.share * p.blockedRoomNights));
    for (Date n = b.arrival; n < b.departure; ++n)
      p.expectedRoomNights += model.expected(i, n, asOf, tentativeProbability).expected;
    if (p.lead > 0) {
      p.typical = typicalPace(model, p.lead, asOf);
      if (p.daysToCutoff <= 0 && p.pickedRoomNights < p.blockedRoomNights)
        p.flag = "released";
      else if (p.typical.lowerQuartile && p.share < *p.typical.lowerQuartile)
        p.flag = "well behind";
      else if (p.typical.median && p.share < *p.typical.median)
        p.flag = "behind";
    }
    out.push_back(p);
  }
  std::stable_sort(out.begin(), out.end(), [&](const BlockPace &a, const BlockPace &b) {
    return model.blocks()[a.block].block.arrival < model.blocks()[b.block].block.arrival;
  });
  return out;
}

std::vector<PacePoint> pickupCurve(const GroupModel &model, std::size_t i, Date asOf,
                                   const std::vector<int> &leads) {
  std::vector<PacePoint> out;
  const GroupBlock &b = model.blocks()[i].block;
  for (int lead : leads) {
    PacePoint p;
    p.lead = lead;
    const Date at = b.arrival - lead;
    if (at <= asOf)
      p.share = model.shareOnBooks(i, at);
    p.typical = typicalPace(model, lead, asOf);
    out.push_back(p);
  }
  return out;
}

} // namespace cb
