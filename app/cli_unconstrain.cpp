// The unconstrain verb: the censored history nights (sold out or closed) with the demand
// estimated behind them, as CSV; or, given the true demand (a simulated property knows it), how
// far each method's estimates are from it on the censored nights.
#include "app/cliverbs.h"

#include "app/clicommon.h"

#include "core/csvreader.h"
#include "core/curvecube.h"
#include "core/nativeformat.h"
#include "core/store.h"
#include "core/unconstrain.h"

#include <fmt/format.h>

#include <cstdio>
#include <cstring>
#include <fstream>
#include <map>
#include <memory>

namespace cbcli {
namespace {

struct UnconstrainArgs {
  std::string store, asOf, by = "total", method, truth, out;
  bool noDenials = false;
};

/// True demand per (night, series) from a file laid out like sample_property/true_demand.csv
/// (night,segment,unconstrained_room_nights,sold_room_nights); the total ("ALL") sums segments.
std::map<std::pair<cb::Date, std::string>, double> readTruth(const std::string &path) {
  std::ifstream in(path, std::ios::binary);
  if (!in)
    throw std::runtime_error("cannot read " + path);
  cb::CsvReader reader(in, path);
  cb::CsvRecord rec;
  std::map<std::pair<cb::Date, std::string>, double> out;
  bool header = true;
  while (reader.next(rec)) {
    if (header) {
      header = false;
      if (rec.size() < 3 || rec[0] != "night" || rec[1] != "segment" ||
          rec[2] != "unconstrained_room_nights")
        throw std::runtime_error(path + ":1: expected the header night,segment," +
                                 "unconstrained_room_nights,… (as in true_demand.csv)");
      continue;
    }
    const std::optional<cb::Date> night =
        rec.size() >= 3 ? cb::Date::parseIso(rec[0]) : std::nullopt;
    char *end = nullptr;
    const double demand = night ? std::strtod(rec[2].c_str(), &end) : 0.0;
    if (!night || end == rec[2].c_str() || *end != '\0' || !rec.problem.empty())
      throw std::runtime_error(
          fmt::format("{}:{}: expected a date and a number of room-nights", path, rec.line));
    out[{*night, rec[1].empty() ? std::string("(none)") : rec[1]}] += demand;
    out[{*night, "ALL"}] += demand;
  }
  if (reader.fatal())
    throw std::runtime_error(reader.fatal()->toString());
  return out;
}

int runUnconstrain(const UnconstrainArgs &a) {
  auto store = cb::Store::open(a.store);
  const std::vector<cb::Reservation> rows = store->reservations();
  const std::optional<cb::Date> newest = cb::newestActivity(rows);
  if (!newest) {
    fmt::print(stderr, "curvebench: {} has no reservations, so there is no history yet\n", a.store);
    return kUsageOrIo;
  }
  std::optional<cb::Date> firstNight;
  for (const cb::Reservation &r : rows)
    if (!r.isDayUse() && (!firstNight || r.arrival < *firstNight))
      firstNight = r.arrival;
  if (!firstNight)
    throw std::runtime_error(a.store + " has only day-use reservations, which occupy no night");
  const cb::Date asOf = a.asOf.empty() ? *newest : *cb::Date::parseIso(a.asOf);
  if (asOf < *firstNight)
    throw std::runtime_error(fmt::format("reading date {} is before the first night stayed ({})",
                                         asOf.toIso(), firstNight->toIso()));

  const cb::Property property = store->property();
  cb::UnconstrainOptions options;
  options.seasons = property.settings.seasons;
  options.useDenials = !a.noDenials;
  const std::string methodName = a.method.empty() ? property.settings.unconstrainMethod : a.method;
  const std::optional<cb::UnconstrainMethod> method = cb::parseUnconstrainMethod(methodName);
  if (!method)
    throw std::runtime_error("unknown unconstraining method '" + methodName +
                             "' (the property's setting); use --method em, pd or naive");
  options.method = *method;
  const cb::CensorSources sources{store->closures(), store->denials()};
  // A year of depth: a split series needs the booking curves to tell when the hotel filled
  // (UnconstrainOptions::minLateShare). The cube refuses a reading
  // date after the newest booking or cancellation, with its own message.
  const cb::CurveCube cube =
      cb::CurveCube::build(rows, {*firstNight, asOf, 365, *cb::parseSeriesBy(a.by), asOf});

  fmt::memory_buffer out;
  auto to = std::back_inserter(out);
  if (a.truth.empty()) {
    std::vector<std::vector<cb::NightDemand>> all;
    for (std::size_t i = 0; i < cube.series().size(); ++i)
      all.push_back(cb::unconstrainSeries(cube, i, asOf, property, sources, options));
    fmt::format_to(to, "night,series,final,reason,denied,estimate,group\n");
    for (std::size_t k = 0; k < all.front().size(); ++k)
      for (std::size_t i = 0; i < all.size(); ++i) {
        const cb::NightDemand &n = all[i][k];
        if (n.reason == cb::CensorReason::None)
          continue;
        fmt::format_to(to, "{},{},{:.0f},{},{:.0f},{:.2f},{}\n", n.night.toIso(),
                       csvText(cube.series()[i]), n.final,
                       n.reason == cb::CensorReason::Full ? "full" : "closed", n.denied, n.estimate,
                       csvText(n.group));
      }
    emit(a.out, out);
    return kOk;
  }

  // Comparison with the truth: every method, with and without denials.
  const auto truth = readTruth(a.truth);
  fmt::format_to(to, "series,method,nights,mae,bias\n");
  for (std::size_t i = 0; i < cube.series().size(); ++i) {
    const std::string &name = cube.series()[i];
    for (cb::UnconstrainMethod m : {cb::UnconstrainMethod::None, cb::UnconstrainMethod::Em,
                                    cb::UnconstrainMethod::ProjectionDetruncation})
      for (bool denials : {false, true}) {
        if (m == cb::UnconstrainMethod::None && denials)
          continue;
        cb::UnconstrainOptions o = options;
        o.method = m;
        o.useDenials = denials;
        const auto nights = cb::unconstrainSeries(cube, i, asOf, property, sources, o);
        std::vector<std::optional<double>> known;
        known.reserve(nights.size());
        for (const cb::NightDemand &n : nights) {
          const auto it = truth.find({n.night, name});
          known.push_back(it == truth.end() ? std::nullopt : std::optional(it->second));
        }
        const cb::UnconstrainScore s = cb::scoreAgainstTruth(
            std::string(cb::unconstrainMethodName(m)) + (denials ? "+denials" : ""), nights, known);
        fmt::format_to(to, "{},{},{},{:.2f},{:.2f}\n", csvText(name), s.method, s.nights, s.mae,
                       s.bias);
      }
  }
  emit(a.out, out);
  return kOk;
}

} // namespace

void addUnconstrainVerbs(CLI::App &app, VerbList &verbs) {
  auto a = std::make_shared<UnconstrainArgs>();
  auto *cmd = app.add_subcommand(
      "unconstrain",
      "Censored history nights and the demand behind them, as CSV: "
      "night,series,final,reason,denied,estimate,group. A night is censored when the hotel's "
      "final reached capacity within the sell-out margin (reason full) or a sales closure of "
      "the hotel or the series' segment stood (closed). The estimate fits normal demand to "
      "comparable nights (weekday × season of the month) — expectation–maximisation (em) or "
      "projection detruncation (pd) — and adds logged denials and regrets. With --truth, a "
      "table instead: series,method,nights,mae,bias of every method on the censored nights.");
  cmd->add_option("STORE", a->store, "Store file")->required()->check(CLI::ExistingFile);
  cmd->add_option("--as-of", a->asOf,
                  "Reading date: only what was known at the end of this day is used (default: "
                  "the newest booking or cancellation)")
      ->check(CLI::Validator(
          [](std::string &text) {
            return cb::Date::parseIso(text) ? std::string() : "not a date (YYYY-MM-DD): " + text;
          },
          "DATE"));
  cmd->add_option("--by", a->by,
                  "Series: total (default) or segment — the total (ALL) followed by one series "
                  "per segment")
      ->check(CLI::IsMember({"total", "segment"}));
  cmd->add_option("--method", a->method,
                  "em (expectation–maximisation), pd (projection detruncation) or naive (the "
                  "final as is); default: the property's setting")
      ->check(CLI::IsMember({"em", "pd", "naive"}));
  cmd->add_flag("--no-denials", a->noDenials,
                "Do not add logged denials and regrets to the estimates");
  cmd->add_option("--truth", a->truth,
                  "CSV of true demand (night,segment,unconstrained_room_nights,…, as the sample "
                  "property's true_demand.csv): print MAE and bias of naive, em, pd, em+denials "
                  "and pd+denials on the censored nights instead")
      ->check(CLI::ExistingFile);
  cmd->add_option("--out", a->out, "Write the CSV to this file instead of standard output");
  verbs.push_back({cmd, [a] { return runUnconstrain(*a); }});
}

} // namespace cbcli
