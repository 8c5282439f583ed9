// Reference nights for the pickup methods: the past nights whose booking curves stand in for the
// curve still to come of the night being forecast (brief section 5).
#pragma once

#include "core/forecastmethod.h"

#include <string>
#include <vector>

namespace cb {

/// Picks reference nights r for a night s. Two choices:
/// - recent (default): the N = options.references most recent nights with the weekday of s, on
///   or before a latest night (the reading date t for a complete curve; t + j when only the
///   increment j days before arrival is needed, see pickup-adv);
/// - seasonal (options.seasonalReferences): the nights s − 364 + 7i, i = −k … k with
///   k = options.seasonalWeeks (same weekday, around the same night last year), those on or
///   before the latest night — all 2k + 1 of them, N is not used.
/// Only nights inside the cube (firstNight … lastNight) are returned.
/// Example: for s = Saturday 2026-06-13, latest 2026-06-01 and N = 2 the references are the
/// Saturdays 2026-05-30 and 2026-05-23.
class ReferenceNights {
public:
  /// Throws MethodError when references < 1 or seasonalWeeks is outside 0 … 26.
  explicit ReferenceNights(const MethodOptions &options);

  /// The references of `night` among the nights firstNight … min(latest, lastNight), newest
  /// first; empty when there is none.
  std::vector<Date> choose(Date night, Date latest, Date firstNight, Date lastNight) const;
  /// Plain words for descriptions, e.g. "the 8 most recent nights on the same weekday".
  std::string describe() const;

  bool seasonal() const { return seasonal_; }
  int count() const { return count_; }
  int seasonalWeeks() const { return weeks_; }

private:
  int count_;
  bool seasonal_;
  int weeks_;
};

} // namespace cb
