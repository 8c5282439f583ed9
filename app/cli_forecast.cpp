// The forecast, backtest and override verbs: forecasts with error bands as CSV, a rolling-origin
// backtest with its accuracy summary, and expert overrides of nights.
#include "app/cliverbs.h"

#include "app/clicommon.h"

#include "core/backtest.h"
#include "core/forecastrun.h"
#include "core/nativeformat.h"
#include "core/propertysettings.h"
#include "core/store.h"

#include <fmt/format.h>

#include <cstdio>
#include <cstring>
#include <fstream>
#include <memory>
#include <sstream>

namespace cbcli {
namespace {

struct MethodFlags {
  int refs = 8, mavgK = 4, paceWindow = 7, mlpRetrainDays = 1;
  bool refsSeasonal = false, naiveHistory = false;
  std::string criterion = "mae";

  cb::MethodOptions options() const {
    cb::MethodOptions o;
    o.references = refs;
    o.seasonalReferences = refsSeasonal;
    o.movingAverageK = mavgK;
    o.paceWindow = paceWindow;
    o.mlpRetrainDays = mlpRetrainDays;
    return o;
  }
};

struct ForecastArgs {
  std::string store, asOf, method = "auto", by = "total", out;
  int horizon = 90;
  MethodFlags flags;
};

struct BacktestArgs {
  std::string store, from, to, leads = "1,3,7,14,30,60,90", methods = "all", by = "total";
  std::string detail, summary;
  int step = 1;
  MethodFlags flags;
};

struct OverrideArgs {
  std::string store, night, segment, reason, author;
  double value = 0;
};

std::vector<std::string> splitList(const std::string &text) {
  std::vector<std::string> out;
  std::stringstream in(text);
  std::string item;
  while (std::getline(in, item, ','))
    if (!item.empty())
      out.push_back(item);
  return out;
}

void addMethodFlags(CLI::App *cmd, MethodFlags &f) {
  cmd->add_option("--refs", f.refs, "Pickup: reference nights, N most recent same weekday (8)")
      ->check(CLI::Range(1, 104));
  cmd->add_flag("--refs-seasonal", f.refsSeasonal,
                "Pickup: references around the same night last year (s - 364 ± 4 weeks)");
  cmd->add_option("--mavg-k", f.mavgK, "mavg: same-weekday finals averaged (4)")
      ->check(CLI::Range(1, 104));
  cmd->add_option("--pace-window", f.paceWindow, "pace-extrap: window w in days (7 or 15)")
      ->check(CLI::IsMember({7, 15}));
  cmd->add_option("--mlp-retrain-days", f.mlpRetrainDays,
                  "mlp: in a backtest (and auto's evidence), train the nets once per block of this "
                  "many days and reuse them for the block's later reading dates (1 = at every "
                  "reading date, the default; 7 is about 7 times faster)")
      ->check(CLI::Range(1, 28));
  cmd->add_option("--criterion", f.criterion,
                  "auto: error that picks the method: mae (default), rmse, wape, abs-bias")
      ->check(CLI::IsMember({"mae", "rmse", "wape", "abs-bias"}));
  cmd->add_flag("--naive-history", f.naiveHistory,
                "Train on the finals as observed, not on unconstrained history (the default, "
                "unless the property's settings turn it off)");
}

/// "Methods:" with every name and its one-line description, for --help.
std::string methodHelp() {
  std::string text = "Methods:\n";
  for (const auto &name : cb::methodNames()) {
    std::string description;
    try {
      description = cb::makeMethod(name)->description();
    } catch (const std::exception &e) {
      description = e.what();
    }
    text += fmt::format("  {:<13}{}\n", name, description);
  }
  text += fmt::format("  {:<13}{}\n", "auto",
                      "Per series and lead bucket, the method with the lowest error over the last "
                      "8 weeks of nights already final at the reading date.");
  return text;
}

int runForecast(const ForecastArgs &a) {
  std::vector<cb::Reservation> rows;
  auto store = openWithRows(a.store, rows);
  cb::ForecastRequest req;
  req.asOf = *cb::Date::parseIso(a.asOf);
  req.horizon = a.horizon;
  req.method = a.method;
  req.by = *cb::parseSeriesBy(a.by);
  req.methodOptions = a.flags.options();
  req.autoSelect.criterion = *cb::parseCriterion(a.flags.criterion);
  const cb::Property property = store->property();
  const cb::CensorSources sources = censorSources(*store);
  req.unconstrain = cb::historyOptions(property, a.flags.naiveHistory);
  req.censoring = &sources;
  cb::ForecastRun run = cb::ForecastRun::compute(rows, property, req);
  run.dataVersion = cb::ForecastRun::dataVersionOf(*store, rows.size());
  const std::int64_t id = run.save(*store);

  fmt::memory_buffer out;
  fmt::format_to(std::back_inserter(out), "stay_date,series,h,otb,forecast,lo,hi,method\n");
  for (const cb::ForecastValue &v : run.values)
    fmt::format_to(std::back_inserter(out), "{},{},{},{},{:.2f},{},{},{}\n", v.night.toIso(),
                   csvText(v.series), v.lead, v.otb, v.forecast, num(v.lo), num(v.hi), v.method);
  emit(a.out, out);
  fmt::print(stderr, "curvebench: forecast run {} stored in {}\n", id, a.store);
  return kOk;
}

int runBacktest(const BacktestArgs &a) {
  const cb::SeriesBy by = *cb::parseSeriesBy(a.by);
  CubeSource source(a.store, by == cb::SeriesBy::Total);
  if (!source.kept() && source.reservations().empty())
    throw std::runtime_error(a.store +
                             " has no reservations, so there is nothing to forecast from");
  cb::Store *store = &source.store();
  cb::BacktestOptions o;
  o.from = *cb::Date::parseIso(a.from);
  o.to = *cb::Date::parseIso(a.to);
  o.step = a.step;
  o.leads.clear();
  for (const auto &item : splitList(a.leads)) {
    int h = 0;
    if (std::sscanf(item.c_str(), "%d", &h) != 1 || h < 1 || std::to_string(h) != item)
      throw CLI::ValidationError("--leads", "not a lead in days (1 or more): " + item);
    o.leads.push_back(h);
  }
  o.methods = a.methods == "all" ? cb::methodNames() : splitList(a.methods);
  if (a.methods == "all")
    o.methods.push_back("auto");
  o.methodOptions = a.flags.options();
  o.autoSelect.criterion = *cb::parseCriterion(a.flags.criterion);
  if (o.to < o.from)
    throw std::runtime_error("--from " + a.from + " is after --to " + a.to);
  // The kept cube holds the backtest's cube unless the leads reach past it.
  const cb::CurveCube cube =
      source.kept() ? source.cube(cb::Backtest::cubeOptions(source.kept()->bounds, o, by))
                    : cb::Backtest::buildCube(source.reservations(), o, by);
  const cb::Property property = store->property();
  o.unconstrain = cb::historyOptions(property, a.flags.naiveHistory);
  // Only unconstraining reads closures and denials (the 1M property's 77,791 denials were a
  // sixth of this command's time with the history taken as observed).
  const cb::CensorSources sources = o.unconstrain ? censorSources(*store) : cb::CensorSources{};
  o.censoring = &sources;
  const cb::BacktestResult r = cb::Backtest::run(cube, property, o);

  std::vector<cb::OverrideValue> ov;
  for (const cb::ForecastOverride &x : cb::overrides(*store))
    ov.push_back({x.night, x.segment.empty() ? std::string("ALL") : x.segment, x.value});

  if (!a.detail.empty()) {
    fmt::memory_buffer out;
    fmt::format_to(std::back_inserter(out),
                   "stay_date,reading_date,series,h,method,forecast,final\n");
    for (const cb::BacktestRow &row : r.rows)
      fmt::format_to(std::back_inserter(out), "{},{},{},{},{},{:.2f},{}\n", row.night.toIso(),
                     row.reading.toIso(), csvText(r.series[row.series]), row.lead,
                     r.methods[row.method], row.forecast, row.final);
    emit(a.detail, out);
  }
  fmt::memory_buffer out;
  fmt::format_to(std::back_inserter(out), "series,method,h,count,mae,rmse,mape,wape,bias,mase,"
                                          "coverage,overrides,fva\n");
  for (const cb::BacktestSummaryRow &s : cb::Backtest::summarize(r, ov)) {
    const cb::Accuracy &m = s.accuracy;
    fmt::format_to(std::back_inserter(out), "{},{},{},{},{:.3f},{:.3f},{},{},{:.3f},{},{},{},{}\n",
                   csvText(r.series[s.series]), r.methods[s.method], s.lead, m.count, m.mae, m.rmse,
                   num(m.mape, 3), num(m.wape, 3), m.bias, num(m.mase, 3), num(s.coverage, 3),
                   s.overridden, num(s.valueAdded, 3));
  }
  emit(a.summary, out);
  return kOk;
}

int runOverride(const OverrideArgs &a) {
  auto store = cb::Store::open(a.store);
  cb::ForecastOverride o;
  o.night = *cb::Date::parseIso(a.night);
  o.segment = a.segment;
  o.value = a.value;
  o.reason = a.reason;
  o.author = a.author;
  const std::int64_t id = cb::addOverride(*store, o);
  fmt::print("override {} stored: {} {} = {}\n", id, o.night.toIso(),
             o.segment.empty() ? std::string("ALL") : o.segment, o.value);
  return kOk;
}

} // namespace

void addForecastVerbs(CLI::App &app, VerbList &verbs) {
  const std::string methods = methodHelp();

  auto f = std::make_shared<ForecastArgs>();
  auto *fc = app.add_subcommand(
      "forecast",
      "CSV per future night and series: rooms on the books, the forecast of the final, its 80 % "
      "band (10 %-90 % type-7 quantiles of the method's errors at the same lead bucket, from a "
      "backtest whose outcomes are the 8 weeks up to the reading date) and the method. The run "
      "is stored in the store with its parameters and data version.");
  fc->footer(methods);
  fc->add_option("STORE", f->store, "Store file")->required()->check(CLI::ExistingFile);
  fc->add_option("--as-of", f->asOf, "Reading date YYYY-MM-DD")->required()->check(dateCheck());
  fc->add_option("--horizon", f->horizon, "Nights after the reading date (default 90)")
      ->check(CLI::Range(1, 365));
  fc->add_option("--method", f->method, "A method name below, or auto (default)");
  fc->add_option("--by", f->by, "Series: total (default), segment, channel or room-type")
      ->check(CLI::IsMember({"total", "segment", "channel", "room-type"}));
  fc->add_option("--out", f->out, "Write the CSV to this file instead of standard output");
  addMethodFlags(fc, f->flags);
  verbs.push_back({fc, [f] { return runForecast(*f); }});

  auto b = std::make_shared<BacktestArgs>();
  auto *bt = app.add_subcommand(
      "backtest",
      "Rolling-origin backtest: for each reading date and lead, every method forecasts the "
      "night from the data as of that date only. Summary CSV per series, method and lead: "
      "count, MAE, RMSE, MAPE % (finals > 0), WAPE %, bias (forecast - final, positive = too "
      "high), MASE (against the lag-7 naive error of the finals before --from), coverage of the "
      "80 % band, and over nights with an override, fva = MAE of the method - MAE of the "
      "override.");
  bt->footer(methods);
  bt->add_option("STORE", b->store, "Store file")->required()->check(CLI::ExistingFile);
  bt->add_option("--from", b->from, "First reading date")->required()->check(dateCheck());
  bt->add_option("--to", b->to, "Last reading date")->required()->check(dateCheck());
  bt->add_option("--step", b->step, "Days between reading dates (default 1)")
      ->check(CLI::Range(1, 365));
  bt->add_option("--leads", b->leads, "Leads in days (default 1,3,7,14,30,60,90)");
  bt->add_option("--methods", b->methods, "Comma-separated method names, or all (default)");
  bt->add_option("--by", b->by, "Series: total (default), segment, channel or room-type")
      ->check(CLI::IsMember({"total", "segment", "channel", "room-type"}));
  bt->add_option("--detail", b->detail,
                 "Write every forecast: stay_date,reading_date,series,h,method,forecast,final");
  bt->add_option("--summary", b->summary, "Write the summary here instead of standard output");
  addMethodFlags(bt, b->flags);
  verbs.push_back({bt, [b] { return runBacktest(*b); }});

  auto o = std::make_shared<OverrideArgs>();
  auto *ov = app.add_subcommand(
      "override", "Stores an expert's value for a night (and segment) with a reason; backtest "
                  "reports its forecast value added.");
  ov->add_option("STORE", o->store, "Store file")->required()->check(CLI::ExistingFile);
  ov->add_option("--night", o->night, "Stay night")->required()->check(dateCheck());
  ov->add_option("--value", o->value, "Rooms expected")->required()->check(CLI::NonNegativeNumber);
  ov->add_option("--segment", o->segment, "Segment code (default: the whole hotel)");
  ov->add_option("--reason", o->reason, "Why")->required();
  ov->add_option("--author", o->author, "Who");
  verbs.push_back({ov, [o] { return runOverride(*o); }});
}

} // namespace cbcli
