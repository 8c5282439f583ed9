// Which night last year a night compares with when a holiday or event moves between years.
#pragma once

#include "core/reservation.h"

#include <map>
#include <optional>
#include <vector>

namespace cb {

/// Pairs nights of this year with the nights last year they compare with, so a moving holiday or
/// event (a fair that starts on another date each year) is paced against its own dates, not
/// against whatever fell 364 days earlier. Nights without a pair use Property::stlyNight.
///
/// Rule of fromEvents():
/// - Two events are the same event when their labels match, ignoring case and surrounding spaces.
/// - An event E whose first night falls in calendar year Y matches the same-label event whose
///   first night falls in Y − 1; when several do, the one starting nearest to E.from − 364 days.
///   Events with no match (new this year, or skipped last year) add no pairs.
/// - Night k of E (k = 0 on E.from) maps to night min(k, n' − 1) of the match, n' being the
///   match's length in nights: a longer event this year compares its extra nights with last
///   year's final event night; a shorter one leaves last year's extra nights unused.
/// - A night covered by several events takes the pair of the event listed first (the store lists
///   events by first day).
/// Explicit pairs (addPair) take precedence over pairs derived from events.
///
/// Example: "Boat Fair" 2025-03-12…15 and 2026-03-18…21 pair 2026-03-18 with 2025-03-12, …,
/// 2026-03-21 with 2025-03-15.
class HolidayMap {
public:
  static HolidayMap fromEvents(const std::vector<EventNote> &events);

  /// A user's pair: `night` compares with `lastYearNight`. Throws std::invalid_argument unless
  /// lastYearNight is before night (a reference must be a night whose curve is in the past).
  void addPair(Date night, Date lastYearNight);

  /// The paired night, or nullopt when the night follows the property's STLY alignment.
  std::optional<Date> lastYearNight(Date night) const;
  /// The night last year that `night` compares with: its pair, else property.stlyNight(night).
  Date referenceNight(const Property &property, Date night) const;

  /// Every pair in force (explicit pairs over event pairs), by this year's night.
  std::map<Date, Date> pairs() const;
  bool empty() const { return eventPairs_.empty() && userPairs_.empty(); }

private:
  std::map<Date, Date> eventPairs_;
  std::map<Date, Date> userPairs_;
};

} // namespace cb
