#include "core/pace.h"

#include <fmt/format.h>

#include <algorithm>
#include <stdexcept>

namespace cb {
namespace {

void checkRange(Date asOf, Date first, Date last) {
  if (last < first)
    throw std::invalid_argument(
        fmt::format("the night range is empty: {} is after {}", first.toIso(), last.toIso()));
  if (first < asOf)
    throw std::invalid_argument(fmt::format("pace starts at night {}, before the reading date {}; "
                                            "past nights have finals, not pace",
                                            first.toIso(), asOf.toIso()));
}

} // namespace

CubeOptions Pace::cubeOptionsFor(const Property &property, const HolidayMap &holidays,
                                 const PaceOptions &options) {
  checkRange(options.asOf, options.firstNight, options.lastNight);
  Date earliest = options.firstNight;
  for (Date s = options.firstNight; s <= options.lastNight; ++s)
    earliest = std::min(earliest, holidays.referenceNight(property, s));
  CubeOptions c;
  c.firstNight = earliest;
  c.lastNight = options.lastNight;
  c.maxDba = options.lastNight - options.asOf;
  c.by = options.by;
  c.asOf = options.asOf;
  return c;
}

Pace Pace::build(const std::vector<Reservation> &reservations, const Property &property,
                 const HolidayMap &holidays, const PaceOptions &options) {
  CurveCube cube = CurveCube::build(reservations, cubeOptionsFor(property, holidays, options));
  return fromCube(cube, property, holidays, options.firstNight, options.lastNight);
}

Pace Pace::fromCube(const CurveCube &cube, const Property &property, const HolidayMap &holidays,
                    Date firstNight, Date lastNight) {
  checkRange(cube.asOf(), firstNight, lastNight);
  Pace p;
  p.asOf_ = cube.asOf();
  p.first_ = firstNight;
  p.nights_ = lastNight - firstNight + 1;
  p.series_ = cube.series();
  p.cells_.reserve(p.series_.size() * static_cast<std::size_t>(p.nights_));
  for (std::size_t series = 0; series < p.series_.size(); ++series)
    for (Date s = firstNight; s <= lastNight; ++s) {
      PaceCell c;
      c.night = s;
      c.dba = s - p.asOf_;
      c.otb = cube.otbRooms(series, s, c.dba);
      const std::optional<Date> pair = holidays.lastYearNight(s);
      c.paired = pair.has_value();
      c.stlyNight = pair.value_or(property.stlyNight(s));
      if (cube.known(c.stlyNight, c.dba)) {
        c.stlyOtb = cube.otbRooms(series, c.stlyNight, c.dba);
        c.diffRooms = c.otb - *c.stlyOtb;
        if (*c.stlyOtb != 0)
          c.diffPct = 100.0 * *c.diffRooms / *c.stlyOtb;
      }
      p.cells_.push_back(c);
    }
  return p;
}

const PaceCell &Pace::at(std::size_t series, Date night) const {
  const int n = night - first_;
  if (series >= series_.size() || n < 0 || n >= nights_)
    throw std::out_of_range(fmt::format("no pace for night {}", night.toIso()));
  return cells_[series * static_cast<std::size_t>(nights_) + static_cast<std::size_t>(n)];
}

} // namespace cb
