// curvebench — the headless command line: registers the verbs and runs the one chosen.
#include "app/cliverbs.h"

#include <fmt/format.h>

#include <cstdio>

int main(int argc, char **argv) {
  CLI::App app{"curvebench — booking curves, forecasts and decisions for hotel revenue managers.\n"
               "Exit codes: 0 ok, 1 data findings (rejected rows), 2 usage or I/O error."};
  app.require_subcommand(1);
  app.set_version_flag("--version", std::string("curvebench ") + CURVEBENCH_VERSION);

  cbcli::VerbList verbs;
  cbcli::addStoreVerbs(app, verbs);
  cbcli::addHealthVerbs(app, verbs);
  cbcli::addCurveVerbs(app, verbs);
  cbcli::addPaceVerbs(app, verbs);
  cbcli::addForecastVerbs(app, verbs);
  cbcli::addUnconstrainVerbs(app, verbs);
  cbcli::addOutlookVerbs(app, verbs);
  cbcli::addOverbookVerbs(app, verbs);
  cbcli::addSettingsVerbs(app, verbs);
  cbcli::addGroupVerbs(app, verbs);
  cbcli::addDisplaceVerbs(app, verbs);
  cbcli::addBriefVerbs(app, verbs);

  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError &e) {
    int rc = app.exit(e);
    return rc == 0 ? cbcli::kOk : cbcli::kUsageOrIo;
  }

  try {
    for (const auto &verb : verbs)
      if (verb.command->parsed())
        return verb.run();
  } catch (const std::exception &e) {
    fmt::print(stderr, "curvebench: {}\n", e.what());
    return cbcli::kUsageOrIo;
  }
  return cbcli::kUsageOrIo;
}
