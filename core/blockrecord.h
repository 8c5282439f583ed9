// A group block as the store keeps it: the contract (GroupBlock) plus the contract date and
// room type, which the wash-by-lead estimate and the block import need.
#pragma once

#include "core/reservation.h"

#include <optional>
#include <string>

namespace cb {

struct BlockRecord {
  GroupBlock block;
  /// The day the block's rooms were first held. Unknown for blocks written before schema 6 or
  /// imported without the column: such a block counts in the wash measured at any lead.
  std::optional<Date> contractedOn;
  std::string roomType; ///< empty = any type
  bool operator==(const BlockRecord &) const = default;
};

/// Checks a block's own rules (id set, departure after arrival, rooms ≥ 0, cutoff on or before
/// arrival, contract on or before arrival). Returns "" when valid, else a message; `fieldOut`
/// gets the native column at fault (block_id, departure, rooms_per_night, cutoff, contracted_on).
std::string validateBlock(const BlockRecord &b, std::string *fieldOut = nullptr);

} // namespace cb
