#include "core/referencenights.h"

#include <algorithm>

namespace cb {

ReferenceNights::ReferenceNights(const MethodOptions &options)
    : count_(options.references), seasonal_(options.seasonalReferences),
      weeks_(options.seasonalWeeks) {
  if (count_ < 1)
    throw MethodError("the number of reference nights must be at least 1 (got " +
                      std::to_string(count_) + ")");
  // Half a year either side would reach the nights of the other season: no longer seasonal.
  if (weeks_ < 0 || weeks_ > 26)
    throw MethodError("seasonal reference weeks must be between 0 and 26 (got " +
                      std::to_string(weeks_) + ")");
}

std::vector<Date> ReferenceNights::choose(Date night, Date latest, Date firstNight,
                                          Date lastNight) const {
  std::vector<Date> out;
  const Date last = std::min(latest, lastNight);
  if (seasonal_) {
    // 364 days = 52 weeks, so the window keeps the weekday of s (brief section 4, STLY).
    for (int i = weeks_; i >= -weeks_; --i) {
      const Date r = night - 364 + 7 * i;
      if (r >= firstNight && r <= last)
        out.push_back(r);
    }
    return out;
  }
  if (last < firstNight)
    return out;
  // The newest night on or before `last` with the weekday of s; then step back a week at a time.
  const int back = ((last - night) % 7 + 7) % 7;
  for (Date r = last - back; r >= firstNight && static_cast<int>(out.size()) < count_; r = r - 7)
    out.push_back(r);
  return out;
}

std::string ReferenceNights::describe() const {
  if (seasonal_)
    return "the nights on the same weekday within " + std::to_string(weeks_) +
           " weeks of the same night last year (364 days earlier)";
  return "the " + std::to_string(count_) + " most recent nights on the same weekday";
}

} // namespace cb
