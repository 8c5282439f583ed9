#include "core/forecastrun.h"

#include "core/backtest.h"
#include "core/sqlite.h"
#include "core/store.h"

#include <date/date.h>
#include <nlohmann/json.hpp>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <map>
#include <set>
#include <tuple>

namespace cb {
namespace {

using Json = nlohmann::ordered_json;

std::string nowUtc() {
  return date::format("%FT%TZ",
                      std::chrono::floor<std::chrono::seconds>(std::chrono::system_clock::now()));
}

Json optionsJson(const ForecastRequest &r) {
  const MethodOptions &m = r.methodOptions;
  Json j{{"horizon", r.horizon},
         {"by", std::string(seriesByName(r.by))},
         {"mavg_k", m.movingAverageK},
         {"refs", m.references},
         {"refs_seasonal", m.seasonalReferences},
         {"seasonal_weeks", m.seasonalWeeks},
         {"pace_window", m.paceWindow},
         {"max_ar_order", m.maxArOrder},
         {"seed", m.seed},
         {"mlp_retrain_days", m.mlpRetrainDays},
         {"criterion", std::string(criterionName(r.autoSelect.criterion))},
         {"window_days", r.autoSelect.windowDays},
         {"min_count", r.autoSelect.minCount},
         {"band", {r.bands.lower, r.bands.upper}},
         {"band_min_count", r.bands.minCount},
         {"history", r.unconstrain ? std::string(unconstrainMethodName(r.unconstrain->method))
                                   : std::string("observed")}};
  if (r.series)
    j["series"] = *r.series;
  return j;
}

/// Root mean square of the errors of (series, method, bucket) whose nights lie in the band window
/// up to t: the spread of the forecast's demand distribution (brief section 6). nullopt with
/// fewer than the band's minimum count.
std::optional<double> rmsError(const ErrorWindow &window, std::uint32_t series,
                               std::uint32_t method, int bucket, Date t,
                               const BandOptions &options) {
  const auto rows = window.rows(series, method, bucket, t - options.windowDays + 1, t);
  if (rows.empty() || static_cast<int>(rows.size()) < options.minCount)
    return std::nullopt;
  double sum = 0;
  for (const BacktestRow &r : rows)
    sum += (r.final - r.forecast) * (r.final - r.forecast);
  return std::sqrt(sum / static_cast<double>(rows.size()));
}

} // namespace

std::int64_t addOverride(Store &store, ForecastOverride o) {
  if (o.createdAt.empty())
    o.createdAt = nowUtc();
  Store::Transaction tx(store);
  if (!o.segment.empty()) {
    bool known = false;
    for (const Segment &s : store.segments())
      known = known || s.code == o.segment;
    if (!known) {
      Segment s;
      s.code = o.segment;
      store.upsertSegment(s);
    }
  }
  auto st = store.database().prepare("INSERT INTO forecast_overrides (night, segment, value, "
                                     "reason, author, created_at) VALUES (?1, ?2, ?3, ?4, ?5, ?6)");
  st.bind(1, o.night);
  st.bindTextOrNull(2, o.segment);
  st.bind(3, o.value);
  st.bind(4, o.reason);
  st.bind(5, o.author);
  st.bind(6, o.createdAt);
  st.step();
  const std::int64_t id = store.database().queryInt64("SELECT last_insert_rowid()");
  tx.commit();
  return id;
}

std::vector<ForecastOverride> overrides(Store &store) {
  auto st = store.database().prepare("SELECT id, night, segment, value, reason, author, "
                                     "created_at FROM forecast_overrides ORDER BY night, id");
  std::vector<ForecastOverride> out;
  while (st.step())
    out.push_back({st.columnInt64(0), st.columnDate(1), st.columnText(2), st.columnDouble(3),
                   st.columnText(4), st.columnText(5), st.columnText(6)});
  return out;
}

ForecastRun ForecastRun::compute(const std::vector<Reservation> &reservations,
                                 const Property &property, const ForecastRequest &request) {
  const ReservationBounds bounds =
      request.bounds && !reservations.empty() ? *request.bounds : boundsOf(reservations);
  const std::optional<Date> newest = bounds.newest;
  if (!newest)
    throw AsOfError("there are no reservations to forecast from");
  if (request.asOf > *newest)
    throw AsOfError("reading date " + request.asOf.toIso() +
                    " is after the newest booking or cancellation in the data (" + newest->toIso() +
                    ")");
  if (request.horizon < 1)
    throw std::invalid_argument("the horizon must be 1 night or more");
  const bool isAuto = request.method == "auto";
  const std::vector<std::string> base =
      isAuto ? methodNames() : std::vector<std::string>{request.method};
  for (const auto &name : base)
    (void)makeMethod(name, request.methodOptions);

  const Date first = std::min(*newest, bounds.firstArrival.value_or(*newest));
  CubeOptions co;
  co.firstNight = std::min(first, request.asOf);
  co.lastNight = request.asOf + request.horizon;
  co.maxDba = request.horizon + 31; // as in Backtest::buildCube: room for the pace window
  co.by = request.by;
  co.asOf = request.asOf;
  co.newest = newest;
  const CurveCube *given = request.cube.get();
  const bool reuse = given && given->by() == co.by && given->firstNight() == co.firstNight &&
                     given->lastNight() == co.lastNight && given->maxDba() == co.maxDba &&
                     given->asOf() == request.asOf;
  const auto shared = reuse ? request.cube
                      : given && given->canNarrowTo(co)
                          ? std::make_shared<const CurveCube>(given->narrowed(co))
                          : std::make_shared<const CurveCube>(CurveCube::build(reservations, co));
  const CurveCube &cube = *shared;
  std::optional<std::size_t> only;
  if (request.series) {
    only = cube.seriesIndex(*request.series);
    if (!only) { // no such series in the data: nothing to forecast
      ForecastRun run;
      run.method = request.method;
      run.readingDate = request.asOf;
      run.parameters = Json{{"options", optionsJson(request)}, {"methods", base}}.dump();
      return run;
    }
  }

  // The evidence: a backtest whose outcomes are the windowDays nights up to asOf.
  BacktestOptions bo;
  bo.from = request.asOf - request.autoSelect.windowDays - request.horizon;
  bo.to = request.asOf - 1;
  bo.leads.clear();
  for (int h = 1; h <= request.horizon; ++h)
    bo.leads.push_back(h);
  bo.methods = base;
  bo.methodOptions = request.methodOptions;
  bo.warmUp = false;
  bo.withBands = false;
  bo.unconstrain = request.unconstrain;
  bo.censoring = request.censoring;
  bo.threads = request.threads;
  bo.series = only;

  // Auto's evidence in two parts, the same numbers as one backtest of every method over every
  // lead (tests/core/test_forecastrun.cpp compares them), at a fraction of the work: the choice
  // reads only the errors of nights in the selection window, but the bands and spreads of the
  // methods actually used read every night back to the calibration window. So the first part
  // backtests every method on the selection window's nights only, the choices and forecasts
  // are made, and the second part backtests each method that made a forecast over the lead
  // buckets it made them in. Each backtest row depends only on its reading date, method, series
  // and lead, so the rows are the same; the mlp nets of one reading date serve several
  // (MethodOptions::mlpRetrainDays > 1) only in the one-part backtest, which that keeps.
  // On the 1M benchmark property (365 nights) most of the work was training mlp nets (perf):
  // a net per lead and reading date, most of them for nights only the bands would read.
  const bool twoPart = isAuto && !request.fullEvidence && request.methodOptions.mlpRetrainDays <= 1;
  // Progress as a share of the whole (in thousandths) over the parts: the first part fills
  // the first half of the bar, each method of the second its share of the rest.
  struct Progress {
    const ForecastRequest *request;
    double from = 0, span = 1;
    static bool report(void *context, std::int64_t done, std::int64_t total) {
      const auto *p = static_cast<const Progress *>(context);
      const double share = total > 0 ? static_cast<double>(done) / static_cast<double>(total) : 1;
      return p->request->progress(p->request->progressContext,
                                  std::llround(1000.0 * (p->from + p->span * share)), 1000);
    }
  } progress{&request, 0, twoPart ? 0.5 : 1.0};
  if (request.progress) {
    bo.progress = &Progress::report;
    bo.progressContext = &progress;
  }
  if (twoPart)
    bo.firstNight = request.asOf - (request.autoSelect.windowDays - 1);
  BacktestResult past = Backtest::run(cube, property, bo);
  ForecastRun run;
  run.method = request.method;
  run.readingDate = request.asOf;
  if (request.keepCube)
    run.cube = shared;
  if (past.cancelled) {
    run.cancelled = true;
    return run;
  }
  const LeadBuckets buckets;
  std::vector<std::uint32_t> candidates(base.size());
  for (std::size_t i = 0; i < base.size(); ++i)
    candidates[i] = static_cast<std::uint32_t>(i);
  std::uint32_t fallback = 0;
  for (std::size_t i = 0; i < base.size(); ++i)
    if (base[i] == "pickup-add")
      fallback = static_cast<std::uint32_t>(i);

  // Choices and forecasts first; bands and spreads once every error they read is known.
  struct Made {
    ForecastValue value;
    std::uint32_t series = 0, method = 0;
    int bucket = 0;
  };
  std::vector<Made> made;
  Json params{{"options", optionsJson(request)}, {"methods", base}};
  Json evidence = Json::array();
  {
    const ErrorWindow window(past.rows, buckets);
    const AutoSelector selector(window, candidates, request.autoSelect);
    for (std::size_t si = 0; si < cube.series().size(); ++si) {
      if (only && si != *only)
        continue;
      // Fit each method once for this series; auto may use several across lead buckets.
      std::vector<std::unique_ptr<ForecastMethod>> methods;
      ForecastContext ctx(cube, si, request.asOf, property);
      std::vector<double> history;
      if (request.unconstrain) {
        static const CensorSources none;
        history = unconstrainedFinals(cube, si, request.asOf, property,
                                      request.censoring ? *request.censoring : none,
                                      *request.unconstrain);
        ctx.useHistory(&history);
      }
      for (const auto &name : base) {
        methods.push_back(makeMethod(name, request.methodOptions));
        methods.back()->fit(ctx);
      }
      int lastBucket = -1;
      std::vector<std::uint32_t> order;
      for (int h = 1; h <= request.horizon; ++h) {
        const Date s = request.asOf + h;
        const int b = buckets.bucketOf(h);
        if (b != lastBucket) {
          const AutoChoice choice =
              selector.choose(static_cast<std::uint32_t>(si), b, request.asOf);
          order.clear();
          for (const MethodEvidence &e : choice.evidence)
            order.push_back(e.method);
          if (std::find(order.begin(), order.end(), fallback) == order.end())
            order.push_back(fallback);
          if (isAuto) {
            Json list = Json::array();
            for (const MethodEvidence &e : choice.evidence)
              list.push_back({{"method", base[e.method]}, {"count", e.count}, {"error", e.error}});
            evidence.push_back({{"series", cube.series()[si]},
                                {"leads", buckets.label(b)},
                                {"chosen", choice.method ? Json(base[*choice.method]) : Json()},
                                {"evidence", list}});
          }
          lastBucket = b;
        }
        for (std::uint32_t m : order) {
          const std::optional<double> f = methods[m]->forecast(ctx, s);
          if (!f)
            continue;
          Made x;
          x.value.night = s;
          x.value.series = cube.series()[si];
          x.value.lead = h;
          x.value.otb = ctx.otbNow(s).value_or(0);
          x.value.forecast = *f;
          x.value.method = base[m];
          x.series = static_cast<std::uint32_t>(si);
          x.method = m;
          x.bucket = b;
          made.push_back(std::move(x));
          break;
        }
      }
    }
  }

  if (twoPart) {
    // The second part: per method used, its leads in the buckets it was used in, every night.
    std::map<std::uint32_t, std::set<int>> usedBuckets;
    for (const Made &x : made)
      usedBuckets[x.method].insert(x.bucket);
    std::vector<BacktestRow> rows;
    for (const BacktestRow &r : past.rows) // the first part's rows no second part replaces
      if (auto it = usedBuckets.find(r.method);
          it == usedBuckets.end() || !it->second.count(buckets.bucketOf(r.lead)))
        rows.push_back(r);
    progress.span = 0.5 / static_cast<double>(std::max<std::size_t>(usedBuckets.size(), 1));
    progress.from = 0.5 - progress.span;
    for (const auto &[m, used] : usedBuckets) {
      progress.from += progress.span;
      BacktestOptions more = bo;
      more.firstNight.reset();
      more.methods = {base[m]};
      more.leads.clear();
      for (int h = 1; h <= request.horizon; ++h)
        if (used.count(buckets.bucketOf(h)))
          more.leads.push_back(h);
      BacktestResult part = Backtest::run(cube, property, more);
      if (part.cancelled) {
        run.cancelled = true;
        return run;
      }
      for (BacktestRow r : part.rows) {
        r.method = m;
        rows.push_back(r);
      }
    }
    // The order of the one-part backtest, (t, method, series, h): ErrorWindow keeps equal keys
    // in the order given, and sums in that order.
    std::sort(rows.begin(), rows.end(), [](const BacktestRow &a, const BacktestRow &b) {
      return std::tie(a.reading, a.method, a.series, a.lead) <
             std::tie(b.reading, b.method, b.series, b.lead);
    });
    past.rows = std::move(rows);
  }

  const ErrorWindow window(past.rows, buckets);
  const ErrorBands bands(window, request.bands);
  for (Made &x : made) {
    ForecastValue &v = x.value;
    if (auto band = bands.band(x.series, x.method, x.bucket, request.asOf, v.forecast)) {
      v.lo = band->lo;
      v.hi = band->hi;
    }
    v.sd = rmsError(window, x.series, x.method, x.bucket, request.asOf, request.bands);
    run.values.push_back(std::move(v));
  }
  std::stable_sort(
      run.values.begin(), run.values.end(),
      [](const ForecastValue &a, const ForecastValue &b) { return a.night < b.night; });
  if (isAuto)
    params["auto"] = evidence;
  run.parameters = params.dump();
  return run;
}

std::string ForecastRun::dataVersionOf(Store &store, std::size_t reservations) {
  std::int64_t importId = 0;
  for (const ImportLogEntry &e : store.importLog())
    if (e.outcome.empty() || e.outcome == "written")
      importId = std::max(importId, e.id);
  return "import " + std::to_string(importId) + ", " + std::to_string(reservations) +
         " reservations";
}

std::int64_t ForecastRun::save(Store &store) {
  if (createdAt.empty())
    createdAt = nowUtc();
  SqliteDb &db = store.database();
  Store::Transaction tx(store);
  auto run = db.prepare("INSERT INTO forecast_runs (created_at, method, parameters, data_version, "
                        "reading_date) VALUES (?1, ?2, ?3, ?4, ?5)");
  run.bind(1, createdAt);
  run.bind(2, method);
  run.bind(3, parameters);
  run.bind(4, dataVersion);
  run.bind(5, readingDate);
  run.step();
  id = db.queryInt64("SELECT last_insert_rowid()");
  auto st = db.prepare("INSERT INTO forecast_values (run_id, night, series, lead, otb, forecast, "
                       "lo, hi, method, sd) VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10)",
                       true);
  for (const ForecastValue &v : values) {
    st.bind(1, id);
    st.bind(2, v.night);
    st.bind(3, v.series);
    st.bind(4, v.lead);
    st.bind(5, v.otb);
    st.bind(6, v.forecast);
    if (v.lo)
      st.bind(7, *v.lo);
    else
      st.bind(7, nullptr);
    if (v.hi)
      st.bind(8, *v.hi);
    else
      st.bind(8, nullptr);
    st.bind(9, v.method);
    if (v.sd)
      st.bind(10, *v.sd);
    else
      st.bind(10, nullptr);
    st.step();
  }
  tx.commit();
  return id;
}

std::vector<ForecastRun> ForecastRun::load(Store &store) {
  SqliteDb &db = store.database();
  std::vector<ForecastRun> runs;
  std::map<std::int64_t, std::size_t> at;
  auto st = db.prepare("SELECT id, created_at, method, parameters, data_version, reading_date "
                       "FROM forecast_runs ORDER BY id");
  while (st.step()) {
    ForecastRun r;
    r.id = st.columnInt64(0);
    r.createdAt = st.columnText(1);
    r.method = st.columnText(2);
    r.parameters = st.columnText(3);
    r.dataVersion = st.columnText(4);
    r.readingDate = st.columnDate(5);
    at[r.id] = runs.size();
    runs.push_back(std::move(r));
  }
  auto vs = db.prepare("SELECT run_id, night, series, lead, otb, forecast, lo, hi, method, sd "
                       "FROM "
                       "forecast_values ORDER BY run_id, night, rowid");
  while (vs.step()) {
    ForecastValue v;
    v.night = vs.columnDate(1);
    v.series = vs.columnText(2);
    v.lead = vs.columnInt(3);
    v.otb = vs.columnInt(4);
    v.forecast = vs.columnDouble(5);
    if (!vs.columnIsNull(6))
      v.lo = vs.columnDouble(6);
    if (!vs.columnIsNull(7))
      v.hi = vs.columnDouble(7);
    v.method = vs.columnText(8);
    if (!vs.columnIsNull(9))
      v.sd = vs.columnDouble(9);
    runs[at.at(vs.columnInt64(0))].values.push_back(std::move(v));
  }
  return runs;
}

} // namespace cb
