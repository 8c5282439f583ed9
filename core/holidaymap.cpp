#include "core/holidaymap.h"

#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <cstdlib>
#include <stdexcept>
#include <string>

namespace cb {
namespace {

std::string labelKey(const std::string &label) {
  auto begin = label.find_first_not_of(" \t");
  if (begin == std::string::npos)
    return {};
  auto end = label.find_last_not_of(" \t");
  std::string key = label.substr(begin, end - begin + 1);
  for (char &c : key)
    c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return key;
}

} // namespace

HolidayMap HolidayMap::fromEvents(const std::vector<EventNote> &events) {
  HolidayMap map;
  for (const auto &e : events) {
    if (e.to < e.from)
      continue;
    const std::string key = labelKey(e.label);
    const EventNote *match = nullptr;
    for (const auto &prev : events) {
      if (prev.to < prev.from || prev.from.year() != e.from.year() - 1 ||
          labelKey(prev.label) != key)
        continue;
      const Date aim = e.from - 364;
      if (!match || std::abs(prev.from - aim) < std::abs(match->from - aim))
        match = &prev;
    }
    if (!match)
      continue;
    const int lastNight = match->to - match->from;
    for (int k = 0; k <= e.to - e.from; ++k)
      map.eventPairs_.emplace(e.from + k, match->from + std::min(k, lastNight)); // first wins
  }
  return map;
}

void HolidayMap::addPair(Date night, Date lastYearNight) {
  if (!(lastYearNight < night))
    throw std::invalid_argument(fmt::format("night {} cannot compare with {}: the reference must "
                                            "be an earlier night",
                                            night.toIso(), lastYearNight.toIso()));
  userPairs_[night] = lastYearNight;
}

std::optional<Date> HolidayMap::lastYearNight(Date night) const {
  if (auto it = userPairs_.find(night); it != userPairs_.end())
    return it->second;
  if (auto it = eventPairs_.find(night); it != eventPairs_.end())
    return it->second;
  return std::nullopt;
}

Date HolidayMap::referenceNight(const Property &property, Date night) const {
  return lastYearNight(night).value_or(property.stlyNight(night));
}

std::map<Date, Date> HolidayMap::pairs() const {
  std::map<Date, Date> all = userPairs_;
  all.insert(eventPairs_.begin(), eventPairs_.end()); // keeps the explicit pair on a clash
  return all;
}

} // namespace cb
