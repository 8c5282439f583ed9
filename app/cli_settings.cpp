// The settings verb: shows and changes the property's decision settings (season bands,
// unconstraining, overbooking costs) and its sell-out margin, so `outlook`, `protect`,
// `overbook` and the forecasts can be tuned without the GUI.
#include "app/cliverbs.h"

#include "core/propertysettings.h"
#include "core/store.h"

#include <fmt/format.h>

#include <memory>
#include <optional>
#include <string>

namespace cbcli {
namespace {

struct SettingsArgs {
  std::string store;
  std::optional<double> shoulder, peak, walkCost, margin, tentative;
  std::optional<int> lateCancelDays;
  std::optional<std::string> history;
};

void print(const cb::Property &p) {
  const cb::PropertySettings &s = p.settings;
  fmt::print("property          {}\n", p.name);
  fmt::print("sell-out margin   {:.1f} % (a night within this share of capacity counts as full)\n",
             100 * p.selloutMargin);
  fmt::print("season bands      low below {:.0f} %, shoulder from {:.0f} %, peak from {:.0f} % "
             "(unconstrained demand / capacity)\n",
             100 * s.seasons.shoulderFrom, 100 * s.seasons.shoulderFrom, 100 * s.seasons.peakFrom);
  fmt::print("history           {}\n",
             !s.unconstrainHistory ? std::string("as observed (forecasts learn from the finals)")
                                   : "unconstrained by " + s.unconstrainMethod +
                                         " (forecasts learn from estimated demand on full nights)");
  fmt::print("walk cost         {}\n", s.walkCost > 0
                                           ? fmt::format("{:.2f} {}", s.walkCost, p.currency)
                                           : std::string("not set (overbook needs --walk-cost)"));
  fmt::print("late cancellation {} days or fewer before arrival\n", s.lateCancelDays);
  fmt::print("tentative blocks  count at {:.0f} % of their expected rooms (groups)\n",
             100 * s.tentativeProbability);
}

int runSettings(const SettingsArgs &a) {
  auto store = cb::Store::open(a.store);
  cb::Property p = store->property();
  const bool change = a.shoulder || a.peak || a.walkCost || a.margin || a.lateCancelDays ||
                      a.history || a.tentative;
  if (a.shoulder)
    p.settings.seasons.shoulderFrom = *a.shoulder / 100;
  if (a.peak)
    p.settings.seasons.peakFrom = *a.peak / 100;
  if (a.walkCost)
    p.settings.walkCost = *a.walkCost;
  if (a.margin)
    p.selloutMargin = *a.margin / 100;
  if (a.lateCancelDays)
    p.settings.lateCancelDays = *a.lateCancelDays;
  if (a.tentative)
    p.settings.tentativeProbability = *a.tentative / 100;
  if (a.history) {
    p.settings.unconstrainHistory = *a.history != "observed";
    if (p.settings.unconstrainHistory)
      p.settings.unconstrainMethod = *a.history;
  }
  if (p.settings.seasons.peakFrom < p.settings.seasons.shoulderFrom)
    throw CLI::ValidationError("--peak-from",
                               fmt::format("peak from {:g} % must be at least shoulder from {:g} %",
                                           100 * p.settings.seasons.peakFrom,
                                           100 * p.settings.seasons.shoulderFrom));
  if (change) {
    if (auto msg = cb::validateSettings(p.settings); !msg.empty())
      throw CLI::ValidationError("settings", msg);
    store->setProperty(p);
    p = store->property();
  }
  print(p);
  return kOk;
}

} // namespace

void addSettingsVerbs(CLI::App &app, VerbList &verbs) {
  auto a = std::make_shared<SettingsArgs>();
  auto *cmd = app.add_subcommand(
      "settings", "Show, or change, the property's decision settings (given options only)");
  cmd->add_option("STORE", a->store, "Store file")->required()->check(CLI::ExistingFile);
  cmd->add_option("--shoulder-from", a->shoulder,
                  "Season bands: a night is shoulder from this % of capacity (70)")
      ->check(CLI::Range(0.0, 1000.0));
  cmd->add_option("--peak-from", a->peak, "Season bands: peak from this % of capacity (90)")
      ->check(CLI::Range(0.0, 1000.0));
  cmd->add_option("--sellout-margin", a->margin,
                  "A night within this % of capacity counts as full (2)")
      ->check(CLI::Range(0.0, 100.0));
  cmd->add_option("--history", a->history,
                  "What forecasts learn from: em or pd (unconstrained, default em), or observed")
      ->check(CLI::IsMember({"em", "pd", "observed"}));
  cmd->add_option("--walk-cost", a->walkCost,
                  "Cost of walking a guest, in the property's currency (overbooking)")
      ->check(CLI::Range(0.0, 1e9));
  cmd->add_option("--late-cancel-days", a->lateCancelDays,
                  "A cancellation this many days or fewer before arrival is late (2)")
      ->check(CLI::Range(0, 365));
  cmd->add_option("--tentative-probability", a->tentative,
                  "Groups: a tentative block's expected rooms count at this % (50, no source: "
                  "set the share of your tentative blocks that turn definite)")
      ->check(CLI::Range(0.0, 100.0));
  verbs.push_back({cmd, [a] { return runSettings(*a); }});
}

} // namespace cbcli
