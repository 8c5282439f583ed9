#include "core/overbooking.h"

#include "core/demandmath.h"

#include <algorithm>
#include <cmath>
#include <functional>
#include <stdexcept>

namespace cb {
namespace {

/// Smallest y in [lo, …) with ok(y), for ok false…false true…true (monotone). Doubling then
/// bisection, so a far answer costs a few dozen evaluations, not one per room.
int firstTrue(int lo, const std::function<bool(int)> &ok) {
  if (ok(lo))
    return lo;
  long long bad = lo, step = 1;
  long long good = lo + step;
  while (!ok(static_cast<int>(good))) {
    bad = good;
    step *= 2;
    good = lo + step;
    if (good > 1'000'000'000)
      throw std::overflow_error("overbooking: no answer below a billion reservations");
  }
  while (good - bad > 1) {
    const long long mid = bad + (good - bad) / 2;
    if (ok(static_cast<int>(mid)))
      good = mid;
    else
      bad = mid;
  }
  return static_cast<int>(good);
}

} // namespace

double criticalRatio(const OverbookingCosts &costs) {
  const double cu = costs.emptyRoomValue, co = costs.walkCost;
  if (!std::isfinite(cu) || !std::isfinite(co) || !(cu > 0) || !(co > 0))
    throw std::invalid_argument(
        "criticalRatio: the empty-room value and the walk cost must be > 0");
  return cu / (cu + co);
}

double overbookNormal(double mu, double sigma, const OverbookingCosts &costs) {
  const double cr = criticalRatio(costs);
  if (!std::isfinite(mu) || !std::isfinite(sigma) || sigma < 0)
    throw std::invalid_argument("overbookNormal: requires finite mu and sigma >= 0");
  if (sigma == 0)
    return mu; // no-shows are exactly mu
  return mu + sigma * normalQuantile(cr);
}

int overbookPoisson(double mean, const OverbookingCosts &costs) {
  return poissonQuantile(criticalRatio(costs), mean);
}

int overbookBinomial(int capacity, double noShowProb, const OverbookingCosts &costs) {
  const double cr = criticalRatio(costs);
  if (capacity < 0)
    throw std::invalid_argument("overbookBinomial: capacity must be >= 0");
  // At probability 1 nobody shows and no finite Y reaches the ratio.
  if (!(noShowProb >= 0.0 && noShowProb < 1.0))
    throw std::invalid_argument("overbookBinomial: the no-show probability must lie in [0, 1)");
  // P(Bin(C + Y, q) ≤ Y) never falls as Y grows (one more reservation and one more allowed
  // no-show), so the smallest Y is found by search.
  return firstTrue(0, [&](int y) { return binomialCdf(y, capacity + y, noShowProb) >= cr; });
}

int maxReservationsForServiceLevel(int capacity, double showProb, double level) {
  if (capacity < 0)
    throw std::invalid_argument("maxReservationsForServiceLevel: capacity must be >= 0");
  if (!(showProb > 0.0 && showProb <= 1.0))
    throw std::invalid_argument("maxReservationsForServiceLevel: show probability must lie in "
                                "(0, 1]");
  if (!(level > 0.0 && level < 1.0))
    throw std::invalid_argument("maxReservationsForServiceLevel: level must lie in (0, 1)");
  // P(Bin(n, s) ≤ C) is 1 up to n = C and falls as n grows: the largest n that still meets the
  // level is one below the first that misses it.
  return firstTrue(capacity, [&](int n) { return binomialCdf(capacity, n, showProb) < level; }) - 1;
}

NoShowMeasure measureNoShows(const std::vector<Reservation> &reservations, Date night, Date asOf,
                             const NoShowOptions &options) {
  if (options.weeks < 0 || options.lateCancelDays < 0 || options.lead < 0)
    throw std::invalid_argument("measureNoShows: weeks, lateCancelDays and lead must be >= 0");
  const int baseLead = std::max(options.lead, options.lateCancelDays + 1);

  // The first similar night on or before asOf: night − 7k with the smallest k ≥ 1.
  const int ahead = night - asOf;
  const int firstWeek = ahead <= 7 ? 1 : (ahead + 6) / 7;
  std::vector<double> lostPerNight;
  double sumBase = 0, sumNoShow = 0, sumLate = 0, revenue = 0, stayRooms = 0;
  for (int k = firstWeek; k < firstWeek + options.weeks; ++k) {
    const Date s = night - 7 * k;
    const Date t = s - baseLead;                      // reading date of the base
    const Date lateFrom = s - options.lateCancelDays; // a cancellation on or after it is late
    int base = 0, noShows = 0, late = 0;
    double nightRevenue = 0, nightRooms = 0;
    for (const Reservation &r : reservations) {
      if (!r.covers(s))
        continue;
      const bool cancelled = r.cancelledOn.has_value();
      if (!cancelled && r.status != ReservationStatus::NoShow) { // a stay, whenever booked
        nightRevenue += r.rate * r.rooms;
        nightRooms += r.rooms;
      }
      if (!r.onBooks(s, t) || (cancelled && *r.cancelledOn < lateFrom))
        continue; // not in the base: booked after t, or freed early enough to resell
      base += r.rooms;
      if (r.status == ReservationStatus::NoShow)
        noShows += r.rooms;
      else if (cancelled)
        late += r.rooms;
    }
    if (base == 0)
      continue; // nothing on the books (a closed night, or before the data starts)
    lostPerNight.push_back(noShows + late);
    sumBase += base;
    sumNoShow += noShows;
    sumLate += late;
    revenue += nightRevenue;
    stayRooms += nightRooms;
  }

  NoShowMeasure m;
  m.nights = static_cast<int>(lostPerNight.size());
  if (m.nights == 0)
    return m;
  const double n = m.nights;
  double sumLost = 0;
  for (double x : lostPerNight)
    sumLost += x;
  m.mean = sumLost / n;
  if (m.nights > 1) {
    double ss = 0;
    for (double x : lostPerNight)
      ss += (x - m.mean) * (x - m.mean);
    m.sd = std::sqrt(ss / (n - 1));
  }
  m.rate = sumLost / sumBase;
  m.noShowMean = sumNoShow / n;
  m.lateCancelMean = sumLate / n;
  m.adr = stayRooms > 0 ? revenue / stayRooms : 0.0;
  return m;
}

} // namespace cb
