// The displace verb: the displacement check of a group offer read from a small CSV, against the
// store's split forecast, per night (shoulder nights included) and in total, with the caution.
#include "app/clicommon.h"
#include "app/cliverbs.h"

#include "core/advice.h"
#include "core/csvreader.h"
#include "core/displacement.h"

#include <fmt/format.h>

#include <charconv>
#include <cmath>
#include <fstream>
#include <map>
#include <memory>
#include <string>

namespace cbcli {
namespace {

struct DisplaceArgs {
  std::string store, offer, asOf, method = cb::OutlookOptions{}.method, out;
  bool naiveHistory = false;
};

constexpr const char *kOfferColumns[] = {"night", "rooms", "rate", "other_revenue", "cost"};

/// Reads night,rooms,rate[,other_revenue][,cost] (any order; other columns ignored). Findings at
/// file:line:column.
std::vector<cb::OfferNight> readOffer(const std::string &path, cb::Findings &findings) {
  std::ifstream in(path, std::ios::binary);
  if (!in)
    throw std::runtime_error("cannot open " + path);
  cb::CsvReader reader(in, path);
  cb::CsvRecord rec;
  std::vector<cb::OfferNight> offer;
  std::vector<int> col;
  if (!readTableHeader(reader, rec, path, {std::begin(kOfferColumns), std::end(kOfferColumns)}, 3,
                       "night,rooms,rate and may add other_revenue,cost", col, findings))
    return offer;
  std::map<cb::Date, std::int64_t> seen;
  while (reader.next(rec)) {
    if (!tableRecordOk(reader, rec, path, findings))
      continue;
    const std::size_t before = findings.size();
    auto number = [&](int k, double fallback) -> double {
      if (col[k] == 0)
        return fallback;
      const cb::CsvField &f = rec.fields[static_cast<std::size_t>(col[k] - 1)];
      double v = 0;
      const char *b = f.text.data(), *e = b + f.text.size();
      const auto [ptr, ec] = std::from_chars(b, e, v);
      if (f.text.empty() || ec != std::errc() || ptr != e || !std::isfinite(v) || v < 0) {
        findings.push_back(
            {cb::Severity::Error, path, f.line, col[k],
             fmt::format("{}: not a number of at least 0: \"{}\"", kOfferColumns[k], f.text)});
        return 0;
      }
      return v;
    };
    cb::OfferNight o;
    const cb::CsvField &nightField = rec.fields[static_cast<std::size_t>(col[0] - 1)];
    if (auto night = cb::Date::parseIso(nightField.text)) {
      o.night = *night;
      if (auto [it, added] = seen.try_emplace(o.night, rec.line); !added)
        findings.push_back({cb::Severity::Error, path, nightField.line, col[0],
                            fmt::format("night {} is listed twice (first on line {})",
                                        o.night.toIso(), it->second)});
    } else {
      findings.push_back({cb::Severity::Error, path, nightField.line, col[0],
                          fmt::format("night: not a date YYYY-MM-DD: \"{}\"", nightField.text)});
    }
    const double rooms = number(1, 0);
    if (rooms != std::floor(rooms) || rooms > 100000)
      findings.push_back({cb::Severity::Error, path, rec.line, col[1],
                          "rooms: a whole number of rooms is needed"});
    o.rooms = static_cast<int>(rooms);
    o.rate = number(2, 0);
    o.otherRevenue = number(3, 0);
    o.cost = number(4, 0);
    if (findings.size() == before)
      offer.push_back(o);
  }
  if (reader.fatal())
    findings.push_back(*reader.fatal());
  else if (offer.empty() && findings.empty())
    findings.push_back({cb::Severity::Error, path, 1, 0, "no nights after the header"});
  return offer;
}

int runDisplace(const DisplaceArgs &a) {
  cb::Findings findings;
  const std::vector<cb::OfferNight> offer = readOffer(a.offer, findings);
  if (!findings.empty()) {
    for (const auto &f : findings)
      fmt::print(stderr, "{}\n", f.toString());
    return kFindings;
  }
  std::vector<cb::Reservation> rows;
  auto store = openWithRows(a.store, rows);
  cb::OutlookOptions o;
  o.asOf = *cb::Date::parseIso(a.asOf);
  o.method = a.method;
  if (a.naiveHistory)
    o.unconstrained = false;
  for (const auto &n : offer)
    if (n.night <= o.asOf)
      throw CLI::ValidationError("--offer", fmt::format("night {} is not after the reading date {}",
                                                        n.night.toIso(), o.asOf.toIso()));
  const cb::Displacement d =
      cb::displacementFromData(rows, store->blockRecords(), store->property(),
                               censorSources(*store), store->events(), offer, o);
  fmt::memory_buffer out;
  const auto put = std::back_inserter(out);
  fmt::format_to(put, "night,weekday,kind,capacity,group_rooms,capacity_left,left_with_offer,"
                      "transient_mean,transient_sd,transient_otb,transient_rate,offer_rooms,"
                      "offer_rate,group_value,displaced_rooms,displaced_value,net,verdict,notes\n");
  for (const cb::DisplacementNight &n : d.nights) {
    std::string notes;
    for (const auto &s : n.notes)
      notes += (notes.empty() ? "" : "; ") + s;
    const char *verdict = n.shoulder ? (n.net < 0 ? "loses" : "even")
                                     : (n.net > 0 ? "group pays" : "displaces more than it pays");
    fmt::format_to(put,
                   "{},{},{},{},{:.2f},{:.2f},{:.2f},{:.2f},{:.2f},{},{:.2f},{},{:.2f},{:.2f},"
                   "{:.2f},{:.2f},{:.2f},{},{}\n",
                   n.night.toIso(), weekdayName(n.night), n.shoulder ? "shoulder" : "offer",
                   n.input.capacity, n.input.groupRooms, n.capacityLeft, n.leftWithOffer,
                   n.input.transientMean, n.input.transientSd, n.input.transientOtb,
                   n.input.transientRate, n.offer.rooms, n.offer.rate, n.groupValue,
                   n.displacedRooms, n.displacedValue, n.net, verdict, csvText(notes));
  }
  emit(a.out, out);
  std::FILE *notes = notesStream(a.out);
  fmt::print(notes,
             "offer as of {}: group value {:.2f}, displaced transient value {:.2f}, net {:+.2f} "
             "(shoulder nights included; {:.0f} % of transient room-nights go on to the next "
             "night)\n",
             o.asOf.toIso(), d.groupValue, d.displacedValue, d.net, 100 * d.continuationShare);
  if (d.breakEvenRate)
    fmt::print(notes, "break-even group rate: {:.2f} per room-night\n", *d.breakEvenRate);
  fmt::print(notes, "verdict: {}\n",
             d.worthIt ? "the group brings more than the transient business it displaces"
                       : "the group displaces more transient value than it brings: decline or "
                         "re-price");
  fmt::print(notes, "{}\n", cb::kAdvisoryCaution);
  return kOk;
}

} // namespace

void addDisplaceVerbs(CLI::App &app, VerbList &verbs) {
  auto a = std::make_shared<DisplaceArgs>();
  auto *cmd = app.add_subcommand(
      "displace",
      "Displacement check of a group offer. The offer CSV has the columns night (YYYY-MM-DD), "
      "rooms, rate (per room-night) and optionally other_revenue and cost (per room-night: "
      "meals and meeting rooms; commission and amenities). For each night, and the shoulder "
      "nights before and after, the transient rooms displaced E[min(D, L)] - E[min(D, L - "
      "rooms)] (D the transient demand, normal from the split forecast; L the capacity left "
      "after the groups already held) times the transient ADR of the last 365 nights, against "
      "rooms x (rate + other_revenue - cost). CSV per night; totals, break-even rate, verdict "
      "and the caution follow on standard error (on standard output with --out).");
  cmd->add_option("STORE", a->store, "Store file")->required()->check(CLI::ExistingFile);
  cmd->add_option("--offer", a->offer, "Offer CSV")->required()->check(CLI::ExistingFile);
  cmd->add_option("--as-of", a->asOf, "Reading date YYYY-MM-DD")->required()->check(dateCheck());
  cmd->add_option("--method", a->method, "Transient forecast method (default " + a->method + ")");
  cmd->add_flag("--naive-history", a->naiveHistory,
                "Train on the transient finals as observed, not unconstrained");
  cmd->add_option("--out", a->out, "Write the CSV to this file instead of standard output");
  verbs.push_back({cmd, [a] { return runDisplace(*a); }});
}

} // namespace cbcli
