// The group model: blocks, what has been picked up from them (reservations carrying the block's
// id), wash measured by lead time from past blocks, and the expected group rooms of a night.
#pragma once

#include "core/blockrecord.h"

#include <cstdint>
#include <map>
#include <optional>
#include <string>
#include <tuple>
#include <vector>

namespace cb {

/// Wash at one lead: of the block rooms not yet picked up `lead` days before arrival, the share
/// that never became stays. Measured over past blocks (every night before the reading date),
/// night by night, with each night's rooms capped at the block size:
///   remaining = Σ max(0, block − min(OTB at lead, block))
///   later     = Σ max(0, min(final, block) − min(OTB at lead, block))
///   wash      = 1 − later / remaining
/// where final is the block's rooms on the books on the night itself (no-shows count, as for any
/// final). A block counts at a lead only when it had been contracted by then (an unknown contract
/// date counts at every lead).
struct WashEstimate {
  int lead = 0;
  std::string segment;        ///< the segment asked for
  bool pooled = false;        ///< too few blocks of the segment: measured over all segments
  int blocks = 0;             ///< past blocks behind the figure
  double remaining = 0;       ///< block room-nights not picked up at the lead
  double later = 0;           ///< of those, picked up later and stayed
  std::optional<double> wash; ///< nullopt when remaining is 0 (nothing to measure)
};

/// One block's figures for one night at a reading date.
struct BlockNight {
  Date night;
  int blocked = 0;     ///< rooms per night of the block
  int pickedUp = 0;    ///< block rooms on the books for the night at the reading date
  double expected = 0; ///< expected final group rooms of this block on this night
};

class GroupModel {
public:
  /// A segment with fewer past blocks than this at a lead borrows the all-segment wash (our
  /// choice, no source: a ratio over fewer blocks swings with one group).
  static constexpr int kMinBlocks = 5;

  /// `reservations` may hold transient rows too: only those with a block id are kept. A block
  /// id without a block (an orphan) is group business all the same (picked up, no block left).
  GroupModel(std::vector<BlockRecord> blocks, const std::vector<Reservation> &reservations);

  const std::vector<BlockRecord> &blocks() const { return blocks_; }

  /// Rooms of block `i` on the books for `night` as of reading date t.
  int pickedUp(std::size_t i, Date night, Date t) const;
  /// Final rooms of block i on `night` (on the books on the night itself).
  int final(std::size_t i, Date night) const { return pickedUp(i, night, night); }

  /// Wash at `lead` days before arrival, measured at reading date asOf from blocks whose
  /// departure is on or before asOf. Empty segment = all segments.
  WashEstimate wash(const std::string &segment, int lead, Date asOf) const;

  /// Expected final rooms of block i on `night` seen from asOf (< night): picked up +
  /// (block − picked up, not below 0) × (1 − wash at lead arrival − asOf) until the cutoff; from
  /// the cutoff on only what is picked up. Of a tentative block the part still to come counts
  /// with `tentativeProbability` (rooms already picked up are bookings and count in full). No
  /// wash history: the remaining block counts in full (wash 0).
  BlockNight expected(std::size_t i, Date night, Date asOf, double tentativeProbability) const;
  /// Sum of expected() over the blocks covering `night`, plus rooms of orphan block ids on the
  /// books. For a night on or before asOf: the group rooms that stayed (finals).
  double expectedRooms(Date night, Date asOf, double tentativeProbability) const;

  /// Share of block i's room-nights on the books at reading date t (0 for an empty block).
  double shareOnBooks(std::size_t i, Date t) const;

private:
  std::vector<BlockRecord> blocks_;
  std::map<std::string, std::size_t> index_;   ///< block id → index
  std::vector<std::vector<Reservation>> rows_; ///< per block
  std::vector<Reservation> orphans_;
  /// Wash by (segment, lead, reading date); not thread-safe, like the store.
  mutable std::map<std::tuple<std::string, int, std::int32_t>, WashEstimate> washCache_;
};

} // namespace cb
