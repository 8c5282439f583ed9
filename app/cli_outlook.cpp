// The outlook and protect verbs: unconstrained demand against capacity per future night (brief
// section 6) with minimum-stay hints, and segment protection levels and booking limits, from a
// file of demand to come or from the store's forecasts by segment. Each carries the advisory
// caution of core/advice.h.
#include "app/cliverbs.h"

#include "app/clicommon.h"

#include "core/advice.h"
#include "core/csvreader.h"
#include "core/nativeformat.h"
#include "core/outlook.h"
#include "core/store.h"

#include <fmt/format.h>

#include <charconv>
#include <cmath>
#include <cstdio>
#include <cstring>
#include <fstream>
#include <map>
#include <memory>

namespace cbcli {
namespace {

struct OutlookArgs {
  std::string store, asOf, method = cb::OutlookOptions{}.method, out;
  int days = 90;
  bool naiveHistory = false;
};

struct ProtectArgs {
  std::string input, night, asOf, method = "emsrb", forecastMethod = cb::OutlookOptions{}.method;
  std::string out;
  std::optional<int> capacity;
  int sold = 0;
  bool naiveHistory = false;
};

std::string join(const std::vector<std::string> &items, const char *sep) {
  std::string out;
  for (const auto &i : items)
    out += (out.empty() ? "" : sep) + i;
  return out;
}

int runOutlook(const OutlookArgs &a) {
  std::vector<cb::Reservation> rows;
  auto store = openWithRows(a.store, rows);
  const cb::Property property = store->property();
  cb::OutlookOptions o;
  o.asOf = *cb::Date::parseIso(a.asOf);
  o.days = a.days;
  o.method = a.method;
  if (a.naiveHistory)
    o.unconstrained = false;
  const cb::Outlook ol =
      cb::computeOutlook(rows, property, censorSources(*store), store->events(), o);

  fmt::memory_buffer out;
  const auto put = std::back_inserter(out);
  fmt::format_to(
      put,
      "night,weekday,event,capacity,otb,stly_otb,forecast,lo,hi,sd,constrained,spill,p_sellout,"
      "occupancy,adr,revpar,season,flags,method\n");
  for (const cb::OutlookNight &n : ol.nights)
    fmt::format_to(
        put,
        "{},{},{},{},{},{},{:.2f},{},{},{:.2f},{:.2f},{:.2f},{:.4f},{:.4f},{:.2f},{:.2f},{},{},{}"
        "\n",
        n.night.toIso(), weekdayName(n.night), csvText(n.event), n.capacity, n.otb,
        n.stlyOtb ? std::to_string(*n.stlyOtb) : std::string(), n.forecast, num(n.lo), num(n.hi),
        n.sd, n.constrained, n.spill, n.pSellout, n.occupancy, n.adr, n.revpar,
        cb::seasonName(n.season), csvText(join(n.flags, ";")), n.method);
  emit(a.out, out);

  std::FILE *notes = notesStream(a.out);
  const int left = a.days - static_cast<int>(ol.nights.size());
  fmt::print(notes, "outlook as of {}: {} nights, method {}, {} history{}\n", ol.asOf.toIso(),
             ol.nights.size(), ol.method, ol.unconstrained ? "unconstrained" : "observed",
             left > 0 ? fmt::format(" ({} nights without a forecast left out)", left) : "");
  if (ol.minStays.empty())
    fmt::print(notes, "minimum-stay hints: none\n");
  else
    fmt::print(notes, "minimum-stay hints ({}):\n", ol.minStays.size());
  for (const cb::MinStayHint &h : ol.minStays)
    fmt::print(notes, "  min stay {} nights across {}: {}\n", h.minStay, h.night.toIso(),
               h.evidence);
  fmt::print(notes, "{}\n", cb::kAdvisoryCaution);
  return kOk;
}

/// A number of the demand file, or a finding at its field.
std::optional<double> parseNumber(const cb::CsvField &f, const std::string &file, std::int64_t line,
                                  int column, const char *name, cb::Findings &findings) {
  double v = 0;
  const char *begin = f.text.data(), *end = begin + f.text.size();
  const auto [ptr, ec] = std::from_chars(begin, end, v);
  if (f.text.empty() || ec != std::errc() || ptr != end || !std::isfinite(v)) {
    findings.push_back({cb::Severity::Error, file, line, column,
                        fmt::format("{}: not a number: \"{}\"", name, f.text)});
    return std::nullopt;
  }
  return v;
}

/// Reads segment,rate,mean,sd (columns in any order; others ignored). Findings are located as
/// file:line:column, column = the field's number in the header (as the importer reports).
std::vector<cb::ClassDemand> readDemandFile(const std::string &path, cb::Findings &findings) {
  std::ifstream in(path, std::ios::binary);
  if (!in)
    throw std::runtime_error("cannot open " + path);
  cb::CsvReader reader(in, path);
  cb::CsvRecord rec;
  std::vector<cb::ClassDemand> classes;
  std::vector<int> col;
  if (!readTableHeader(reader, rec, path, {"segment", "rate", "mean", "sd"}, 4,
                       "segment,rate,mean,sd", col, findings))
    return classes;
  std::map<std::string, std::int64_t> seen;
  while (reader.next(rec)) {
    if (!tableRecordOk(reader, rec, path, findings))
      continue;
    const auto field = [&](int k) -> const cb::CsvField & {
      return rec.fields[static_cast<std::size_t>(col[k] - 1)];
    };
    cb::ClassDemand d;
    d.code = field(0).text;
    const std::size_t before = findings.size();
    if (d.code.empty())
      findings.push_back({cb::Severity::Error, path, field(0).line, col[0], "segment is empty"});
    else if (auto [it, added] = seen.try_emplace(d.code, rec.line); !added)
      findings.push_back(
          {cb::Severity::Error, path, field(0).line, col[0],
           fmt::format("segment \"{}\" is listed twice (first on line {})", d.code, it->second)});
    const auto rate = parseNumber(field(1), path, field(1).line, col[1], "rate", findings);
    const auto mean = parseNumber(field(2), path, field(2).line, col[2], "mean", findings);
    const auto sd = parseNumber(field(3), path, field(3).line, col[3], "sd", findings);
    if (rate && !(*rate > 0))
      findings.push_back(
          {cb::Severity::Error, path, field(1).line, col[1], "rate must be above 0"});
    if (mean && *mean < 0)
      findings.push_back({cb::Severity::Error, path, field(2).line, col[2], "mean must be >= 0"});
    if (sd && *sd < 0)
      findings.push_back({cb::Severity::Error, path, field(3).line, col[3], "sd must be >= 0"});
    if (findings.size() != before)
      continue;
    d.rate = *rate;
    d.mean = *mean;
    d.sd = *sd;
    classes.push_back(std::move(d));
  }
  if (reader.fatal())
    findings.push_back(*reader.fatal());
  else if (classes.empty() && findings.empty())
    findings.push_back({cb::Severity::Error, path, 1, 0, "no segment rows after the header"});
  return classes;
}

void writeProtection(const cb::ProtectionResult &r, const std::vector<int> *segmentOtb,
                     const std::string &path) {
  fmt::memory_buffer out;
  const auto put = std::back_inserter(out);
  fmt::format_to(
      put, "rank,segment,rate,mean,sd,protection_level,protected_rooms,booking_limit,status{}\n",
      segmentOtb ? ",otb" : "");
  for (std::size_t i = 0; i < r.lines.size(); ++i) {
    const cb::ProtectionLine &l = r.lines[i];
    fmt::format_to(put, "{},{},{:.2f},{:.2f},{:.2f},{},{},{},{}", l.rank, csvText(l.demand.code),
                   l.demand.rate, l.demand.mean, l.demand.sd, num(l.protectionLevel),
                   l.protectedRooms ? std::to_string(*l.protectedRooms) : std::string(),
                   l.bookingLimit, l.open ? "open" : "closed");
    if (segmentOtb)
      fmt::format_to(put, ",{}", (*segmentOtb)[i]);
    fmt::format_to(put, "\n");
  }
  emit(path, out);
}

const char *methodLabel(cb::ProtectionMethod m) {
  return m == cb::ProtectionMethod::EmsrB ? "EMSR-b" : "EMSR-a";
}

int runProtect(const ProtectArgs &a) {
  const cb::ProtectionMethod method =
      a.method == "emsra" ? cb::ProtectionMethod::EmsrA : cb::ProtectionMethod::EmsrB;
  std::FILE *notes = notesStream(a.out);
  if (a.night.empty()) {
    // The file form: demand to come given by the user.
    if (!a.capacity)
      throw CLI::ValidationError(
          "--capacity", "give --capacity (and --sold) with a FILE, or --night with a STORE");
    if (!a.asOf.empty())
      throw CLI::ValidationError("--as-of", "--as-of goes with a STORE and --night");
    cb::Findings findings;
    cb::ProtectionInput in;
    in.capacity = *a.capacity;
    in.sold = a.sold;
    in.method = method;
    in.classes = readDemandFile(a.input, findings);
    if (cb::hasErrors(findings)) {
      for (const cb::Finding &f : findings)
        fmt::print(stderr, "{}\n", f.toString());
      return kFindings;
    }
    const cb::ProtectionResult r = cb::protect(in);
    writeProtection(r, nullptr, a.out);
    fmt::print(notes, "{}: capacity {}, sold {}, remaining {}\n", methodLabel(method), in.capacity,
               in.sold, r.remaining);
    fmt::print(notes, "{}\n", cb::kAdvisoryCaution);
    return kOk;
  }

  // The store form: demand to come from the store's forecasts by segment.
  if (a.capacity)
    throw CLI::ValidationError("--capacity",
                               "the capacity of a stored night comes from the store; give "
                               "--capacity only with a FILE");
  std::vector<cb::Reservation> rows;
  auto store = openWithRows(a.input, rows);
  const cb::Date night = *cb::Date::parseIso(a.night);
  const cb::Date asOf = a.asOf.empty() ? *cb::newestActivity(rows) : *cb::Date::parseIso(a.asOf);
  cb::OutlookOptions o;
  o.asOf = asOf;
  o.method = a.forecastMethod;
  if (a.naiveHistory)
    o.unconstrained = false;
  const cb::NightProtection np =
      cb::protectNight(rows, store->property(), censorSources(*store), asOf, night, method, o);
  writeProtection(np.result, &np.segmentOtb, a.out);
  fmt::print(notes, "{} for {} as of {} (forecast {}): capacity {}, sold {}, remaining {}\n",
             methodLabel(method), night.toIso(), asOf.toIso(), o.method, np.capacity, np.sold,
             np.result.remaining);
  for (const std::string &n : np.notes)
    fmt::print(notes, "{}\n", n);
  fmt::print(notes, "{}\n", cb::kAdvisoryCaution);
  return kOk;
}

} // namespace

void addOutlookVerbs(CLI::App &app, VerbList &verbs) {
  auto a = std::make_shared<OutlookArgs>();
  auto *ol = app.add_subcommand(
      "outlook",
      "CSV per future night: capacity, rooms on the books (and STLY at the same lead), the "
      "forecast of unconstrained demand D with its 80 % band and spread sd (from the method's "
      "backtest errors at that lead), then against capacity C with D normal: constrained rooms "
      "E[min(D, C)], spill E[(D - C)+], p_sellout P(D >= C), occupancy = constrained / C (0-1), "
      "ADR (revenue on the books plus the rooms still to come at the recent pickup rate for that "
      "lead), RevPAR = constrained x ADR / C, season (peak, shoulder, low by forecast / C) and "
      "flags (full, sell-out likely, weak, pace up, pace down, min stay). Minimum-stay hints and "
      "the caution follow on standard error (on standard output with --out).");
  ol->add_option("STORE", a->store, "Store file")->required()->check(CLI::ExistingFile);
  ol->add_option("--as-of", a->asOf, "Reading date YYYY-MM-DD")->required()->check(dateCheck());
  ol->add_option("--days", a->days, "Nights after the reading date (default 90)")
      ->check(CLI::Range(1, 365));
  ol->add_option("--method", a->method,
                 "Forecast method (default " + a->method +
                     ", fast and accurate; auto backtests every method and takes a minute)");
  ol->add_flag("--naive-history", a->naiveHistory,
               "Train on the finals as observed, not on unconstrained history");
  ol->add_option("--out", a->out, "Write the CSV to this file instead of standard output");
  verbs.push_back({ol, [a] { return runOutlook(*a); }});

  auto p = std::make_shared<ProtectArgs>();
  auto *pr = app.add_subcommand(
      "protect",
      "Nested protection levels (EMSR-b, or EMSR-a) over segments ranked by rate, booking limits "
      "and open/closed given the rooms sold. Either `protect FILE.csv --capacity C [--sold N]`, "
      "FILE with columns segment,rate,mean,sd (demand still to come), or `protect STORE --night "
      "DATE [--as-of DATE]`: each segment's demand to come is its forecast less its rooms on the "
      "books, its rate its ADR over the 365 nights up to the reading date.");
  pr->add_option("INPUT", p->input, "Demand CSV file, or a store with --night")
      ->required()
      ->check(CLI::ExistingFile);
  pr->add_option("--capacity", p->capacity, "File form: rooms of the night")
      ->check(CLI::Range(0, 100000));
  pr->add_option("--sold", p->sold, "File form: rooms already sold, all segments (default 0)")
      ->check(CLI::Range(0, 100000));
  pr->add_option("--night", p->night, "Store form: the stay night")->check(dateCheck());
  pr->add_option("--as-of", p->asOf, "Store form: reading date (default: the newest activity)")
      ->check(dateCheck());
  pr->add_option("--method", p->method, "emsrb (default) or emsra")
      ->check(CLI::IsMember({"emsrb", "emsra"}));
  pr->add_option("--forecast-method", p->forecastMethod,
                 "Store form: forecast method (default " + p->forecastMethod + ")");
  pr->add_flag("--naive-history", p->naiveHistory,
               "Store form: train on the finals as observed, not on unconstrained history");
  pr->add_option("--out", p->out, "Write the CSV to this file instead of standard output");
  verbs.push_back({pr, [p] { return runProtect(*p); }});
}

} // namespace cbcli
