// curvebench-gui — opens the workbench on a store (default: the sample property, built on
// first run in the user's data folder).
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
                            QStringLiteral("Screen to show: horizon, date-study, segment-compare, "
                                           "year-map, accuracy, group-offer or property"),
                            QStringLiteral("NAME"));
  parser.addOption(screen);
  QCommandLineOption size(QStringLiteral("size"),
                          QStringLiteral("Window size, e.g. 1366x768 (for screenshots)"),
                          QStringLiteral("WxH"));
  parser.addOption(size);
  parser.process(app);

  cbui::MainWindow window;
  if (parser.isSet(size)) {
    const QStringList wh = parser.value(size).split(QLatin1Char('x'));
    if (wh.size() == 2)
      window.resize(wh[0].toInt(), wh[1].toInt());
  }
  if (parser.isSet(screen)) {
    const QString name = parser.value(screen);
    window.showScreen(name == QLatin1String("date-study") ? cbui::MainWindow::DateStudyScreen
                      : name == QLatin1String("segment-compare")
                          ? cbui::MainWindow::SegmentCompareScreen
                      : name == QLatin1String("year-map")    ? cbui::MainWindow::YearMapScreen
                      : name == QLatin1String("accuracy")    ? cbui::MainWindow::AccuracyScreen
                      : name == QLatin1String("group-offer") ? cbui::MainWindow::GroupOfferScreen
                      : name == QLatin1String("property")    ? cbui::MainWindow::PropertyScreen
                                                             : cbui::MainWindow::HorizonScreen);
  }
  window.show();

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
