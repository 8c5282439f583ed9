#include "core/storereport.h"

#include "core/textformat.h"

#include <fmt/format.h>

#include <algorithm>

namespace cb {
namespace {

std::string dateOr(const std::optional<Date> &d) { return d ? d->toIso() : "-"; }

void appendCounts(std::string &out, const char *title, const std::map<std::string, std::int64_t> &m,
                  std::int64_t total) {
  out += fmt::format("{}\n", title);
  std::size_t width = 8;
  for (const auto &[k, v] : m)
    width = std::max(width, k.size());
  for (const auto &[k, v] : m)
    out +=
        fmt::format("  {:<{}}  {:>9}  {:>7}\n", k.empty() ? "(none)" : k, width, formatCount(v),
                    total > 0 ? formatPercent(static_cast<double>(v) / static_cast<double>(total))
                              : std::string("-"));
}

} // namespace

std::string formatStoreInfo(Store &store) {
  Property p = store.property();
  StoreSummary s = store.summary();
  std::string out;
  out += fmt::format("Property      {}\n", p.name);
  out += fmt::format("Store         {}\n", store.path().string());
  out += fmt::format("Capacity      {} rooms", formatCount(p.capacity));
  for (const auto &c : p.capacityChanges)
    out += fmt::format("; {} from {}{}", formatCount(c.rooms), c.from.toIso(),
                       c.reason.empty() ? "" : " (" + c.reason + ")");
  out += "\n";
  out += fmt::format("Currency      {}\n", p.currency);
  out += fmt::format("STLY          {}\n", p.stly == StlyAlignment::Weekday364
                                               ? "364 days back (same weekday)"
                                               : "same calendar date");
  out += fmt::format("Reservations  {} ({} day-use)\n", formatCount(s.reservations),
                     formatCount(s.dayUse));
  out += fmt::format("Arrivals      {} to {}\n", dateOr(s.firstArrival), dateOr(s.lastArrival));
  out += fmt::format("Booked        {} to {}\n", dateOr(s.firstBooked), dateOr(s.lastBooked));
  out += fmt::format("Data as of    {} (newest booking or cancellation)\n", dateOr(s.lastActivity));
  out += fmt::format("Group blocks  {}   Denials/regrets  {}   Events  {}\n", formatCount(s.blocks),
                     formatCount(s.denials), formatCount(s.events));
  out += "\n";
  appendCounts(out, "By status", s.byStatus, s.reservations);
  appendCounts(out, "By segment", s.bySegment, s.reservations);
  appendCounts(out, "By channel", s.byChannel, s.reservations);
  auto log = store.importLog();
  out += "\nImport log\n";
  if (log.empty())
    out += "  (no imports yet)\n";
  for (const auto &e : log) {
    std::string outcome = e.outcome == "written"     ? "written"
                          : e.outcome == "cancelled" ? "CANCELLED (nothing written)"
                                                     : "FAILED (nothing written)";
    out += fmt::format("  #{} {} {} {} [{}, {}] read {} added {} updated {} unchanged {} "
                       "rejected {} sha256 {}\n",
                       e.id, e.finishedAt.empty() ? e.startedAt : e.finishedAt, outcome, e.file,
                       e.profile, e.mode, formatCount(e.rowsRead), formatCount(e.added),
                       formatCount(e.updated), formatCount(e.unchanged), formatCount(e.rejected),
                       e.sha256.substr(0, 12));
  }
  return out;
}

std::string formatImportReport(const ImportReport &report) {
  const auto &l = report.log;
  std::string out;
  for (const auto &f : report.findings)
    out += f.toString() + "\n";
  std::string verdict = report.cancelled ? "cancelled, nothing written"
                        : report.written ? "written"
                                         : "nothing written";
  out += fmt::format("{}: read {} rows, added {}, updated {}, unchanged {}, rejected {} ({})\n",
                     l.file, formatCount(l.rowsRead), formatCount(l.added), formatCount(l.updated),
                     formatCount(l.unchanged), formatCount(l.rejected), verdict);
  return out;
}

} // namespace cb
