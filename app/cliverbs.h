// The verbs of the `curvebench` command line. Each group lives in its own file and registers
// its subcommands here; main() parses and runs the one chosen. Verbs only parse and print:
// the work is in core.
#pragma once

#include <CLI/CLI.hpp>

#include <functional>
#include <vector>

namespace cbcli {

// Exit codes (README): 0 ok, 1 data findings (rejected rows), 2 usage or I/O error.
constexpr int kOk = 0;
constexpr int kFindings = 1;
constexpr int kUsageOrIo = 2;

struct Verb {
  CLI::App *command;
  std::function<int()> run; ///< may throw; main() turns exceptions into exit code 2
};
using VerbList = std::vector<Verb>;

void addStoreVerbs(CLI::App &app, VerbList &verbs);    // init, import, info, sample (cli_store.cpp)
void addHealthVerbs(CLI::App &app, VerbList &verbs);   // health (cli_health.cpp)
void addCurveVerbs(CLI::App &app, VerbList &verbs);    // curves, finals (cli_curves.cpp)
void addPaceVerbs(CLI::App &app, VerbList &verbs);     // pace (cli_pace.cpp)
void addForecastVerbs(CLI::App &app, VerbList &verbs); // forecast, backtest, override
void addUnconstrainVerbs(CLI::App &app, VerbList &verbs); // unconstrain (cli_unconstrain.cpp)
void addOutlookVerbs(CLI::App &app, VerbList &verbs);     // outlook, protect (cli_outlook.cpp)
void addOverbookVerbs(CLI::App &app, VerbList &verbs);    // overbook (cli_overbook.cpp)
void addSettingsVerbs(CLI::App &app, VerbList &verbs);    // settings (cli_settings.cpp)
void addGroupVerbs(CLI::App &app, VerbList &verbs);       // import-blocks, groups (cli_groups.cpp)
void addDisplaceVerbs(CLI::App &app, VerbList &verbs);    // displace (cli_displace.cpp)
void addBriefVerbs(CLI::App &app, VerbList &verbs);       // brief (cli_brief.cpp; GUI build)

} // namespace cbcli
