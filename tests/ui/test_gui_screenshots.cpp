// End to end: the real `curvebench-gui` executable opens the sample property and saves a
// screenshot of Horizon and of Date Study (offscreen platform in ctest; the same runs under Xvfb);
// each must have the window's size and must not be blank — the chart area must hold many
// colours, not one. Everything is written to a temporary folder.
#include "core/samplestore.h"
#include "testsupport.h"

#include <QImage>
#include <QProcess>
#include <QSet>
#include <QtTest>

class GuiScreenshots : public QObject {
  Q_OBJECT
private slots:
  void initTestCase() {
    cb::buildSampleStore(dir_.path() / "sample.curvebench", dir_.path() / "files");
  }

  void screens_data() {
    QTest::addColumn<QString>("screen");
    QTest::newRow("horizon") << QStringLiteral("horizon");
    QTest::newRow("date-study") << QStringLiteral("date-study");
  }

  void screens() {
    QFETCH(QString, screen);
    const QString png = QString::fromStdString((dir_.path() / "shot.png").string());
    QProcess gui;
    gui.setProcessChannelMode(QProcess::MergedChannels);
    gui.start(QStringLiteral(CURVEBENCH_GUI),
              {QString::fromStdString((dir_.path() / "sample.curvebench").string()),
               QStringLiteral("--screen"), screen, QStringLiteral("--size"),
               QStringLiteral("1366x768"), QStringLiteral("--screenshot"), png});
    QVERIFY(gui.waitForFinished(300000));
    QCOMPARE(gui.exitCode(), 0);
    const QImage image(png);
    QVERIFY(!image.isNull());
    QCOMPARE(image.size(), QSize(1366, 768));
    // The chart sits in the upper left part of both screens: sample it on a grid.
    QSet<QRgb> colours;
    for (int y = 120; y < 500; y += 4)
      for (int x = 20; x < 800; x += 4)
        colours.insert(image.pixel(x, y));
    QVERIFY2(colours.size() > 20,
             qPrintable(QStringLiteral("chart area has only %1 colours").arg(colours.size())));
    QFile::remove(png);
  }

private:
  cbtest::TempDir dir_;
};

QTEST_GUILESS_MAIN(GuiScreenshots)
#include "test_gui_screenshots.moc"
