// Group pickup tracking (issue 7): each block's pickup (share of its room-nights on the books)
// against its size and cutoff, compared with the hotel's typical pace at the same lead — the
// median share past blocks had on the books that many days before their arrival.
#pragma once

#include "core/groupmodel.h"

#include <optional>
#include <string>
#include <vector>

namespace cb {

/// Share on the books `lead` days before arrival over past blocks (departed by asOf, contracted
/// by arrival − lead, at least one room-night): median and lower quartile (type 7).
struct TypicalPace {
  int lead = 0;
  int blocks = 0;
  std::optional<double> median, lowerQuartile;
};
TypicalPace typicalPace(const GroupModel &model, int lead, Date asOf);

/// One block seen from asOf.
struct BlockPace {
  std::size_t block = 0; ///< index into model.blocks()
  int lead = 0;          ///< days from asOf to arrival
  int daysToCutoff = 0;  ///< negative after the cutoff
  int blockedRoomNights = 0;
  int pickedRoomNights = 0; ///< on the books, each night capped at the block size
  double share = 0;         ///< picked / blocked
  double expectedRoomNights = 0;
  TypicalPace typical;
  /// "behind" (share below the typical median), "well behind" (below the lower quartile),
  /// "released" (cutoff passed with rooms not picked up), or empty.
  std::string flag;
};

/// Every block that has not yet departed by asOf (arrival after asOf, or in house), by arrival.
std::vector<BlockPace> trackBlocks(const GroupModel &model, Date asOf, double tentativeProbability);

/// The pickup curve of block i: its share on the books `lead` days before arrival for each of
/// `leads` not earlier than asOf (nullopt after asOf), with the typical pace at that lead.
struct PacePoint {
  int lead = 0;
  std::optional<double> share;
  TypicalPace typical;
};
std::vector<PacePoint> pickupCurve(const GroupModel &model, std::size_t i, Date asOf,
                                   const std::vector<int> &leads);

} // namespace cb
