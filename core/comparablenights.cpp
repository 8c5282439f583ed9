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

// The band across reference nights 0 … n − 1 whose OTB at lead d is otb(i, d) and whose final is
// otb(i, 0).
template <class Otb>
std::vector<BandPoint> bandOf(std::size_t n, const ComparableOptions &options, Otb otb) {
  const std::array<double, 3> probs = {options.lowProbability, 0.5, options.highProbability};
  std::vector<int> finals;
  for (std::size_t i = 0; i < n; ++i)
    finals.push_back(otb(i, 0));
  std::vector<BandPoint> band;
  for (int d = 0; d <= options.maxDba; ++d) {
    BandPoint b;
    b.dba = d;
    std::vector<double> rooms, pct;
    for (std::size_t i = 0; i < n; ++i) {
      const int v = otb(i, d);
      rooms.push_back(v);
      if (finals[i] > 0)
        pct.push_back(100.0 * v / finals[i]);
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
    band.push_back(b);
  }
  return band;
}

// The code a reservation is split by, spelled as the cube names its series.
std::string_view seriesCode(const Reservation &r, SeriesBy by) {
  const std::string *code = by == SeriesBy::Segment   ? &r.segment
                            : by == SeriesBy::Channel ? &r.channel
                                                      : &r.roomType;
  return code->empty() ? std::string_view("(none)") : std::string_view(*code);
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
  c.band_ = bandOf(c.references_.size(), options, [&](std::size_t i, int d) {
    return cube.otbRooms(series, c.references_[i], d); // r ≤ asOf: at d = 0, Final(r)
  });
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

// Each reference night r is on or before the reading date, so every one of its cells is known:
// OTB(r, r − d) counts the rows booked by r − d (and by the reading date) and not cancelled by then
// — the cube's cells, read from the night's own reservations. A series no row known at the reading
// date belongs to reads 0 everywhere, as build() gives it (band 0, % band empty).
ComparableNights
ComparableNights::build(const std::vector<Reservation> &reservations, const NightIndex &index,
                        std::optional<Date> newest, Date night, Date asOf, const Property &property,
                        const HolidayMap &holidays, const std::vector<EventNote> &events,
                        const ComparableOptions &options, SeriesBy by, const std::string &series) {
  ComparableNights c;
  c.night_ = night;
  c.references_ = select(night, asOf, property, holidays, events, options);
  // The checks CurveCube::build makes in build() (the options were checked by select).
  if (!newest)
    throw AsOfError("the data has no bookings, so no reading date can be set");
  if (asOf > *newest)
    throw AsOfError(
        fmt::format("reading date {} is after the newest booking or cancellation in the data ({})",
                    asOf.toIso(), newest->toIso()));
  // "ALL" is the total whatever the split (the cube's series 0); another name with no split
  // names no series.
  const bool total = series == "ALL";
  const bool noSeries = !total && by == SeriesBy::Total;
  const std::size_t leads = static_cast<std::size_t>(options.maxDba) + 1;
  std::vector<int> otb(c.references_.size() * leads, 0); // [reference][lead]
  for (std::size_t i = 0; i < c.references_.size(); ++i) {
    const Date r = c.references_[i];
    int *curve = otb.data() + i * leads;
    for (std::uint32_t k : index.covering(r)) {
      const Reservation &row = reservations[k];
      if (row.bookedOn > asOf || noSeries || (!total && seriesCode(row, by) != series))
        continue;
      // On the books at r − d for d in [lo, hi]: booked by r − d, not cancelled by r − d.
      const int lo = row.cancelledOn ? std::max(0, r - *row.cancelledOn + 1) : 0;
      const int hi = std::min(options.maxDba, r - row.bookedOn);
      if (lo > hi)
        continue;
      curve[lo] += row.rooms; // a difference array along d, summed below
      if (static_cast<std::size_t>(hi) + 1 < leads)
        curve[hi + 1] -= row.rooms;
    }
    for (std::size_t d = 1; d < leads; ++d)
      curve[d] += curve[d - 1];
  }
  c.band_ = bandOf(c.references_.size(), options, [&](std::size_t i, int d) {
    return otb[i * leads + static_cast<std::size_t>(d)];
  });
  return c;
}

} // namespace cb
