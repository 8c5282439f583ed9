// Rules every group block must satisfy, whatever file it came from.
#include "core/blockrecord.h"

#include <fmt/format.h>

namespace cb {

std::string validateBlock(const BlockRecord &r, std::string *fieldOut) {
  const GroupBlock &b = r.block;
  auto fail = [&](const char *field, std::string message) {
    if (fieldOut)
      *fieldOut = field;
    return message;
  };
  if (b.id.empty())
    return fail("block_id", "block_id is empty");
  if (b.departure <= b.arrival)
    return fail("departure", fmt::format("departure {} is not after arrival {}",
                                         b.departure.toIso(), b.arrival.toIso()));
  if (b.roomsPerNight < 0)
    return fail("rooms_per_night",
                fmt::format("rooms_per_night is negative ({})", b.roomsPerNight));
  if (b.cutoff > b.arrival)
    return fail("cutoff",
                fmt::format("cutoff {} is after arrival {}", b.cutoff.toIso(), b.arrival.toIso()));
  if (r.contractedOn && *r.contractedOn > b.arrival)
    return fail("contracted_on", fmt::format("contracted_on {} is after arrival {}",
                                             r.contractedOn->toIso(), b.arrival.toIso()));
  return {};
}

} // namespace cb
