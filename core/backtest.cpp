#include "core/backtest.h"

#include <algorithm>
#include <atomic>
#include <chrono>
#include <condition_variable>
#include <exception>
#include <map>
#include <mutex>
#include <stdexcept>
#include <thread>
#include <tuple>

namespace cb {
namespace {

std::vector<int> sortedLeads(std::vector<int> leads) {
  if (leads.empty())
    throw std::invalid_argument("backtest: the lead list is empty");
  std::sort(leads.begin(), leads.end());
  leads.erase(std::unique(leads.begin(), leads.end()), leads.end());
  if (leads.front() < 1)
    throw std::invalid_argument("backtest: leads must be 1 day or more");
  return leads;
}

/// The method to fall back on when no candidate has enough known errors yet: classical additive
/// pickup if it is a candidate (brief section 5's reference method), else the first candidate.
std::uint32_t fallbackMethod(const std::vector<std::string> &base) {
  for (std::size_t i = 0; i < base.size(); ++i)
    if (base[i] == "pickup-add")
      return static_cast<std::uint32_t>(i);
  return 0;
}

/// Forecasts of every base method at one reading date, ordered by (method, series, lead).
void forecastAt(const CurveCube &cube, const Property &property,
                std::vector<std::unique_ptr<ForecastMethod>> &methods,
                const std::vector<int> &leads, Date t, const BacktestOptions &options,
                const std::vector<CensorSources> &seriesSources, std::vector<BacktestRow> &out) {
  const Date lastNight = std::min(cube.lastNight(), cube.asOf());
  if (t + leads.front() > lastNight ||
      (options.firstNight && t + leads.back() < *options.firstNight))
    return;
  const std::size_t firstSeries = options.series.value_or(0);
  const std::size_t endSeries = options.series ? *options.series + 1 : cube.series().size();
  // The unconstrained history as known at t, one per series (only what was known at t).
  std::vector<std::vector<double>> histories;
  if (options.unconstrain)
    for (std::size_t si = firstSeries; si < endSeries; ++si)
      histories.push_back(
          unconstrainedFinals(cube, si, t, property, seriesSources[si], *options.unconstrain));
  // One context per series, shared by every method: its table of finals is built once.
  std::vector<ForecastContext> contexts;
  contexts.reserve(endSeries - firstSeries);
  for (std::size_t si = firstSeries; si < endSeries; ++si) {
    contexts.emplace_back(cube, si, t, property);
    if (!histories.empty())
      contexts.back().useHistory(&histories[si - firstSeries]);
  }
  for (std::size_t mi = 0; mi < methods.size(); ++mi) {
    for (std::size_t si = firstSeries; si < endSeries; ++si) {
      const ForecastContext &ctx = contexts[si - firstSeries];
      methods[mi]->fit(ctx);
      for (int h : leads) {
        const Date s = t + h;
        if (s > lastNight)
          break;
        if (options.firstNight && s < *options.firstNight)
          continue;
        const std::optional<double> f = methods[mi]->forecast(ctx, s);
        if (!f)
          continue;
        BacktestRow r;
        r.night = s;
        r.reading = t;
        r.series = static_cast<std::uint32_t>(si);
        r.lead = h;
        r.method = static_cast<std::uint32_t>(mi);
        r.forecast = *f;
        r.final = static_cast<double>(cube.final(si, s).value_or(0));
        out.push_back(r);
      }
    }
  }
}

} // namespace

CubeOptions Backtest::cubeOptions(const ReservationBounds &bounds, const BacktestOptions &options,
                                  SeriesBy by) {
  const std::vector<int> leads = sortedLeads(options.leads);
  const Date newest = bounds.newest.value();
  const Date first = std::min(newest, bounds.firstArrival.value());
  CubeOptions co;
  co.firstNight = first;
  co.lastNight = std::max(first, std::min(options.to + leads.back(), newest));
  // The pace method reads OTB(s, t − w) with w up to 15 days; a month of room is plenty.
  co.maxDba = leads.back() + 31;
  co.by = by;
  co.asOf = newest;
  co.newest = newest;
  return co;
}

CurveCube Backtest::buildCube(const std::vector<Reservation> &reservations,
                              const BacktestOptions &options, SeriesBy by) {
  (void)sortedLeads(options.leads); // its errors first, as before the bounds were asked for
  const ReservationBounds bounds = boundsOf(reservations);
  if (!bounds.newest)
    throw AsOfError("backtest: there are no reservations");
  return CurveCube::build(reservations, cubeOptions(bounds, options, by));
}

BacktestResult Backtest::run(const CurveCube &cube, const Property &property,
                             const BacktestOptions &options) {
  const std::vector<int> leads = sortedLeads(options.leads);
  if (options.to < options.from)
    throw std::invalid_argument("backtest: the first reading date is after the last");
  if (options.series && *options.series >= cube.series().size())
    throw std::out_of_range("backtest: no such series");
  if (options.step < 1)
    throw std::invalid_argument("backtest: the step must be 1 day or more");

  BacktestResult result;
  result.series = cube.series();
  result.buckets = options.buckets;
  std::vector<std::string> base;
  bool wantAuto = false;
  for (const std::string &name : options.methods) {
    if (name == "auto")
      wantAuto = true;
    else if (std::find(base.begin(), base.end(), name) == base.end())
      base.push_back(name);
  }
  if (wantAuto && base.empty())
    base = methodNames();
  for (const std::string &name : base)
    (void)options.factory(name, options.methodOptions); // unknown names fail before any work
  result.methods = base;
  if (wantAuto)
    result.methods.push_back("auto");
  const auto autoIndex = static_cast<std::uint32_t>(base.size());

  // Reading dates: the reported window, preceded by the warm-up on the same step grid.
  Date start = options.from;
  if (options.warmUp) {
    // Calibrated bands score forecasts whose nights lie up to calibrationDays back; each of
    // those needs its own base band, from the windowDays of nights before its reading date.
    const int bandBack =
        options.bands.windowDays +
        (options.bands.calibrationDays > 0 ? options.bands.calibrationDays + leads.back() : 0);
    const int back = std::max(options.autoSelect.windowDays, bandBack) + leads.back();
    start = options.from - ((back + options.step - 1) / options.step) * options.step;
  }
  while (start < cube.firstNight() && start < options.from)
    start += options.step;
  std::vector<Date> dates;
  for (Date t = start; t <= options.to && t < cube.asOf(); t += options.step)
    dates.push_back(t);
  // Blocks of reading dates, each run in order by one thread with fresh method instances: a
  // method may keep what it fitted for the rest of its block (MethodOptions::mlpRetrainDays),
  // and blocks fixed by the dates alone keep the result independent of the threads.
  const int blockDays = std::max(1, options.methodOptions.mlpRetrainDays);
  std::vector<std::size_t> blockStart;
  for (std::size_t i = 0; i < dates.size(); ++i)
    if (i == 0 || (dates[i] - start) / blockDays != (dates[i - 1] - start) / blockDays)
      blockStart.push_back(i);
  blockStart.push_back(dates.size());

  // The closures and denials of each series, sorted out once for all reading dates.
  std::vector<CensorSources> seriesSources;
  if (options.unconstrain) {
    seriesSources.resize(cube.series().size());
    for (std::size_t si = 0; si < cube.series().size() && options.censoring; ++si)
      if (!options.series || si == *options.series)
        seriesSources[si] = censorsFor(cube, si, *options.censoring);
  }

  // Work is shared out by reading date; each date's rows go to their own slot, so the result
  // does not depend on which thread did what.
  std::vector<std::vector<BacktestRow>> perDate(dates.size());
  std::atomic<std::size_t> next{0}, done{0};
  std::atomic<bool> cancel{false};
  std::mutex mutex;
  std::condition_variable wake;
  std::exception_ptr error;
  auto worker = [&] {
    try {
      std::vector<std::unique_ptr<ForecastMethod>> methods;
      for (;;) {
        const std::size_t b = next++;
        if (b + 1 >= blockStart.size() || cancel)
          break;
        methods.clear();
        for (const std::string &name : base)
          methods.push_back(options.factory(name, options.methodOptions));
        for (std::size_t i = blockStart[b]; i < blockStart[b + 1] && !cancel; ++i) {
          forecastAt(cube, property, methods, leads, dates[i], options, seriesSources, perDate[i]);
          ++done;
          wake.notify_one();
        }
      }
    } catch (...) {
      std::lock_guard lock(mutex);
      if (!error)
        error = std::current_exception();
      cancel = true;
      wake.notify_one();
    }
  };
  unsigned threads = options.threads ? options.threads : std::thread::hardware_concurrency();
  threads = std::clamp(threads, 1u,
                       static_cast<unsigned>(std::max<std::size_t>(blockStart.size() - 1, 1)));
  std::vector<std::thread> pool;
  for (unsigned k = 0; k < threads; ++k)
    pool.emplace_back(worker);
  if (options.progress) {
    const auto total = static_cast<std::int64_t>(dates.size());
    std::unique_lock lock(mutex);
    for (;;) {
      wake.wait_for(lock, std::chrono::milliseconds(100));
      const auto d = static_cast<std::int64_t>(done.load());
      const bool finished = d == total || cancel;
      if (!options.progress(options.progressContext, d, total))
        cancel = true;
      if (finished || cancel)
        break;
    }
  }
  for (auto &th : pool)
    th.join();
  if (error)
    std::rethrow_exception(error);
  if (cancel) {
    result.cancelled = true;
    return result;
  }

  std::vector<BacktestRow> all;
  for (const auto &rows : perDate)
    all.insert(all.end(), rows.begin(), rows.end());
  const ErrorWindow window(all, options.buckets);
  const ErrorBands bands(window, options.bands);
  const AutoSelector selector(
      window,
      [&] {
        std::vector<std::uint32_t> c(base.size());
        for (std::size_t i = 0; i < c.size(); ++i)
          c[i] = static_cast<std::uint32_t>(i);
        return c;
      }(),
      options.autoSelect);
  const std::uint32_t fallback = fallbackMethod(base);

  for (std::size_t i = 0; i < dates.size(); ++i) {
    const Date t = dates[i];
    if (t < options.from)
      continue;
    std::vector<BacktestRow> rows = perDate[i];
    std::vector<std::uint32_t> bandMethod;
    for (const BacktestRow &r : rows)
      bandMethod.push_back(r.method);
    if (wantAuto) {
      std::map<std::tuple<std::uint32_t, std::uint32_t, int>, std::size_t> at;
      for (std::size_t k = 0; k < perDate[i].size(); ++k)
        at[{perDate[i][k].method, perDate[i][k].series, perDate[i][k].lead}] = k;
      for (std::uint32_t si = 0; si < result.series.size(); ++si) {
        if (options.series && si != *options.series)
          continue;
        int lastBucket = -1;
        std::vector<std::uint32_t> order;
        for (int h : leads) {
          const int b = options.buckets.bucketOf(h);
          if (b != lastBucket) {
            AutoChoice choice = selector.choose(si, b, t);
            order.clear();
            for (const MethodEvidence &e : choice.evidence)
              order.push_back(e.method);
            order.push_back(fallback);
            result.autoChoices.push_back({t, si, b, std::move(choice)});
            lastBucket = b;
          }
          // The best method that has a forecast for this night (last-year, say, may not yet).
          for (std::uint32_t m : order) {
            auto it = at.find({m, si, h});
            if (it == at.end())
              continue;
            BacktestRow r = perDate[i][it->second];
            r.method = autoIndex;
            rows.push_back(r);
            bandMethod.push_back(m);
            break;
          }
        }
      }
    }
    for (std::size_t k = 0; k < rows.size() && options.withBands; ++k) {
      BacktestRow &r = rows[k];
      if (auto b = bands.band(r.series, bandMethod[k], options.buckets.bucketOf(r.lead), t,
                              r.forecast)) {
        r.lo = b->lo;
        r.hi = b->hi;
      }
    }
    result.rows.insert(result.rows.end(), rows.begin(), rows.end());
  }

  // MASE scale: the seasonal-naive (lag 7) error of the finals before the test window.
  const Date scaleEnd = std::min(options.from, cube.asOf());
  for (std::size_t si = 0; si < result.series.size(); ++si) {
    std::vector<double> finals;
    for (Date s = cube.firstNight(); s <= scaleEnd && s <= cube.lastNight(); ++s)
      finals.push_back(static_cast<double>(cube.final(si, s).value_or(0)));
    result.maseScale.push_back(naiveScale(finals, 7));
  }
  return result;
}

std::vector<BacktestSummaryRow> Backtest::summarize(const BacktestResult &result,
                                                    const std::vector<OverrideValue> &overrides) {
  std::map<std::pair<Date, std::string>, double> overrideAt;
  for (const OverrideValue &o : overrides)
    overrideAt[{o.night, o.series}] = o.value;
  struct Group {
    std::vector<double> forecasts, finals, bandFinals;
    std::vector<Band> bands;
    std::int64_t overridden = 0;
    double systemAbs = 0, overrideAbs = 0;
  };
  std::map<std::tuple<std::uint32_t, std::uint32_t, int>, Group> groups;
  for (const BacktestRow &r : result.rows) {
    Group &g = groups[{r.series, r.method, r.lead}];
    g.forecasts.push_back(r.forecast);
    g.finals.push_back(r.final);
    if (r.lo && r.hi) {
      g.bands.push_back({*r.lo, *r.hi});
      g.bandFinals.push_back(r.final);
    }
    auto o = overrideAt.find({r.night, result.series[r.series]});
    if (o != overrideAt.end()) {
      ++g.overridden;
      g.systemAbs += std::abs(r.forecast - r.final);
      g.overrideAbs += std::abs(o->second - r.final);
    }
  }
  std::vector<BacktestSummaryRow> out;
  for (const auto &[key, g] : groups) {
    BacktestSummaryRow row;
    std::tie(row.series, row.method, row.lead) = key;
    const auto scale =
        row.series < result.maseScale.size() ? result.maseScale[row.series] : std::nullopt;
    row.accuracy = Accuracy::measure(g.forecasts, g.finals, scale);
    row.banded = static_cast<std::int64_t>(g.bands.size());
    row.coverage = bandCoverage(g.bands, g.bandFinals);
    row.overridden = g.overridden;
    if (g.overridden > 0)
      row.valueAdded = (g.systemAbs - g.overrideAbs) / static_cast<double>(g.overridden);
    out.push_back(std::move(row));
  }
  return out;
}

} // namespace cb
