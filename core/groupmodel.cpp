// The group model (see groupmodel.h): pickup from a block's reservations, wash by lead from
// past blocks, expected group rooms of a night.
#include "core/groupmodel.h"

#include <algorithm>

namespace cb {

GroupModel::GroupModel(std::vector<BlockRecord> blocks,
                       const std::vector<Reservation> &reservations)
    : blocks_(std::move(blocks)), rows_(blocks_.size()) {
  for (std::size_t i = 0; i < blocks_.size(); ++i)
    index_[blocks_[i].block.id] = i;
  for (const auto &r : reservations) {
    if (r.blockId.empty())
      continue;
    auto it = index_.find(r.blockId);
    if (it == index_.end())
      orphans_.push_back(r);
    else
      rows_[it->second].push_back(r);
  }
}

int GroupModel::pickedUp(std::size_t i, Date night, Date t) const {
  int rooms = 0;
  for (const auto &r : rows_[i])
    if (r.onBooks(night, t))
      rooms += r.rooms;
  return rooms;
}

WashEstimate GroupModel::wash(const std::string &segment, int lead, Date asOf) const {
  const auto key = std::make_tuple(segment, lead, asOf.days());
  if (auto it = washCache_.find(key); it != washCache_.end())
    return it->second;
  auto measure = [&](bool anySegment) {
    WashEstimate w;
    w.lead = lead;
    w.segment = segment;
    w.pooled = anySegment && !segment.empty();
    for (std::size_t i = 0; i < blocks_.size(); ++i) {
      const BlockRecord &br = blocks_[i];
      const GroupBlock &b = br.block;
      if (b.departure > asOf || (!anySegment && b.segment != segment))
        continue;
      const Date at = b.arrival - lead;
      if (br.contractedOn && *br.contractedOn > at)
        continue; // not contracted yet at this lead
      ++w.blocks;
      for (Date n = b.arrival; n < b.departure; ++n) {
        const int held = std::min(pickedUp(i, n, at), b.roomsPerNight);
        const int stayed = std::min(final(i, n), b.roomsPerNight);
        w.remaining += b.roomsPerNight - held;
        w.later += std::max(0, stayed - held);
      }
    }
    if (w.remaining > 0)
      w.wash = 1.0 - w.later / w.remaining;
    return w;
  };
  WashEstimate w = measure(segment.empty());
  if (!segment.empty() && w.blocks < kMinBlocks)
    w = measure(true);
  washCache_.emplace(key, w);
  return w;
}

BlockNight GroupModel::expected(std::size_t i, Date night, Date asOf,
                                double tentativeProbability) const {
  const BlockRecord &br = blocks_[i];
  const GroupBlock &b = br.block;
  BlockNight out;
  out.night = night;
  out.blocked = b.roomsPerNight;
  if (night <= asOf) {
    out.pickedUp = final(i, night);
    out.expected = out.pickedUp;
    return out;
  }
  out.pickedUp = pickedUp(i, night, asOf);
  out.expected = out.pickedUp;
  if (asOf >= b.cutoff)
    return out; // released: only what is picked up
  const double remaining = std::max(0, b.roomsPerNight - out.pickedUp);
  const WashEstimate w = wash(b.segment, b.arrival - asOf, asOf);
  const double keep = 1.0 - w.wash.value_or(0.0);
  const double weight = b.status == BlockStatus::Tentative ? tentativeProbability : 1.0;
  out.expected += weight * remaining * keep;
  return out;
}

double GroupModel::expectedRooms(Date night, Date asOf, double tentativeProbability) const {
  double rooms = 0;
  for (std::size_t i = 0; i < blocks_.size(); ++i) {
    const GroupBlock &b = blocks_[i].block;
    if (b.arrival <= night && night < b.departure)
      rooms += expected(i, night, asOf, tentativeProbability).expected;
  }
  const Date t = std::min(night, asOf);
  for (const auto &r : orphans_)
    if (r.onBooks(night, t))
      rooms += r.rooms;
  return rooms;
}

double GroupModel::shareOnBooks(std::size_t i, Date t) const {
  const GroupBlock &b = blocks_[i].block;
  const int total = b.roomsPerNight * (b.departure - b.arrival);
  if (total <= 0)
    return 0;
  int picked = 0;
  for (Date n = b.arrival; n < b.departure; ++n)
    picked += std::min(pickedUp(i, n, std::min(t, n)), b.roomsPerNight);
  return static_cast<double>(picked) / total;
}

} // namespace cb
