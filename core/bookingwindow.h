// Booking-window statistics: how far ahead each segment books, and what it pays by lead time.
#pragma once

#include "core/curvecube.h"
#include "core/reservation.h"

#include <array>
#include <cstdint>
#include <optional>
#include <string>
#include <vector>

namespace cb {

/// Lead-time buckets in days: 0, 1–3, 4–7, 8–14, 15–30, 31–60, 61–90, 91–180, 181+
/// (common practice, no source).
struct LeadBucket {
  int firstDay;
  int lastDay; ///< inclusive; -1 = open-ended
  const char *label;
};
inline constexpr std::array<LeadBucket, 9> kLeadBuckets = {{{0, 0, "0"},
                                                            {1, 3, "1-3"},
                                                            {4, 7, "4-7"},
                                                            {8, 14, "8-14"},
                                                            {15, 30, "15-30"},
                                                            {31, 60, "31-60"},
                                                            {61, 90, "61-90"},
                                                            {91, 180, "91-180"},
                                                            {181, -1, "181+"}}};
/// Index into kLeadBuckets of a lead of `days` (≥ 0).
std::size_t leadBucketOf(int days);

struct BookingWindowOptions {
  Date asOf;         ///< bookings made on or before this date and not cancelled by it
  Date firstArrival; ///< arrivals firstArrival … lastArrival (inclusive)
  Date lastArrival;
  SeriesBy by = SeriesBy::Segment;
  std::vector<double> probabilities = {0.25, 0.5, 0.75, 0.9};
};

/// One series' booking window over the arrivals chosen.
struct BookingWindowStats {
  std::string series;
  std::int64_t roomNights = 0; ///< weight of every figure below: rooms × nights
  /// Room-nights per bucket of kLeadBuckets.
  std::array<std::int64_t, kLeadBuckets.size()> histogram{};
  /// Average rate per room-night per bucket: Σ rate × rooms × nights / Σ rooms × nights;
  /// nullopt for an empty bucket.
  std::array<std::optional<double>, kLeadBuckets.size()> averageRate{};
  /// Type-7 quantiles of lead (days) over room-nights, one per options.probabilities; empty when
  /// roomNights is 0.
  std::vector<double> leadQuantiles;
};

/// Lead = arrival − booked_on, weighted by rooms × nights. Bookings cancelled on or before asOf
/// are left out (they never became stays), and day uses weigh nothing. Rates are taken as they
/// are: every row is assumed to be in the property's currency. Returns "ALL" first, then one
/// entry per code of the split among rows booked on or before asOf (the series of CurveCube),
/// so a segment with no arrivals in the range shows as zero rather than missing.
/// Throws AsOfError when asOf is after the newest booking or cancellation, std::invalid_argument
/// when the arrival range is empty or a probability is outside [0, 1].
std::vector<BookingWindowStats> bookingWindow(const std::vector<Reservation> &reservations,
                                              const BookingWindowOptions &options);

} // namespace cb
