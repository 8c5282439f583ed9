#include "core/comparablenights.h"

#include "core/quantile.h"

#include <fmt/format.h>

#include <algorithm>
#include <array>
#include <stdexcept>

namespace cb {
namespace {

void checkOptions(const ComparableOptions &o) {
  if (o.weeks < 0)
    throw std::invalid_argument(fmt::format("weeks must be 0 or more, not {}", o.weeks));
  if (o.maxDba < 0)
    throw std::invalid_argument(fmt::format("max days before arrival must be 0 or more"));
  for (double p : {o.lowProbability, o.highProbability})
    if (!(p >= 0.0 && p <= 1.0))
      throw std::invalid_argument(fmt::format("quantile probability {} is not in [0, 1]", p));
}

bool inEvent(Date d, const std::vector<EventNote> &events) {
  return std::any_of(events.begin(), events.end(),
                     [&](const EventNote &e) { return e.from <= d && d <= e.to; });
}

} // namespace

std::vector<Date> ComparableNights::select(Date night, Date asOf, const Property &property,
                                           const HolidayMap &holidays,
                                           const std::vector<EventNote> &events,
                                           const ComparableOptions &options) {
  checkOptions(options);
  // Last year's anchor, moved by −3 … +3 days onto the night's weekday (a calendar-date or
  // holiday pair can land on another weekday).
  const Date anchor = holidays.referenceNight(property, night);
  int shift =
      (static_cast<int>(night.isoWeekday()) - static_cast<int>(anchor.isoWeekday()) + 7) % 7;
  if (shift > 3)
    shift -= 7;
  const Date lastYear = anchor + shift;

  std::vector<Date> refs;
  auto consider = [&](Date r) {
    if (r != night && r <= asOf && !(options.excludeEvents && inEvent(r, events)))
      refs.push_back(r);
  };
  for (int k = -options.weeks; k <= options.weeks; ++k) {
    if (k != 0)
      consider(night + 7 * k);
    consider(lastYear + 7 * k);
  }
  std::sort(refs.begin(), refs.end());
  refs.erase(std::unique(refs.begin(), refs.end()), refs.end());
  return refs;
}

ComparableNights ComparableNights::fromCube(const CurveCube &cube, std::size_t series, Date night,
                                            const Property &property, const HolidayMap &holidays,
                                            const std::vector<EventNote> &events,
                                            const ComparableOptions &options) {
  ComparableNights c;
  c.night_ = night;
  c.references_ = select(night, cube.asOf(), property, holidays, events, options);
  const std::array<double, 3> probs = {options.lowProbability, 0.5, options.highProbability};
  std::vector<int> finals;
  for (Date r : c.references_)
    finals.push_back(cube.otbRooms(series, r, 0)); // r ≤ asOf, so this is Final(r)
  for (int d = 0; d <= options.maxDba; ++d) {
    BandPoint b;
    b.dba = d;
    std::vector<double> rooms, pct;
    for (std::size_t i = 0; i < c.references_.size(); ++i) {
      const int otb = cube.otbRooms(series, c.references_[i], d);
      rooms.push_back(otb);
      if (finals[i] > 0)
        pct.push_back(100.0 * otb / finals[i]);
    }
    b.count = static_cast<int>(rooms.size());
    b.countPct = static_cast<int>(pct.size());
    if (!rooms.empty()) {
      auto q = quantilesType7(std::move(rooms), probs);
      b.low = q[0];
      b.median = q[1];
      b.high = q[2];
    }
    if (!pct.empty()) {
      auto q = quantilesType7(std::move(pct), probs);
      b.lowPct = q[0];
      b.medianPct = q[1];
      b.highPct = q[2];
    }
    c.band_.push_back(b);
  }
  return c;
}

ComparableNights ComparableNights::build(const std::vector<Reservation> &reservations, Date night,
                                         Date asOf, const Property &property,
                                         const HolidayMap &holidays,
                                         const std::vector<EventNote> &events,
                                         const ComparableOptions &options, SeriesBy by,
                                         const std::string &series) {
  const auto refs = select(night, asOf, property, holidays, events, options);
  CubeOptions co;
  co.firstNight = refs.empty() ? night : refs.front();
  co.lastNight = refs.empty() ? night : refs.back();
  co.maxDba = options.maxDba;
  co.by = by;
  co.asOf = asOf;
  CurveCube cube = CurveCube::build(reservations, co);
  if (auto idx = cube.seriesIndex(series))
    return fromCube(cube, *idx, night, property, holidays, events, options);
  // A series with no booking known at the reading date: the references stand, the band is empty.
  ComparableNights empty;
  empty.night_ = night;
  empty.references_ = refs;
  for (int d = 0; d <= options.maxDba; ++d) {
    BandPoint b;
    b.dba = d;
    b.count = static_cast<int>(refs.size());
    if (!refs.empty())
      b.low = b.median = b.high = 0.0;
    empty.band_.push_back(b);
  }
  return empty;
}

} // namespace cb
