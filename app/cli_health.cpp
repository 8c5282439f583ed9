// The health verb: data findings of a store, one per line.
#include "app/cliverbs.h"

#include "core/datahealth.h"
#include "core/store.h"

#include <fmt/format.h>

#include <algorithm>
#include <memory>

namespace cbcli {
namespace {

struct HealthArgs {
  std::string store;
  int gapDays = cb::HealthOptions{}.gapDays;
};

int runHealth(const HealthArgs &a) {
  auto store = cb::Store::open(a.store);
  cb::HealthOptions options;
  options.gapDays = a.gapDays;
  const cb::Findings findings = cb::checkDataHealth(*store, options);
  for (const auto &f : findings)
    fmt::print("{}\n", f.toString());
  if (findings.empty())
    fmt::print("{}: no findings\n", a.store);
  const bool warnings = std::any_of(findings.begin(), findings.end(), [](const cb::Finding &f) {
    return f.severity != cb::Severity::Info;
  });
  return warnings ? kFindings : kOk;
}

} // namespace

void addHealthVerbs(CLI::App &app, VerbList &verbs) {
  auto a = std::make_shared<HealthArgs>();
  auto *health = app.add_subcommand(
      "health", "Data findings: start and end of the data, booking gaps, empty nights, nights "
                "over capacity, segments not set up (exit 1 when there are warnings)");
  health->add_option("STORE", a->store, "Store file")->required()->check(CLI::ExistingFile);
  health
      ->add_option("--gap-days", a->gapDays,
                   "Report runs of at least this many days with no booking made (default 7)")
      ->check(CLI::Range(1, 3650));
  verbs.push_back({health, [a] { return runHealth(*a); }});
}

} // namespace cbcli
