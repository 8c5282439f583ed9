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

namespace cb {
namespace {

using Json = nlohmann::ordered_json;

std::string nowUtc() {
  return date::format("%FT%TZ",
                      std::chrono::floor<std::chrono::seconds>(std::chrono::system_clock::now()));
}

Json optionsJson(const ForecastRequest &r) {
  const MethodOptions &m = r.methodOptions;
  return Json{{"horizon", r.horizon},
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
  const std::optional<Date> newest = newestActivity(reservations);
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

  Date first = *newest;
  for (const Reservation &r : reservations)
    first = std::min(first, r.arrival);
  CubeOptions co;
  co.firstNight = std::min(first, request.asOf);
  co.lastNight = request.asOf + request.horizon;
  co.maxDba = request.horizon + 31; // as in Backtest::buildCube: room for the pace window
  co.by = request.by;
  co.asOf = request.asOf;
  const CurveCube cube = CurveCube::build(reservations, co);

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
  bo.progress = request.progress;
  bo.progressContext = request.progressContext;
  const BacktestResult past = Backtest::run(cube, property, bo);
  ForecastRun run;
  run.method = request.method;
  run.readingDate = request.asOf;
  if (past.cancelled) {
    run.cancelled = true;
    return run;
  }
  const LeadBuckets buckets;
  const ErrorWindow window(past.rows, buckets);
  const ErrorBands bands(window, request.bands);
  std::vector<std::uint32_t> candidates(base.size());
  for (std::size_t i = 0; i < base.size(); ++i)
    candidates[i] = static_cast<std::uint32_t>(i);
  const AutoSelector selector(window, candidates, request.autoSelect);
  std::uint32_t fallback = 0;
  for (std::size_t i = 0; i < base.size(); ++i)
    if (base[i] == "pickup-add")
      fallback = static_cast<std::uint32_t>(i);

  Json params{{"options", optionsJson(request)}, {"methods", base}};
  Json evidence = Json::array();
  for (std::size_t si = 0; si < cube.series().size(); ++si) {
    // Fit each method once for this series; auto may use several across lead buckets.
    std::vector<std::unique_ptr<ForecastMethod>> methods;
    ForecastContext ctx(cube, si, request.asOf, property);
    std::vector<double> history;
    if (request.unconstrain) {
      static const CensorSources none;
      history =
          unconstrainedFinals(cube, si, request.asOf, property,
                              request.censoring ? *request.censoring : none, *request.unconstrain);
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
        const AutoChoice choice = selector.choose(static_cast<std::uint32_t>(si), b, request.asOf);
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
        ForecastValue v;
        v.night = s;
        v.series = cube.series()[si];
        v.lead = h;
        v.otb = ctx.otbNow(s).value_or(0);
        v.forecast = *f;
        v.method = base[m];
        if (auto band = bands.band(static_cast<std::uint32_t>(si), m, b, request.asOf, *f)) {
          v.lo = band->lo;
          v.hi = band->hi;
        }
        v.sd = rmsError(window, static_cast<std::uint32_t>(si), m, b, request.asOf, request.bands);
        run.values.push_back(std::move(v));
        break;
      }
    }
  }
  std::stable_sort(
      run.values.begin(), run.values.end(),
      [](const ForecastValue &a, const ForecastValue &b) { return a.night < b.night; });
  if (isAuto)
    params["auto"] = evidence;
  run.parameters = params.dump();
  return run;
}

std::string ForecastRun::dataVersionOf(Store &store) {
  std::int64_t importId = 0;
  for (const ImportLogEntry &e : store.importLog())
    if (e.outcome.empty() || e.outcome == "written")
      importId = std::max(importId, e.id);
  return "import " + std::to_string(importId) + ", " + std::to_string(store.reservationCount()) +
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
