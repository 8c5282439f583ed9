#include "core/nightindex.h"

#include <algorithm>
#include <stdexcept>

namespace cb {

// Compressed rows (one count pass, one fill pass): two flat arrays instead of a vector per night.
NightIndex::NightIndex(const std::vector<Reservation> &reservations) {
  if (reservations.size() >= UINT32_MAX)
    throw std::length_error("NightIndex: more than 4 billion reservations");
  bool any = false;
  Date last;
  for (const auto &r : reservations) {
    if (r.isDayUse() || r.nights() < 0)
      continue;
    if (!any || r.arrival < first_)
      first_ = r.arrival;
    if (!any || r.departure - 1 > last)
      last = r.departure - 1;
    any = true;
  }
  if (!any)
    return;
  const auto nights = static_cast<std::size_t>(last - first_ + 1);
  start_.assign(nights + 1, 0);
  for (const auto &r : reservations)
    for (Date s = r.arrival; s < r.departure; ++s)
      ++start_[static_cast<std::size_t>(s - first_) + 1];
  for (std::size_t k = 1; k <= nights; ++k)
    start_[k] += start_[k - 1];
  at_.resize(start_[nights]);
  std::vector<std::uint32_t> next(start_.begin(), start_.end() - 1);
  for (std::size_t i = 0; i < reservations.size(); ++i) {
    const Reservation &r = reservations[i];
    for (Date s = r.arrival; s < r.departure; ++s)
      at_[next[static_cast<std::size_t>(s - first_)]++] = static_cast<std::uint32_t>(i);
  }
}

std::span<const std::uint32_t> NightIndex::covering(Date night) const {
  if (start_.empty() || night < first_ || night - first_ >= static_cast<int>(start_.size()) - 1)
    return {};
  const auto k = static_cast<std::size_t>(night - first_);
  return {at_.data() + start_[k], at_.data() + start_[k + 1]};
}

std::vector<Reservation>
NightIndex::reservationsCovering(const std::vector<Reservation> &reservations, Date night) const {
  std::vector<Reservation> out;
  const auto positions = covering(night);
  out.reserve(positions.size());
  for (std::uint32_t i : positions)
    out.push_back(reservations[i]);
  return out;
}

} // namespace cb
