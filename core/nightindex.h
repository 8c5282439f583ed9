// Which reservations cover each stay night, so a screen that studies one night reads its few
// hundred bookings instead of scanning all of them (a million at a large property).
#pragma once

#include "core/reservation.h"

#include <cstdint>
#include <optional>
#include <span>
#include <vector>

namespace cb {

class NightIndex {
public:
  NightIndex() = default;
  /// Indexes `reservations` by the nights they cover (arrival <= s < departure; a day use covers
  /// none). The vector must outlive the index's use and stay unchanged: the index holds positions.
  explicit NightIndex(const std::vector<Reservation> &reservations);

  /// Positions in the indexed vector, in its order, of the reservations covering `night`; empty
  /// for a night outside the data.
  std::span<const std::uint32_t> covering(Date night) const;
  /// The first night any reservation covers (the earliest arrival of a stay); nullopt when none.
  std::optional<Date> firstNight() const {
    return start_.empty() ? std::nullopt : std::optional<Date>(first_);
  }
  /// The covering reservations themselves, copied in the vector's order (for functions that
  /// take a vector: the same result as passing them all, for this night).
  std::vector<Reservation> reservationsCovering(const std::vector<Reservation> &reservations,
                                                Date night) const;

private:
  Date first_;
  std::vector<std::uint32_t> start_; ///< night k's positions are at_[start_[k], start_[k + 1])
  std::vector<std::uint32_t> at_;
};

} // namespace cb
