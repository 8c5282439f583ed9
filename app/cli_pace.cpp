// The pace verb: per future night and series, rooms on the books, pickup over the last 1, 7 and
// 15 days, and pace against the same time last year, as CSV.
#include "app/cliverbs.h"

#include "app/clicommon.h"

#include "core/curvecube.h"
#include "core/holidaymap.h"
#include "core/nativeformat.h"
#include "core/pace.h"
#include "core/pickup.h"
#include "core/store.h"

#include <fmt/format.h>

#include <array>
#include <cstdio>
#include <cstring>
#include <memory>

namespace cbcli {
namespace {

struct PaceArgs {
  std::string store, asOf, by = "total";
  int days = 90;
};

constexpr std::array<int, 3> kPickupDays = {1, 7, 15};

int runPace(const PaceArgs &a) {
  auto store = cb::Store::open(a.store);
  const std::vector<cb::Reservation> rows = store->reservations();
  const cb::Date asOf = *cb::Date::parseIso(a.asOf);
  const std::optional<cb::Date> newest = cb::newestActivity(rows);
  if (!newest) {
    fmt::print(stderr, "curvebench: {} has no reservations, so there is no pace yet\n", a.store);
    return kUsageOrIo;
  }
  if (asOf > *newest) {
    fmt::print(stderr,
               "curvebench: reading date {} is after the newest booking or cancellation in {} "
               "({}); nothing is known about later days, so choose {} or earlier\n",
               asOf.toIso(), a.store, newest->toIso(), newest->toIso());
    return kUsageOrIo;
  }

  cb::PaceOptions po;
  po.asOf = asOf;
  po.firstNight = asOf + 1;
  po.lastNight = asOf + a.days;
  po.by = *cb::parseSeriesBy(a.by);
  const cb::Pace pace =
      cb::Pace::build(rows, store->property(), cb::HolidayMap::fromEvents(store->events()), po);

  cb::PickupOptions pk;
  pk.asOf = asOf;
  pk.by = po.by;
  pk.lastNight = po.lastNight;
  for (int days : kPickupDays)
    pk.windows.push_back(cb::PickupWindow::lastDays(asOf, days));
  const cb::PickupSummary pickup = cb::PickupSummary::build(rows, pk);

  fmt::memory_buffer out;
  fmt::format_to(std::back_inserter(out), "stay_date,weekday,series,dba,otb");
  for (int days : kPickupDays)
    fmt::format_to(std::back_inserter(out),
                   ",pickup_{0}d_net,pickup_{0}d_gross,pickup_{0}d_cancelled", days);
  fmt::format_to(std::back_inserter(out), ",stly_night,stly_otb,diff_rooms,diff_pct\n");
  for (cb::Date s = pace.firstNight(); s <= pace.lastNight(); ++s) {
    for (std::size_t i = 0; i < pace.series().size(); ++i) {
      const std::string &name = pace.series()[i];
      const cb::PaceCell &c = pace.at(i, s);
      fmt::format_to(std::back_inserter(out), "{},{},{},{},{}", s.toIso(), weekdayName(s),
                     csvText(name), c.dba, c.otb);
      // Both come from the rows known at the reading date, so the series lists agree.
      const std::optional<std::size_t> pi = pickup.seriesIndex(name);
      for (std::size_t w = 0; w < kPickupDays.size(); ++w) {
        const cb::PickupSplit p = pi ? pickup.at(*pi, s, w) : cb::PickupSplit{};
        fmt::format_to(std::back_inserter(out), ",{},{},{}", p.net, p.gross, p.cancelled);
      }
      fmt::format_to(std::back_inserter(out), ",{},{},{},{}\n", c.stlyNight.toIso(),
                     c.stlyOtb ? fmt::format("{}", *c.stlyOtb) : "",
                     c.diffRooms ? fmt::format("{}", *c.diffRooms) : "",
                     c.diffPct ? fmt::format("{:.1f}", *c.diffPct) : "");
    }
  }
  std::fwrite(out.data(), 1, out.size(), stdout);
  if (std::fflush(stdout) != 0)
    throw std::runtime_error("cannot write standard output");
  return kOk;
}

} // namespace

void addPaceVerbs(CLI::App &app, VerbList &verbs) {
  auto a = std::make_shared<PaceArgs>();
  auto *pace = app.add_subcommand(
      "pace", "CSV per future night and series: rooms on the books, pickup over the last 1, 7 "
              "and 15 days (net, gross, cancelled), and the same time last year (STLY). "
              "diff_pct is empty when STLY is 0: a change from nothing has no percentage.");
  pace->add_option("STORE", a->store, "Store file")->required()->check(CLI::ExistingFile);
  pace->add_option("--as-of", a->asOf, "Reading date YYYY-MM-DD; nights after it are shown")
      ->required()
      ->check(CLI::Validator(
          [](std::string &text) {
            return cb::Date::parseIso(text) ? std::string() : "not a date (YYYY-MM-DD): " + text;
          },
          "DATE"));
  pace->add_option("--days", a->days, "Nights after the reading date (default 90)")
      ->check(CLI::Range(1, 3660));
  pace->add_option("--by", a->by, "Series: total (default), segment, channel or room-type")
      ->check(CLI::IsMember({"total", "segment", "channel", "room-type"}));
  verbs.push_back({pace, [a] { return runPace(*a); }});
}

} // namespace cbcli
