#include "core/unconstrain.h"

#include "core/seasons.h"

#include <boost/math/distributions/normal.hpp>

#include <algorithm>
#include <array>
#include <cmath>
#include <iterator>
#include <limits>
#include <map>
#include <memory>
#include <stdexcept>
#include <utility>

namespace cb {
namespace {

// Evaluated in double (Boost.Math's default policy promotes double arguments to long double):
// the tail probabilities here feed an EM whose tolerance is far above double's few-ulp error,
// and the long double erf and exp were a sixth of a backtest's time with unconstrained history
// (perf, the 1M benchmark property).
using DoublePrecision = boost::math::policies::policy<boost::math::policies::promote_double<false>>;
const boost::math::normal_distribution<double, DoublePrecision> kStdNormal(0.0, 1.0);

/// Beyond this z the upper tail 1 − Φ(z) (≈ 5e-198 at 30) is left for the continued fraction
/// below; Boost's complement cdf underflows to 0 near z = 38, and φ/(1 − Φ) would be 0/0.
constexpr double kTailZ = 30.0;

/// The hazard h(z) = φ(z) / (1 − Φ(z)) of the standard normal (inverse Mills ratio). Boost.Math
/// gives φ and the complement 1 − Φ accurately for moderate z; it has no Mills ratio, so for
/// z ≥ kTailZ the ratio is written by hand as Laplace's continued fraction
/// (1 − Φ(z)) / φ(z) = 1/(z + 1/(z + 2/(z + 3/(z + …)))), which at z ≥ 30 agrees with the direct
/// ratio to double precision after a few dozen terms (evaluated from the tail up).
double hazard(double z) {
  if (z < kTailZ) {
    const double tail = boost::math::cdf(boost::math::complement(kStdNormal, z));
    return boost::math::pdf(kStdNormal, z) / tail;
  }
  double denominator = z;
  for (int k = 60; k >= 1; --k)
    denominator = z + static_cast<double>(k) / denominator;
  return denominator; // 1 / Mills ratio
}

/// y' of projection detruncation for a censored b: P(D > y' | D > b) = tau.
double projectedValue(double mu, double sigma, double b, double tau) {
  if (!(sigma > 0))
    return std::max(mu, b);
  const double z = (b - mu) / sigma;
  if (tau >= 1.0)
    return b;
  const double p =
      z < kTailZ ? tau * boost::math::cdf(boost::math::complement(kStdNormal, z)) : 0.0;
  if (p >= std::numeric_limits<double>::min() && p < 1.0)
    return std::max(b, mu + sigma * boost::math::quantile(boost::math::complement(kStdNormal, p)));
  // Far in the tail D − b given D > b is close to exponential with rate h(z)/sigma, so its
  // (1 − tau) quantile is sigma·ln(1/tau)/h(z) (no tail probability representable here).
  return b + sigma * std::log(1.0 / tau) / hazard(z);
}

void checkSample(std::span<const double> values, std::span<const bool> censored) {
  if (values.size() != censored.size())
    throw std::invalid_argument("censored sample: values and flags differ in length");
  if (values.size() < 2)
    throw std::invalid_argument("censored sample: at least 2 values are needed");
  if (std::find(censored.begin(), censored.end(), false) == censored.end())
    throw std::invalid_argument("censored sample: at least one value must be uncensored");
  for (double v : values)
    if (!std::isfinite(v))
      throw std::invalid_argument("censored sample: values must be finite");
}

/// Mean and standard deviation with divisor n.
std::pair<double, double> meanSd(std::span<const double> v) {
  double sum = 0;
  for (double x : v)
    sum += x;
  const double mean = sum / static_cast<double>(v.size());
  double ss = 0;
  for (double x : v)
    ss += (x - mean) * (x - mean);
  return {mean, std::sqrt(ss / static_cast<double>(v.size()))};
}

/// 0 = Monday.
const char *weekdayName(std::size_t weekday) {
  static const char *const names[] = {"Mon", "Tue", "Wed", "Thu", "Fri", "Sat", "Sun"};
  return names[weekday];
}

/// Which records speak for a series: every record for the total; for a segment series the
/// ones of its segment (the cube names the empty code "(none)"); a channel or room-type series
/// only whole-hotel closures, since closures and denials carry a segment and nothing else.
class SeriesRecords {
public:
  SeriesRecords(const CurveCube &cube, std::size_t series)
      : name_(cube.series().at(series)),
        segmentSeries_(cube.by() == SeriesBy::Segment && series != 0), total_(series == 0) {}
  bool segmentMatches(const std::string &segment) const {
    return segmentSeries_ && (segment.empty() ? name_ == "(none)" : segment == name_);
  }
  bool closureSpeaks(const SalesClosure &c) const {
    return c.segment.empty() || segmentMatches(c.segment);
  }
  bool denialSpeaks(const Denial &d) const { return total_ || segmentMatches(d.segment); }

private:
  const std::string &name_;
  bool segmentSeries_, total_;
};

} // namespace

double conditionalMeanAbove(double mu, double sigma, double b) {
  if (!(sigma > 0))
    return std::max(mu, b);
  return mu + sigma * hazard((b - mu) / sigma);
}

CensoredNormalFit emCensoredNormal(std::span<const double> values, std::span<const bool> censored,
                                   double tolerance, int maxIterations) {
  checkSample(values, censored);
  const double n = static_cast<double>(values.size());
  CensoredNormalFit fit;
  std::tie(fit.mu, fit.sigma) = meanSd(values);
  while (fit.iterations < maxIterations) {
    // E-step (check-values.md §5): for a censored b, E[D | D ≥ b] = mu + sigma·h and
    // E[D² | D ≥ b] = mu² + sigma² + sigma·(b + mu)·h, h = φ(z)/(1 − Φ(z)), z = (b − mu)/sigma.
    // Second moments are taken about the current mu so the M-step variance does not lose
    // digits to mu² (same algebra: E[(D − mu)² | D ≥ b] = sigma² + sigma·(b − mu)·h).
    double s1 = 0, s2 = 0;
    for (std::size_t i = 0; i < values.size(); ++i) {
      const double b = values[i];
      if (!censored[i]) {
        s1 += b;
        s2 += (b - fit.mu) * (b - fit.mu);
      } else if (!(fit.sigma > 0)) {
        const double e = std::max(fit.mu, b);
        s1 += e;
        s2 += (e - fit.mu) * (e - fit.mu);
      } else {
        const double h = hazard((b - fit.mu) / fit.sigma);
        s1 += fit.mu + fit.sigma * h;
        s2 += fit.sigma * fit.sigma + fit.sigma * (b - fit.mu) * h;
      }
    }
    // M-step, divisor n: mu' = mean E[D]; sigma'² = mean E[D²] − mu'², written about the old mu.
    const double mu = s1 / n;
    const double shift = mu - fit.mu;
    const double sigma = std::sqrt(std::max(0.0, s2 / n - shift * shift));
    ++fit.iterations;
    const bool stable =
        std::abs(mu - fit.mu) < tolerance && std::abs(sigma - fit.sigma) < tolerance;
    fit.mu = mu;
    fit.sigma = sigma;
    if (stable) {
      fit.converged = true;
      break;
    }
  }
  return fit;
}

CensoredNormalFit projectionDetruncation(std::span<const double> values,
                                         std::span<const bool> censored, double tau,
                                         std::vector<double> *completed, double tolerance,
                                         int maxIterations) {
  checkSample(values, censored);
  if (!(tau > 0 && tau <= 1))
    throw std::invalid_argument("projection detruncation: tau must be in (0, 1]");
  CensoredNormalFit fit;
  std::tie(fit.mu, fit.sigma) = meanSd(values);
  std::vector<double> filled(values.begin(), values.end());
  auto fill = [&] {
    for (std::size_t i = 0; i < values.size(); ++i)
      if (censored[i])
        filled[i] = projectedValue(fit.mu, fit.sigma, values[i], tau);
  };
  while (fit.iterations < maxIterations) {
    fill();
    const auto [mu, sigma] = meanSd(filled);
    ++fit.iterations;
    const bool stable =
        std::abs(mu - fit.mu) < tolerance && std::abs(sigma - fit.sigma) < tolerance;
    fit.mu = mu;
    fit.sigma = sigma;
    if (stable) {
      fit.converged = true;
      break;
    }
  }
  if (completed) {
    fill(); // the values projected with the returned fit
    *completed = std::move(filled);
  }
  return fit;
}

std::string_view unconstrainMethodName(UnconstrainMethod m) {
  switch (m) {
  case UnconstrainMethod::None: return "naive";
  case UnconstrainMethod::Em: return "em";
  case UnconstrainMethod::ProjectionDetruncation: return "pd";
  }
  return "naive";
}

std::optional<UnconstrainMethod> parseUnconstrainMethod(std::string_view name) {
  for (UnconstrainMethod m :
       {UnconstrainMethod::None, UnconstrainMethod::Em, UnconstrainMethod::ProjectionDetruncation})
    if (unconstrainMethodName(m) == name)
      return m;
  return std::nullopt;
}

CensorSources censorsFor(const CurveCube &cube, std::size_t series, const CensorSources &sources) {
  const SeriesRecords speaks(cube, series);
  CensorSources out;
  std::copy_if(sources.closures.begin(), sources.closures.end(), std::back_inserter(out.closures),
               [&](const SalesClosure &c) { return speaks.closureSpeaks(c); });
  std::copy_if(sources.denials.begin(), sources.denials.end(), std::back_inserter(out.denials),
               [&](const Denial &d) { return speaks.denialSpeaks(d); });
  return out;
}

std::vector<NightDemand> unconstrainSeries(const CurveCube &cube, std::size_t series, Date asOf,
                                           const Property &property, const CensorSources &sources,
                                           const UnconstrainOptions &options) {
  if (asOf > cube.asOf())
    throw std::invalid_argument("unconstrain: reading date " + asOf.toIso() +
                                " is after the cube's reading date " + cube.asOf().toIso());
  if (series >= cube.series().size())
    throw std::out_of_range("unconstrain: no such series");
  const Date first = cube.firstNight();
  const Date last = std::min(asOf, cube.lastNight());
  std::vector<NightDemand> out;
  if (last < first)
    return out;
  const std::size_t count = static_cast<std::size_t>(last - first) + 1;
  auto index = [&](Date s) { return static_cast<std::size_t>(s - first); };

  const SeriesRecords speaks(cube, series);

  // Closures: one counts for night s when it was made on or before both the reading date and
  // the night itself (a closure made after the night turned no one away), and was in force for
  // at least a day (no reopening, or reopening after closing). A closure later reopened still
  // censors the night: requests were turned away while it stood. The reopening date is never
  // needed, so nothing after asOf is read.
  std::vector<bool> closed(count, false);
  for (const SalesClosure &c : sources.closures) {
    if (c.night < first || c.night > last)
      continue;
    if (!speaks.closureSpeaks(c))
      continue;
    if (c.closedOn > std::min(asOf, c.night) || (c.reopenedOn && *c.reopenedOn <= c.closedOn))
      continue;
    closed[index(c.night)] = true;
  }
  // Denials and regrets requested on or before asOf, on every night they cover.
  std::vector<double> denied(count, 0.0);
  for (const Denial &d : sources.denials) {
    if (d.requestedOn > asOf || !speaks.denialSpeaks(d))
      continue;
    for (Date s = std::max(d.arrival, first); s < d.departure && s <= last; ++s)
      denied[index(s)] += static_cast<double>(d.rooms);
  }

  // Nights, and the season class of each calendar month (year and month) from the hotel's
  // finals over its capacity on the known nights: sum of finals / sum of capacity.
  // Called for every series at every reading date of a backtest, so this works on indices
  // (month number, weekday, group number) rather than names: the group's name is made only for
  // the censored nights that report it.
  out.resize(count);
  // Each night's calendar month, counted from first's: a date conversion per month, not night.
  std::vector<std::size_t> monthIndex(count);
  {
    int y = first.year();
    unsigned m = first.month();
    std::size_t k = 0;
    Date next = m == 12 ? Date::fromYmd(y + 1, 1, 1) : Date::fromYmd(y, m + 1, 1);
    for (Date s = first; s <= last; ++s) {
      if (s == next) {
        ++k;
        y = s.year();
        m = s.month();
        next = m == 12 ? Date::fromYmd(y + 1, 1, 1) : Date::fromYmd(y, m + 1, 1);
      }
      monthIndex[index(s)] = k;
    }
  }
  auto monthOf = [&](Date s) { return monthIndex[index(s)]; };
  std::vector<std::pair<double, double>> monthLoad(monthOf(last) + 1); // (finals, capacity)
  std::vector<int> capacityOf(count);
  for (Date s = first; s <= last; ++s) {
    NightDemand &n = out[index(s)];
    n.night = s;
    n.final = *cube.final(series, s);
    const double total = *cube.final(0, s);
    const int capacity = property.capacityOn(s);
    capacityOf[index(s)] = capacity;
    // A night with no rooms on sale tells nothing of demand and is left uncensored.
    if (capacity > 0 && total >= (1.0 - property.selloutMargin) * capacity)
      n.reason = CensorReason::Full;
    else if (closed[index(s)])
      n.reason = CensorReason::Closed;
    n.denied = denied[index(s)];
    n.estimate = n.final;
    auto &load = monthLoad[monthOf(s)];
    load.first += total;
    load.second += capacity;
  }

  // A split series on a full night: censored only when it still books after the hotel filled.
  // Fill lead: the longest lead at which the hotel's OTB already reached the sell-out line (the
  // cube's depth at most). Late share: on the series' uncensored nights of the same weekday,
  // Σ (Final − OTB at the fill lead) / Σ Final. Decided for every night first, then applied, so
  // the reference nights are those the hotel-level rule left uncensored.
  // A cube without depth (maxDba 0) cannot tell when the hotel filled: every full night stays
  // censored then.
  // The sums depend only on the weekday and the fill lead (the night itself is full, so never
  // among its own references), so each (weekday, fill lead) is summed once. Every term is a
  // whole number of rooms, so the sums are exact in any order.
  if (series != 0 && options.minLateShare > 0 && cube.maxDba() > 0) {
    const std::size_t depth = static_cast<std::size_t>(cube.maxDba()) + 1;
    std::vector<std::optional<std::pair<double, double>>> sums(7 * depth); // (late, finals)
    std::vector<std::size_t> notTurnedAway;
    for (std::size_t i = 0; i < count; ++i) {
      if (out[i].reason != CensorReason::Full)
        continue;
      const Date s = out[i].night;
      const double line = (1.0 - property.selloutMargin) * capacityOf[i];
      int fill = 0;
      for (int d = cube.maxDba(); d >= 0; --d)
        if (cube.otbRooms(0, s, d) >= line) {
          fill = d;
          break;
        }
      auto &sum = sums[(i % 7) * depth + static_cast<std::size_t>(fill)];
      if (!sum) {
        double late = 0, finals = 0;
        for (std::size_t k = i % 7; k < count; k += 7)
          if (out[k].reason == CensorReason::None) {
            late += out[k].final - cube.otbRooms(series, out[k].night, fill);
            finals += out[k].final;
          }
        sum = std::make_pair(late, finals);
      }
      if (sum->second > 0 && sum->first / sum->second < options.minLateShare)
        notTurnedAway.push_back(i);
    }
    for (std::size_t i : notTurnedAway)
      out[i].reason = closed[i] ? CensorReason::Closed : CensorReason::None;
  }

  // Groups of comparable nights: weekday × season class of the month (group 7 + 3·weekday +
  // season), else weekday alone (group = weekday, 0 = Monday).
  constexpr std::size_t kSeasons = 3; // SeasonClass: Low, Shoulder, Peak
  constexpr std::size_t kGroups = 7 + 7 * kSeasons;
  std::vector<std::size_t> fine(count), coarse(count);
  std::vector<std::vector<std::size_t>> members(kGroups);
  std::vector<SeasonClass> monthSeason(monthLoad.size());
  for (std::size_t m = 0; m < monthLoad.size(); ++m)
    monthSeason[m] = classifySeason(monthLoad[m].first, monthLoad[m].second, options.seasons);
  for (std::size_t i = 0; i < count; ++i) {
    const Date s = out[i].night;
    coarse[i] = s.isoWeekday() - 1;
    fine[i] = 7 + coarse[i] * kSeasons + static_cast<std::size_t>(monthSeason[monthOf(s)]);
    members[fine[i]].push_back(i);
    members[coarse[i]].push_back(i);
  }
  auto groupName = [&](std::size_t g) {
    if (g < 7)
      return std::string(weekdayName(g));
    const std::size_t f = g - 7;
    return std::string(weekdayName(f / kSeasons)) + "/" +
           std::string(seasonName(static_cast<SeasonClass>(f % kSeasons)));
  };
  auto usable = [&](const std::vector<std::size_t> &group) {
    const auto uncensored = std::count_if(group.begin(), group.end(), [&](std::size_t i) {
      return out[i].reason == CensorReason::None;
    });
    return static_cast<int>(group.size()) >= options.minGroup && uncensored >= 3;
  };

  // Each censored night's group: weekday × season if usable, else the weekday, else none.
  constexpr std::size_t kNoGroup = kGroups;
  std::vector<std::size_t> groupOf(count, kNoGroup);
  std::vector<bool> needed(kGroups, false);
  std::vector<std::optional<bool>> isUsable(kGroups);
  auto usableGroup = [&](std::size_t g) {
    if (!isUsable[g])
      isUsable[g] = usable(members[g]);
    return *isUsable[g];
  };
  for (std::size_t i = 0; i < count; ++i)
    if (out[i].reason != CensorReason::None) {
      groupOf[i] = usableGroup(fine[i]) ? fine[i] : usableGroup(coarse[i]) ? coarse[i] : kNoGroup;
      if (groupOf[i] != kNoGroup) {
        out[i].group = groupName(groupOf[i]);
        needed[groupOf[i]] = options.method != UnconstrainMethod::None;
      }
    }
  // One fit per group in use, over all its nights; the estimates go to the censored nights
  // assigned to that group (a weekday group also holds nights that have a finer group).
  for (std::size_t key = 0; key < kGroups; ++key) {
    if (!needed[key])
      continue;
    const std::vector<std::size_t> &group = members[key];
    std::vector<double> values;
    std::unique_ptr<bool[]> flags(new bool[group.size()]); // std::vector<bool> is no span
    for (std::size_t k = 0; k < group.size(); ++k) {
      values.push_back(out[group[k]].final);
      flags[k] = out[group[k]].reason != CensorReason::None;
    }
    const std::span<const bool> censored(flags.get(), group.size());
    std::vector<double> estimate(values);
    if (options.method == UnconstrainMethod::Em) {
      const CensoredNormalFit fit = emCensoredNormal(values, censored);
      for (std::size_t k = 0; k < group.size(); ++k)
        if (censored[k])
          estimate[k] = conditionalMeanAbove(fit.mu, fit.sigma, values[k]);
    } else {
      projectionDetruncation(values, censored, options.tau, &estimate);
    }
    for (std::size_t k = 0; k < group.size(); ++k)
      if (censored[k] && groupOf[group[k]] == key)
        out[group[k]].estimate = std::max(values[k], estimate[k]);
  }
  if (options.useDenials)
    for (NightDemand &n : out)
      n.estimate = std::max(n.estimate, n.final + n.denied);
  return out;
}

std::vector<double> unconstrainedFinals(const CurveCube &cube, std::size_t series, Date asOf,
                                        const Property &property, const CensorSources &sources,
                                        const UnconstrainOptions &options) {
  std::vector<double> out;
  for (const NightDemand &n : unconstrainSeries(cube, series, asOf, property, sources, options))
    out.push_back(n.estimate);
  return out;
}

UnconstrainScore scoreAgainstTruth(std::string method, std::span<const NightDemand> nights,
                                   std::span<const std::optional<double>> truth) {
  if (nights.size() != truth.size())
    throw std::invalid_argument("scoreAgainstTruth: nights and truth differ in length");
  UnconstrainScore score;
  score.method = std::move(method);
  double absSum = 0, sum = 0;
  for (std::size_t i = 0; i < nights.size(); ++i) {
    if (nights[i].reason == CensorReason::None || !truth[i])
      continue;
    const double e = nights[i].estimate - *truth[i];
    absSum += std::abs(e);
    sum += e;
    ++score.nights;
  }
  if (score.nights > 0) {
    score.mae = absSum / static_cast<double>(score.nights);
    score.bias = sum / static_cast<double>(score.nights);
  }
  return score;
}

} // namespace cb
