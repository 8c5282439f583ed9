#include "core/outlook.h"

#include "core/curvecube.h"
#include "core/demandmath.h"
#include "core/forecastrun.h"
#include "core/holidaymap.h"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <map>
#include <stdexcept>

namespace cb {
namespace {

// Why OutlookOptions::method defaults to "pickup-adv": the outlook must answer in well under a
// second on the sample property and on the open city dataset, and "auto" backtests every method
// (about 45 s). Measured 2026-12-02 with `curvebench outlook STORE --as-of DATE --method M --out
// /dev/null`, median wall time of 3 runs, RelWithDebInfo, 2 cores shared with other builds (load
// about 5), sample (as of 2026-10-31) / open city (capacity 235, as of 2017-05-31): naive
// 0.76 / 0.97 s, mavg 0.76 / 0.95, ses 0.77 / 0.99, pickup-add 0.92 / 1.12, pickup-adv 1.08 /
// 1.25, pickup-mult 0.93 / 1.11, pace-extrap 0.97 / 1.16, regress 1.85 / 1.83, blend 1.78 /
// 1.46; on the sample alone ar 1.24, holt-winters 1.17, mlp 130 s. Most of the time is common to
// every method (reading the store, the band calibration, unconstraining), so the fast group is
// naive … pace-extrap; regress, blend, ar and holt-winters take about twice as long and mlp
// minutes. Of the fast group pickup-adv is the most accurate in the README's backtest on the
// open city dataset (MAE 2.17 / 7.29 / 10.03 / 20.88 / 45.18 rooms at h = 1 / 7 / 14 / 30 / 90,
// against 2.17 / 7.29 / 10.26 / 21.61 / 48.84 for pickup-add and 20 to 45 for naive, mavg and
// ses), so it is the default.

UnconstrainOptions unconstrainFrom(const Property &property) {
  const std::optional<UnconstrainMethod> m =
      parseUnconstrainMethod(property.settings.unconstrainMethod);
  if (!m)
    throw std::invalid_argument("unknown unconstraining method \"" +
                                property.settings.unconstrainMethod +
                                "\" in the property's settings");
  UnconstrainOptions u;
  u.method = *m;
  u.seasons = property.settings.seasons;
  return u;
}

ForecastRequest requestFor(const Property &property, const CensorSources &sources,
                           const OutlookOptions &options, int horizon, SeriesBy by) {
  ForecastRequest r;
  r.asOf = options.asOf;
  r.horizon = horizon;
  r.method = options.method;
  r.by = by;
  r.methodOptions = options.methodOptions;
  if (options.unconstrained.value_or(property.settings.unconstrainHistory)) {
    r.unconstrain = unconstrainFrom(property);
    r.censoring = &sources;
  }
  r.threads = options.threads;
  r.bounds = options.bounds;
  r.progress = options.progress;
  r.progressContext = options.progressContext;
  return r;
}

/// Revenue and rooms picked up from lead h to arrival by the nights of the rate window (index h),
/// and the finals of those nights.
struct PickupRates {
  std::vector<double> revenue, rooms;
  double finalRevenue = 0, finalRooms = 0;

  /// The revenue per room of rooms still to come at lead h: the window's pickup rate when the
  /// window picked up rooms and revenue at that lead, else the ADR on the books of the night,
  /// else the ADR of the window's finals, else 0.
  double rateFor(int h, int otb, double otbRevenue) const {
    const auto i = static_cast<std::size_t>(h);
    if (i < rooms.size() && rooms[i] > 0 && revenue[i] > 0)
      return revenue[i] / rooms[i];
    if (otb > 0)
      return otbRevenue / otb;
    if (finalRooms > 0)
      return finalRevenue / finalRooms;
    return 0;
  }
};

PickupRates pickupRates(const CurveCube &cube, Date asOf, int windowDays, int maxLead) {
  PickupRates p;
  p.revenue.assign(static_cast<std::size_t>(maxLead) + 1, 0.0);
  p.rooms.assign(static_cast<std::size_t>(maxLead) + 1, 0.0);
  for (Date r = asOf - windowDays + 1; r <= asOf; ++r) {
    if (r < cube.firstNight())
      continue;
    const double finalRooms = cube.otbRooms(0, r, 0);
    const double finalRevenue = cube.otbRevenue(0, r, 0);
    p.finalRooms += finalRooms;
    p.finalRevenue += finalRevenue;
    for (int h = 1; h <= maxLead; ++h) {
      p.rooms[static_cast<std::size_t>(h)] += finalRooms - cube.otbRooms(0, r, h);
      p.revenue[static_cast<std::size_t>(h)] += finalRevenue - cube.otbRevenue(0, r, h);
    }
  }
  return p;
}

std::string eventsOn(const std::vector<EventNote> &events, Date night) {
  std::string out;
  for (const EventNote &e : events)
    if (e.from <= night && night <= e.to)
      out += (out.empty() ? "" : "; ") + e.label;
  return out;
}

std::string percent(double share) { return fmt::format("{:.0f} %", 100.0 * share); }

} // namespace

void fillCapacityFigures(OutlookNight &n, double pickupRate) {
  const double c = n.capacity;
  if (n.capacity <= 0) {
    n.constrained = 0;
    n.spill = n.forecast;
    n.pSellout = 1;
    n.occupancy = 0;
  } else {
    const CapacityOutcome o = normalAgainstCapacity(n.forecast, n.sd, c);
    n.constrained = o.sales;
    n.spill = o.spill;
    n.pSellout = o.pFull;
    n.occupancy = o.sales / c;
  }
  // Rooms beyond those on the books sell at the pickup rate. When fewer rooms than are on the
  // books are expected (cancellations to come), they are assumed to leave at the ADR on the
  // books, so the ADR is that of the books: the denominator max(constrained, OTB) keeps the ADR
  // continuous where constrained crosses OTB.
  const double rooms = std::max(n.constrained, static_cast<double>(n.otb));
  const double revenue = n.otbRevenue + std::max(0.0, n.constrained - n.otb) * pickupRate;
  n.adr = rooms > 0 ? revenue / rooms : pickupRate;
  n.revpar = n.capacity > 0 ? n.constrained * n.adr / c : 0.0;
}

void classifyNight(OutlookNight &n, const SeasonBands &bands, const OutlookOptions &options) {
  n.season = classifySeason(n.forecast, n.capacity, bands);
  n.flags.clear();
  const bool full = n.otb >= n.capacity;
  if (full)
    n.flags.emplace_back("full");
  else if (n.pSellout >= options.likelySellout)
    n.flags.emplace_back("sell-out likely");
  if (n.occupancy < options.weakOccupancy)
    n.flags.emplace_back("weak");
  if (n.stlyOtb) {
    const double change =
        static_cast<double>(n.otb - *n.stlyOtb) / std::max(static_cast<double>(*n.stlyOtb), 1.0);
    if (change > options.paceAlert)
      n.flags.emplace_back("pace up");
    else if (change < -options.paceAlert)
      n.flags.emplace_back("pace down");
  }
}

std::vector<MinStayHint> findMinStays(std::vector<OutlookNight> &nights,
                                      const OutlookOptions &options) {
  const auto peak = [&](std::size_t i) { return nights[i].pSellout >= options.minStayPeak; };
  std::vector<MinStayHint> hints;
  for (std::size_t i = 0; i < nights.size(); ++i) {
    if (!peak(i))
      continue;
    const Date s = nights[i].night;
    const bool hasBefore = i > 0 && nights[i - 1].night == s - 1;
    const bool hasAfter = i + 1 < nights.size() && nights[i + 1].night == s + 1;
    MinStayHint h;
    h.night = s;
    h.pSellout = nights[i].pSellout;
    if (hasBefore)
      h.before = nights[i - 1].occupancy;
    if (hasAfter)
      h.after = nights[i + 1].occupancy;
    const bool weakBefore = h.before && *h.before < options.minStayWeak;
    const bool weakAfter = h.after && *h.after < options.minStayWeak;
    if (!weakBefore && !weakAfter)
      continue;
    // The run of peak nights this night belongs to, for the evidence.
    std::size_t first = i, last = i;
    while (first > 0 && nights[first - 1].night == nights[first].night - 1 && peak(first - 1))
      --first;
    while (last + 1 < nights.size() && nights[last + 1].night == nights[last].night + 1 &&
           peak(last + 1))
      ++last;
    const auto side = [&](const char *name, const std::optional<double> &occ) {
      return occ ? fmt::format("{} night {}", name, percent(*occ))
                 : fmt::format("{} night —", name);
    };
    h.evidence =
        fmt::format("{}: sell-out probability {}; constrained occupancy {}, {} (weak below {}){}.",
                    s.toIso(), percent(h.pSellout), side("previous", h.before),
                    side("next", h.after), percent(options.minStayWeak),
                    last > first ? fmt::format("; one end of {} peak nights in a row, {} to {}",
                                               last - first + 1, nights[first].night.toIso(),
                                               nights[last].night.toIso())
                                 : std::string());
    nights[i].flags.emplace_back("min stay");
    hints.push_back(std::move(h));
  }
  return hints;
}

Outlook computeOutlook(const std::vector<Reservation> &reservations, const Property &property,
                       const CensorSources &sources, const std::vector<EventNote> &events,
                       const OutlookOptions &options) {
  if (options.days < 1)
    throw std::invalid_argument("the outlook needs 1 night or more");
  const ReservationBounds bounds =
      options.bounds && !reservations.empty() ? *options.bounds : boundsOf(reservations);
  ForecastRequest request = requestFor(property, sources, options, options.days, SeriesBy::Total);
  request.keepCube = true;
  request.bounds = bounds;
  request.cube = options.cube;
  const ForecastRun run = ForecastRun::compute(reservations, property, request);
  Outlook out;
  out.cube = run.cube;
  out.asOf = options.asOf;
  out.method = options.method;
  out.unconstrained = options.unconstrained.value_or(property.settings.unconstrainHistory);
  if (run.cancelled) {
    out.cancelled = true;
    return out;
  }

  // A total cube of our own for revenue, STLY OTB and the recent pickup rates: nights from the
  // rate window (or the earliest STLY night) to the last night of the outlook, leads to `days`.
  const HolidayMap holidays = HolidayMap::fromEvents(events);
  const Date lastNight = options.asOf + options.days;
  Date firstNight = options.asOf - std::max(options.rateWindowDays, 1) + 1;
  for (Date s = options.asOf + 1; s <= lastNight; ++s)
    firstNight = std::min(firstNight, holidays.referenceNight(property, s));
  // The forecast run's cube when it holds those cells (it usually does: it starts at the first
  // arrival), else one of our own. A cell is the same in either: OTB(s, s − d) does not depend
  // on the cube's range or depth.
  std::optional<CurveCube> own;
  if (!run.cube || run.cube->by() != SeriesBy::Total || run.cube->firstNight() > firstNight ||
      run.cube->lastNight() < lastNight || run.cube->maxDba() < options.days ||
      run.cube->asOf() != options.asOf) {
    CubeOptions co;
    co.firstNight = firstNight;
    co.lastNight = lastNight;
    co.maxDba = options.days;
    co.by = SeriesBy::Total;
    co.asOf = options.asOf;
    co.newest = bounds.newest;
    own = CurveCube::build(reservations, co);
  }
  const CurveCube &cube = own ? *own : *run.cube;
  const PickupRates rates = pickupRates(cube, options.asOf, options.rateWindowDays, options.days);
  const std::optional<Date> dataStart = bounds.firstStay;

  for (const ForecastValue &v : run.values) {
    if (v.series != "ALL")
      continue;
    OutlookNight n;
    n.night = v.night;
    n.lead = v.lead;
    n.capacity = property.capacityOn(v.night);
    n.otb = cube.otbRooms(0, v.night, v.lead);
    n.otbRevenue = cube.otbRevenue(0, v.night, v.lead);
    const Date stly = holidays.referenceNight(property, v.night);
    if (dataStart && stly >= *dataStart)
      n.stlyOtb = cube.otbRooms(0, stly, v.lead);
    n.forecast = v.forecast;
    n.lo = v.lo;
    n.hi = v.hi;
    n.sd = v.sd.value_or(0.0);
    n.method = v.method;
    n.event = eventsOn(events, v.night);
    fillCapacityFigures(n, rates.rateFor(v.lead, n.otb, n.otbRevenue));
    classifyNight(n, property.settings.seasons, options);
    out.nights.push_back(std::move(n));
  }
  out.minStays = findMinStays(out.nights, options);
  return out;
}

NightProtection protectNight(const std::vector<Reservation> &reservations, const Property &property,
                             const CensorSources &sources, Date asOf, Date night,
                             ProtectionMethod method, const OutlookOptions &options) {
  if (night <= asOf)
    throw std::invalid_argument("night " + night.toIso() + " is not after the reading date " +
                                asOf.toIso() + "; protection is for nights still to come");
  OutlookOptions o = options;
  o.asOf = asOf;
  const int lead = night - asOf;
  const ForecastRun run = ForecastRun::compute(
      reservations, property, requestFor(property, sources, o, lead, SeriesBy::Segment));
  NightProtection np;
  np.night = night;
  np.asOf = asOf;
  np.capacity = property.capacityOn(night);
  if (run.cancelled)
    throw std::runtime_error("the forecast was cancelled");

  // Segment ADR of the finals of the last 365 nights: no lead is needed (maxDba 0).
  CubeOptions co;
  co.firstNight = asOf - 364;
  co.lastNight = asOf;
  co.maxDba = 0;
  co.by = SeriesBy::Segment;
  co.asOf = asOf;
  const CurveCube past = CurveCube::build(reservations, co);

  ProtectionInput in;
  in.capacity = np.capacity;
  in.method = method;
  std::map<std::string, int> otbOf;
  for (const ForecastValue &v : run.values) {
    if (v.night != night)
      continue;
    if (v.series == "ALL") {
      np.sold = v.otb;
      continue;
    }
    double rooms = 0, revenue = 0;
    if (const std::optional<std::size_t> si = past.seriesIndex(v.series))
      for (Date r = co.firstNight; r <= co.lastNight; ++r) {
        rooms += past.otbRooms(*si, r, 0);
        revenue += past.otbRevenue(*si, r, 0);
      }
    if (!(rooms > 0) || !(revenue > 0)) {
      np.notes.push_back(fmt::format(
          "segment {} left out: no paid rooms in the 365 nights up to {}", v.series, asOf.toIso()));
      continue;
    }
    ClassDemand d;
    d.code = v.series;
    d.rate = revenue / rooms;
    d.mean = std::max(0.0, v.forecast - v.otb);
    d.sd = v.sd.value_or(0.0);
    otbOf[v.series] = v.otb;
    in.classes.push_back(std::move(d));
  }
  for (std::size_t si = 1; si < past.series().size(); ++si) {
    const std::string &code = past.series()[si];
    const bool seen =
        std::any_of(run.values.begin(), run.values.end(),
                    [&](const ForecastValue &v) { return v.night == night && v.series == code; });
    if (!seen)
      np.notes.push_back("segment " + code + " left out: no forecast for the night");
  }
  if (in.classes.empty())
    throw std::invalid_argument("no segment has both a forecast for " + night.toIso() +
                                " and a rate to rank it by");
  in.sold = np.sold;
  np.result = protect(in);
  for (const ProtectionLine &line : np.result.lines)
    np.segmentOtb.push_back(otbOf.at(line.demand.code));
  return np;
}

} // namespace cb
