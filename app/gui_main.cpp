// curvebench-gui — opens the workbench on a store (default: the sample property, built on
// first run in the user's data folder).
#include "ui/mainwindow.h"

#include <QApplication>
#include <QCommandLineParser>
#include <QDir>
#include <QStandardPaths>
#include <QTimer>

#include <cstdio>
#include <filesystem>

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
  parser.process(app);

  cbui::MainWindow window;
  window.show();

  if (parser.isSet(shot)) {
    QString file = parser.value(shot);
    QObject::connect(&window, &cbui::MainWindow::sessionLoaded, &window, [&window, file] {
      QTimer::singleShot(300, &window, [&window, file] {
        bool ok = window.grab().save(file);
        std::fprintf(stderr, "%s %s\n", ok ? "saved" : "could not save", qPrintable(file));
        QApplication::exit(ok ? 0 : 2);
      });
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
