// curvebench-brief — paints the one-page morning brief PDF (ui/morningbrief.h) for
// `curvebench brief`, which runs it with arguments it has already checked: STORE --out FILE
// [--as-of DATE], the store always first. A program of its own so that the command line links no
// Qt: loading Qt's libraries cost every other verb about 40 ms at start-up (measured: `curvebench
// --version`, 54 ms with them). No display is needed (Qt's offscreen platform unless
// QT_QPA_PLATFORM says otherwise).
#include "core/advice.h"
#include "ui/morningbrief.h"
#include "ui/workbenchsession.h"

#include <QApplication>
#include <QDate>
#include <QString>

#include <fmt/format.h>

#include <cstdlib>
#include <cstring>
#include <exception>
#include <string>

int main(int argc, char **argv) {
  // The store first, always (its name may look like an option), then the options.
  std::string store = argc > 1 ? argv[1] : "", asOf, out;
  for (int i = 2; i + 1 < argc; i += 2) {
    if (std::strcmp(argv[i], "--out") == 0)
      out = argv[i + 1];
    else if (std::strcmp(argv[i], "--as-of") == 0)
      asOf = argv[i + 1];
  }
  if (store.empty() || out.empty()) {
    fmt::print(stderr, "usage: curvebench-brief STORE --out FILE.pdf [--as-of YYYY-MM-DD] (run "
                       "through `curvebench brief`)\n");
    return 2;
  }
  const char *platform = std::getenv("QT_QPA_PLATFORM");
  if (!platform || !*platform)
    setenv("QT_QPA_PLATFORM", "offscreen", 1); // no display needed
  int qtArgc = 1;
  static char name[] = "curvebench";
  char *qtArgv[] = {name, nullptr};
  QApplication app(qtArgc, qtArgv); // the chart is a QCustomPlot widget, painted offscreen
  try {
    auto session = cbui::WorkbenchSession::open(store);
    QDate date;
    if (!asOf.empty())
      date = QDate::fromString(QString::fromStdString(asOf), Qt::ISODate);
    const std::string used = asOf.empty() ? session->readingDate().toIso() : asOf;
    QString error;
    if (!cbui::renderMorningBrief(*session, date, QString::fromStdString(out), &error)) {
      fmt::print(stderr, "curvebench brief: {}\n", error.toStdString());
      return 2;
    }
    fmt::print("morning brief as of {} ({} nights, lists over {} nights) written to {}\n", used,
               cbui::kBriefNights, cbui::kBriefLookahead, out);
    fmt::print("{}\n", cb::kAdvisoryCaution);
    return 0;
  } catch (const std::exception &e) {
    fmt::print(stderr, "curvebench: {}\n", e.what());
    return 2;
  }
}
