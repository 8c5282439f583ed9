// The findings panel (click-through to the file's lines and to a named night), table CSV
// export (plain numbers, formula injection neutralised) and a cancelled import that writes
// nothing — offscreen.
#include "core/finding.h"
#include "core/samplestore.h"
#include "core/store.h"
#include "testsupport.h"
#include "ui/csvexport.h"
#include "ui/datestudypanel.h"
#include "ui/findingspanel.h"
#include "ui/mainwindow.h"
#include "ui/workbenchsession.h"

#include <QSignalSpy>
#include <QStandardItemModel>
#include <QStandardPaths>
#include <QStatusBar>
#include <QTableWidget>
#include <QTest>

#include <string>

class FindingsTest : public QObject {
  Q_OBJECT
private slots:
  void initTestCase() { QStandardPaths::setTestModeEnabled(true); } // keep the user's settings

  // Lines 2–6 around line 4, the marked line flagged, the caret under column 7.
  void excerptShowsTheLinesAroundWithACaret() {
    cbtest::TempDir dir;
    cbtest::writeFile(dir / "f.csv", "id,arrival\nA,2026-01-01\nB,2026-01-02\nC,2026-13-01\n"
                                     "D,2026-01-04\nE,2026-01-05\nF,2026-01-06\n");
    const QString f = QString::fromStdString((dir / "f.csv").string());
    const QStringList lines = cbui::sourceExcerpt(f, 4, 7).split(QLatin1Char('\n'));
    QCOMPARE(lines.size(), 6); // lines 2, 3, 4, caret, 5, 6
    QCOMPARE(lines[0], QStringLiteral("  2 | A,2026-01-01"));
    QCOMPARE(lines[2], QStringLiteral("> 4 | C,2026-13-01"));
    // "> 4 | " is 6 characters; column 7 is the 7th character of the line: "1" of "13"?
    // C(1) ,(2) 2(3) 0(4) 2(5) 6(6) -(7): the caret stands under the "-" before the month.
    QCOMPARE(lines[3].indexOf(QLatin1Char('^')), 6 + 6);
    QCOMPARE(lines[2].at(6 + 6), QLatin1Char('-'));
    QVERIFY(cbui::sourceExcerpt(f, 99, 1).isEmpty());                      // no such line
    QVERIFY(cbui::sourceExcerpt(f + QStringLiteral("x"), 2, 1).isEmpty()); // no such file
  }

  // A 2-million-character line: the excerpt shows a window around the column, not the line.
  void excerptOfAHugeLineIsCut() {
    cbtest::TempDir dir;
    std::string huge(2'000'000, 'x');
    huge[1'500'000] = '!';
    cbtest::writeFile(dir / "h.csv", "a\n" + huge + "\nb\n");
    const QString text =
        cbui::sourceExcerpt(QString::fromStdString((dir / "h.csv").string()), 2, 1'500'001);
    QVERIFY(text.size() < 1000);
    const QStringList lines = text.split(QLatin1Char('\n'));
    const int bang = static_cast<int>(lines[1].indexOf(QLatin1Char('!')));
    QVERIFY(bang > 0);
    QCOMPARE(lines[2].indexOf(QLatin1Char('^')), bang);
  }

  void nightNamedInAMessage() {
    QCOMPARE(cbui::nightNamed(QStringLiteral("nights 2023-11-01 to 2023-11-05 are incomplete")),
             QDate(2023, 11, 1));
    QVERIFY(!cbui::nightNamed(QStringLiteral("column 'arrival' is missing")).isValid());
  }

  // Selecting a finding shows its lines; double-clicking one that names a night asks for it;
  // a second source leaves the first in place.
  void panelClicksThrough() {
    cbtest::TempDir dir;
    cbtest::writeFile(dir / "r.csv", "id,arrival\nA,2026-01-01\nB,someday\n");
    const std::string file = (dir / "r.csv").string();
    cbui::FindingsPanel panel;
    panel.setFindings(QStringLiteral("import"), QStringLiteral("Import of r.csv"),
                      {cb::Finding{cb::Severity::Error, file, 3, 3, "arrival: not a date"}});
    panel.setFindings(QStringLiteral("health"), QStringLiteral("Data health"),
                      {cb::Finding{cb::Severity::Warning, "s.curvebench", 0, 0,
                                   "nights 2026-01-01 to 2026-01-03 are incomplete"},
                       cb::Finding{cb::Severity::Info, "s.curvebench", 0, 0, "a note"}});
    QCOMPARE(panel.count(), 3);
    QCOMPARE(panel.attentionCount(), 2);
    panel.select(0);
    QVERIFY(panel.detailText().contains(QStringLiteral("> 3 | B,someday")));
    QVERIFY(panel.detailText().contains(QStringLiteral("line 3, column 3")));

    QSignalSpy night(&panel, &cbui::FindingsPanel::nightRequested);
    panel.show();
    QVERIFY(QTest::qWaitForWindowExposed(&panel));
    QTableWidget *t = panel.table();
    const QRect cell = t->visualItemRect(t->item(1, 4));
    QTest::mouseClick(t->viewport(), Qt::LeftButton, {}, cell.center());
    QTest::mouseDClick(t->viewport(), Qt::LeftButton, {}, cell.center());
    QCOMPARE(night.size(), 1);
    QCOMPARE(night.front().front().toDate(), QDate(2026, 1, 1));
    QVERIFY(panel.detailText().contains(QStringLiteral("Double-click to open")));

    // New import findings replace the old import's, the health ones stay.
    panel.setFindings(QStringLiteral("import"), QStringLiteral("Import of r2.csv"), {});
    QCOMPARE(panel.count(), 2);
  }

  // Numbers as plain values (the kCsvValueRole), text quoted, and a cell a spreadsheet would run
  // as a formula written with a leading apostrophe; negative numbers stay numbers.
  void tableCsvIsPlainAndSafe() {
    QStandardItemModel m(3, 2);
    m.setHorizontalHeaderLabels({QStringLiteral("Segment"), QStringLiteral("Rate")});
    auto put = [&](int r, const QString &text, const QString &value) {
      m.setItem(r, 0, new QStandardItem(text));
      auto *v = new QStandardItem(QStringLiteral("€1,234.50"));
      v->setData(value, cbui::kCsvValueRole);
      m.setItem(r, 1, v);
    };
    put(0, QStringLiteral("CORP, direct"), QStringLiteral("1234.50"));
    put(1, QStringLiteral("=HYPERLINK(\"x\")"), QStringLiteral("-3"));
    put(2, QStringLiteral("@SUM(A1)"), QStringLiteral("0"));
    QCOMPARE(cbui::tableToCsv(m), QStringLiteral("Segment,Rate\n"
                                                 "\"CORP, direct\",1234.50\n"
                                                 "\"'=HYPERLINK(\"\"x\"\")\",-3\n"
                                                 "'@SUM(A1),0\n"));
    QCOMPARE(cbui::csvField(QStringLiteral("-cmd")), QStringLiteral("'-cmd"));
    QCOMPARE(cbui::csvField(QStringLiteral("\tx")), QStringLiteral("'\tx"));
    // A carriage return first: neutralised, and quoted because it would end the record.
    QCOMPARE(cbui::csvField(QStringLiteral("\r=1+1")), QStringLiteral("\"'\r=1+1\""));
    QCOMPARE(cbui::csvField(QStringLiteral("-0.25")), QStringLiteral("-0.25"));
  }

  // Date Study starts its background forecasts only once shown (or asked to): a window that
  // opens on Horizon, or whose reading date moves while Horizon is shown, does not spend its
  // first seconds on them.
  void dateStudyWaitsUntilShown() {
    cbtest::TempDir dir;
    cb::buildSampleStore(dir / "s.curvebench", dir / "files");
    auto session = cbui::WorkbenchSession::open(dir / "s.curvebench");
    cbui::DateStudyPanel panel;
    panel.setSession(session.get());
    QVERIFY(!panel.isComputing());
    QVERIFY(panel.forecastText().contains(QStringLiteral("start when Date Study is shown")));
    panel.show();
    QVERIFY(panel.isComputing());
    QTRY_VERIFY_WITH_TIMEOUT(panel.forecastText().contains(QStringLiteral("Forecast <b>")),
                             cbtest::kBackgroundWaitMs);
    // Out of view, a new session (the reading date moved while Horizon is shown) waits again
    // until the window asks (once Horizon has drawn) or the panel is shown; in view it starts.
    panel.hide();
    panel.setSession(session.get());
    QVERIFY(!panel.isComputing());
    panel.startBackgroundWork();
    QVERIFY(panel.isComputing());
    panel.show();
    panel.setSession(session.get());
    QVERIFY(panel.isComputing());
    panel.setSession(nullptr);
  }

  // An import cancelled while it runs writes nothing: the store keeps its rows, the status bar
  // and the findings say so.
  void cancelledImportWritesNothing() {
    cbtest::TempDir dir;
    cb::buildSampleStore(dir / "s.curvebench", dir / "files");
    // The same store empty of reservations, to import the sample's extract into.
    {
      auto sample = cb::Store::open(dir / "s.curvebench");
      auto empty = cb::Store::create(dir / "e.curvebench", sample->property());
    }
    cbui::MainWindow w;
    QSignalSpy loaded(&w, &cbui::MainWindow::sessionLoaded);
    w.openStore(dir / "e.curvebench");
    QVERIFY(loaded.wait(cbtest::kBackgroundWaitMs));
    QSignalSpy finished(&w, &cbui::MainWindow::importFinished);
    w.importCsv(dir / "files" / "reservations.csv");
    w.cancelImport();
    QVERIFY(finished.wait(cbtest::kBackgroundWaitMs));
    QCOMPARE(finished.front().front().toBool(), false);
    QVERIFY(w.statusBar()->currentMessage().contains(QStringLiteral("cancelled")));
    QCOMPARE(cb::Store::open(dir / "e.curvebench")->summary().reservations, std::int64_t(0));
  }
};

QTEST_MAIN(FindingsTest)
#include "test_findings.moc"
