// curvebench-gui — opens the workbench on a store (default: the sample property, built on
// first run in the user's data folder).
#include "ui/datapanel.h"
#include "ui/mainwindow.h"

#include <QApplication>
#include <QCommandLineParser>
#include <QDir>
#include <QProgressBar>
#include <QStandardPaths>
#include <QTimer>

#include <cstdio>
#include <filesystem>
#include <memory>
#include <utility>

int main(int argc, char **argv) {
  QApplication app(argc, argv);
  QApplication::setApplicationName(QStringLiteral("curvebench"));
  // No organisation name: the data folder is then ~/.local/share/curvebench, as the scripts expect.
  QApplication::setApplicationVersion(QStringLiteral(CURVEBENCH_VERSION));

  QCommandLineParser parser;
  parser.setApplicationDescription(
      QStringLiteral("Curvebench workbench: booking curves for hotel revenue managers."));
  parser.addHelpOption();
  parser.addVersionOption();
  parser.addPositionalArgument(QStringLiteral("STORE"),
                               QStringLiteral("Store to open (default: the sample property)"));
  QCommandLineOption shot(QStringLiteral("screenshot"),
                          QStringLiteral("Save a PNG of the window once loaded, then quit"),
                          QStringLiteral("FILE"));
  parser.addOption(shot);
  QCommandLineOption screen(QStringLiteral("screen"),
                            QStringLiteral("Screen to show: %1")
                                .arg(cbui::MainWindow::screenNames().join(QStringLiteral(", "))),
                            QStringLiteral("NAME"));
  parser.addOption(screen);
  QCommandLineOption size(QStringLiteral("size"),
                          QStringLiteral("Window size, e.g. 1366x768 (for screenshots)"),
                          QStringLiteral("WxH"));
  parser.addOption(size);
  QCommandLineOption listScreens(
      QStringLiteral("list-screens"),
      QStringLiteral("Print the screens' names, one per line, and quit"));
  parser.addOption(listScreens);
  QCommandLineOption importFile(
      QStringLiteral("import-file"),
      QStringLiteral(
          "Read FILE in the Data screen's import steps and validate it (writes nothing)"),
      QStringLiteral("FILE"));
  parser.addOption(importFile);
  parser.process(app);
  if (parser.isSet(listScreens)) {
    for (const QString &name : cbui::MainWindow::screenNames())
      std::printf("%s\n", qPrintable(name));
    return 0;
  }
  int screenIndex = -1;
  if (parser.isSet(screen)) {
    screenIndex = cbui::MainWindow::screenFromName(parser.value(screen));
    if (screenIndex < 0) {
      std::fprintf(stderr, "curvebench-gui: no screen named \"%s\" (try --list-screens)\n",
                   qPrintable(parser.value(screen)));
      return 1;
    }
  }

  cbui::MainWindow window;
  if (parser.isSet(size)) {
    const QStringList wh = parser.value(size).split(QLatin1Char('x'));
    if (wh.size() == 2)
      window.resize(wh[0].toInt(), wh[1].toInt());
  }
  if (screenIndex >= 0)
    window.showScreen(static_cast<cbui::MainWindow::Screen>(screenIndex));
  window.show();

  if (parser.isSet(importFile)) {
    const QString file = parser.value(importFile);
    auto once = std::make_shared<bool>(false);
    QObject::connect(&window, &cbui::MainWindow::sessionLoaded, &window, [&window, file, once] {
      if (std::exchange(*once, true))
        return;
      window.dataPanel()->chooseFile(file);
      window.dataPanel()->validate();
    });
  }

  if (parser.isSet(shot)) {
    QString file = parser.value(shot);
    QObject::connect(&window, &cbui::MainWindow::sessionLoaded, &window, [&window, file] {
      // Screens compute in the background after the load: wait for them (at most 2 min).
      auto *poll = new QTimer(&window);
      auto started = std::make_shared<int>(0);
      QObject::connect(poll, &QTimer::timeout, &window, [&window, file, poll, started] {
        // Busy while any progress bar shows (Horizon's outlook, Date Study's forecasts, …).
        bool busy = false;
        for (const QProgressBar *bar : window.findChildren<QProgressBar *>())
          busy = busy || bar->isVisible();
        if (busy && ++*started < 600)
          return;
        poll->stop();
        QTimer::singleShot(300, &window, [&window, file] {
          bool ok = window.grab().save(file);
          std::fprintf(stderr, "%s %s\n", ok ? "saved" : "could not save", qPrintable(file));
          QApplication::exit(ok ? 0 : 2);
        });
      });
      poll->start(200);
    });
    QObject::connect(&window, &cbui::MainWindow::loadFailed, &window, [](const QString &msg) {
      std::fprintf(stderr, "curvebench-gui: %s\n", qPrintable(msg));
      QApplication::exit(2);
    });
  }

  const QStringList args = parser.positionalArguments();
  if (!args.isEmpty()) {
    window.openStore(std::filesystem::path(args.front().toStdString()));
  } else {
    QString dir = QStandardPaths::writableLocation(QStandardPaths::AppDataLocation);
    QDir().mkpath(dir);
    std::filesystem::path store =
        std::filesystem::path(dir.toStdString()) / "sample-property.curvebench";
    if (std::filesystem::exists(store))
      window.openStore(store);
    else
      window.buildSampleAndOpen(store);
  }
  return QApplication::exec();
}
