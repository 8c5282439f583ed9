// The brief verb: the one-page morning brief PDF from the command line. It paints with Qt, so
// the painting is a program of its own, curvebench-brief (app/brief_main.cpp), built with the GUI
// (CURVEBENCH_BUILD_GUI=ON) beside curvebench, which runs it: the command line itself links no
// Qt. Without it (a core-only build), the verb says so and exits with 2.
#include "app/cliverbs.h"

#include "app/clicommon.h"

#include <fmt/format.h>

#include <cerrno>
#include <cstdio>
#include <cstring>
#include <filesystem>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#if defined(__unix__) || defined(__APPLE__)
#include <unistd.h>
#define CURVEBENCH_HAS_EXEC 1
#else
#define CURVEBENCH_HAS_EXEC 0
#endif

namespace cbcli {
namespace {

struct BriefArgs {
  std::string store, asOf, out;
};

/// curvebench-brief beside this program (Linux: /proc/self/exe); nullopt when there is none.
std::optional<std::string> briefBeside() {
  std::error_code ec;
  const std::filesystem::path self = std::filesystem::read_symlink("/proc/self/exe", ec);
  if (ec)
    return std::nullopt;
  const std::filesystem::path beside = self.parent_path() / "curvebench-brief";
  if (!std::filesystem::exists(beside, ec))
    return std::nullopt;
  return beside.string();
}

int runBrief(const BriefArgs &a) {
#if CURVEBENCH_HAS_EXEC
  // Beside this program, else on PATH (a system without /proc).
  const std::optional<std::string> beside = briefBeside();
  const std::string program = beside.value_or("curvebench-brief");
  std::vector<std::string> args = {program, a.store, "--out", a.out}; // the store first, always
  if (!a.asOf.empty()) {
    args.push_back("--as-of");
    args.push_back(a.asOf);
  }
  std::vector<char *> argv;
  for (std::string &arg : args)
    argv.push_back(arg.data());
  argv.push_back(nullptr);
  std::fflush(stdout);
  std::fflush(stderr);
  ::execvp(program.c_str(), argv.data()); // returns only when it could not run
  if (beside || errno != ENOENT) {
    fmt::print(stderr, "curvebench brief: cannot run {}: {}\n", program, std::strerror(errno));
    return kUsageOrIo;
  }
#else
  (void)a;
#endif
  fmt::print(stderr, "curvebench brief: this curvebench was built without the GUI "
                     "(CURVEBENCH_BUILD_GUI=OFF), so curvebench-brief is not beside it; the "
                     "morning brief needs the GUI build\n");
  return kUsageOrIo;
}

} // namespace

void addBriefVerbs(CLI::App &app, VerbList &verbs) {
  auto a = std::make_shared<BriefArgs>();
  auto *b = app.add_subcommand(
      "brief", "One-page morning brief as PDF: the next 14 nights (table and chart), notable "
               "pickups, likely sell-outs and pace alerts, with the advisory caution. Needs the "
               "GUI build (CURVEBENCH_BUILD_GUI=ON); no display is needed.");
  b->add_option("STORE", a->store, "Store file")->required()->check(CLI::ExistingFile);
  b->add_option("--as-of", a->asOf, "Reading date YYYY-MM-DD (default: the newest activity)")
      ->check(dateCheck());
  b->add_option("--out", a->out, "The PDF file to write")->required();
  verbs.push_back({b, [a] { return runBrief(*a); }});
}

} // namespace cbcli
