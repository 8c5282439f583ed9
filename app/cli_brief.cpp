// The brief verb: the one-page morning brief PDF (ui/morningbrief.h) from the command line, with
// no display needed (Qt's offscreen platform unless QT_QPA_PLATFORM says otherwise). It paints
// with Qt, so it is built only with the GUI (CURVEBENCH_BUILD_GUI=ON, which defines
// CURVEBENCH_HAS_BRIEF); a core-only curvebench says so and exits with 2.
#include "app/cliverbs.h"

#include "app/clicommon.h"

#include "core/advice.h"

#ifdef CURVEBENCH_HAS_BRIEF
#include "ui/morningbrief.h"
#include "ui/workbenchsession.h"

#include <QApplication>
#include <QDate>
#include <QString>
#endif

#include <fmt/format.h>

#include <cstdlib>
#include <memory>
#include <string>

namespace cbcli {
namespace {

struct BriefArgs {
  std::string store, asOf, out;
};

int runBrief(const BriefArgs &a) {
#ifdef CURVEBENCH_HAS_BRIEF
  const char *platform = std::getenv("QT_QPA_PLATFORM");
  if (!platform || !*platform)
    setenv("QT_QPA_PLATFORM", "offscreen", 1); // no display needed
  static int argc = 1;
  static char name[] = "curvebench";
  static char *argv[] = {name, nullptr};
  QApplication app(argc, argv); // the chart is a QCustomPlot widget, painted offscreen

  auto session = cbui::WorkbenchSession::open(a.store);
  QDate asOf;
  if (!a.asOf.empty())
    asOf = QDate::fromString(QString::fromStdString(a.asOf), Qt::ISODate);
  const std::string used = a.asOf.empty() ? session->readingDate().toIso() : a.asOf;
  QString error;
  if (!cbui::renderMorningBrief(*session, asOf, QString::fromStdString(a.out), &error)) {
    fmt::print(stderr, "curvebench brief: {}\n", error.toStdString());
    return kUsageOrIo;
  }
  fmt::print("morning brief as of {} ({} nights, lists over {} nights) written to {}\n", used,
             cbui::kBriefNights, cbui::kBriefLookahead, a.out);
  fmt::print("{}\n", cb::kAdvisoryCaution);
  return kOk;
#else
  (void)a;
  fmt::print(stderr, "curvebench brief: this curvebench was built without the GUI "
                     "(CURVEBENCH_BUILD_GUI=OFF); the morning brief needs the GUI build\n");
  return kUsageOrIo;
#endif
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
