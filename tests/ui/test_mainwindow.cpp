// The workbench window over a small hand-made store, offscreen: what it shows must match the
// definitions of brief section 4 computed by hand for these few bookings.
#include "core/samplestore.h"
#include "core/store.h"
#include "testsupport.h"
#include "ui/datestudypanel.h"
#include "ui/findingspanel.h"
#include "ui/horizonmodel.h"
#include "ui/horizonpanel.h"
#include "ui/mainwindow.h"
#include "ui/propertysummarypanel.h"
#include "ui/workbenchsession.h"

#include <QLabel>
#include <QPushButton>
#include <QSignalSpy>
#include <QSortFilterProxyModel>
#include <QStandardPaths>
#include <QStatusBar>
#include <QTableView>
#include <QTableWidget>
#include <QTest>

namespace {

cb::Date d(const char *iso) { return *cb::Date::parseIso(iso); }
QDate toQ(cb::Date x) {
  return QDate(x.year(), static_cast<int>(x.month()), static_cast<int>(x.day()));
}

cb::Reservation res(const char *id, const char *booked, const char *arr, const char *dep, int rooms,
                    const char *seg, const char *cancelled = nullptr) {
  cb::Reservation r;
  r.id = id;
  r.bookedOn = d(booked);
  r.arrival = d(arr);
  r.departure = d(dep);
  r.rooms = rooms;
  r.segment = seg;
  r.rate = 100;
  if (cancelled) {
    r.status = cb::ReservationStatus::Cancelled;
    r.cancelledOn = d(cancelled);
  }
  return r;
}

// Night 2026-06-13 (Saturday) and the same night last year by 364 days: 2025-06-14.
void fillStore(const std::filesystem::path &path) {
  cb::Property p;
  p.name = "Test House";
  p.capacity = 20;
  auto store = cb::Store::create(path, p);
  cb::Store::Transaction tx(*store);
  store->upsertReservation(res("a", "2026-05-01", "2026-06-12", "2026-06-14", 3, "CORP"), 0);
  store->upsertReservation(res("b", "2026-06-03", "2026-06-13", "2026-06-14", 2, "FLEX"), 0);
  store->upsertReservation(
      res("c", "2026-05-20", "2026-06-13", "2026-06-15", 4, "FLEX", "2026-06-10"), 0);
  store->upsertReservation(res("ly", "2025-06-01", "2025-06-14", "2025-06-15", 5, "CORP"), 0);
  store->upsertReservation(res("z", "2026-06-20", "2026-07-01", "2026-07-02", 1, "CORP"), 0);
  tx.commit();
}

} // namespace

class MainWindowTest : public QObject {
  Q_OBJECT
private slots:
  void initTestCase() { QStandardPaths::setTestModeEnabled(true); } // keep the user's settings

  void sessionComputesCurvesByDefinition() {
    cbtest::TempDir dir;
    fillStore(dir / "t.curvebench");
    auto s = cbui::WorkbenchSession::open(dir / "t.curvebench");
    QCOMPARE(s->readingDate().toIso(), std::string("2026-06-20"));
    auto c = s->curves(d("2026-06-13"), 30);
    QCOMPARE(c.lastYearNight.toIso(), std::string("2025-06-14"));
    QCOMPARE(c.capacity, 20);
    QVERIFY(!c.readingLead); // a past night
    // x runs from −30 to 0; OTB(s, s−d) by hand: a (3 rooms) from 2026-05-01 (d=43),
    // c (4) from 2026-05-20 (d=24) until cancelled 2026-06-10 (d=3), b (2) from d=10.
    QCOMPARE(c.thisYear.x.size(), std::size_t(31));
    auto at = [&](int lead) { return c.thisYear.y[static_cast<std::size_t>(30 - lead)]; };
    QCOMPARE(at(30), 3.0);
    QCOMPARE(at(24), 7.0);
    QCOMPARE(at(10), 9.0);
    QCOMPARE(at(4), 9.0);
    QCOMPARE(at(3), 5.0);
    QCOMPARE(at(0), 5.0);
    QCOMPARE(c.lastYear.y.back(), 5.0);
    auto flex = s->curves(d("2026-06-13"), 30, "FLEX");
    QCOMPARE(flex.thisYear.y.back(), 2.0);
  }

  void windowShowsSummaryAndNight() {
    cbtest::TempDir dir;
    fillStore(dir / "t.curvebench");
    cbui::MainWindow w;
    QSignalSpy loaded(&w, &cbui::MainWindow::sessionLoaded);
    w.openStore(dir / "t.curvebench");
    QVERIFY(loaded.wait(cbtest::kBackgroundWaitMs));
    QVERIFY(w.summaryPanel()->text().contains(QStringLiteral("Test House")));
    QVERIFY(w.dateStudy() != nullptr);
    w.showNight(d("2026-06-13"));
    QCOMPARE(w.studiedNight(), QDate(2026, 6, 13));
    QVERIFY(!w.grab().isNull());
  }

  // The sample property: Horizon fills, the reading date moves every screen (and refuses a date
  // after the newest activity), a double-click on a night opens it in Date Study.
  void sampleStoreReadingDateAndNight() {
    cbtest::TempDir dir;
    cb::buildSampleStore(dir / "s.curvebench", dir / "files");
    cbui::MainWindow w;
    w.resize(1366, 768);
    w.show();
    QSignalSpy loaded(&w, &cbui::MainWindow::sessionLoaded);
    w.openStore(dir / "s.curvebench");
    QVERIFY(loaded.wait(cbtest::kBackgroundWaitMs));
    auto *table = w.horizonPanel()->findChild<QTableView *>(QStringLiteral("horizonTable"));
    auto *status = w.horizonPanel()->findChild<QLabel *>(QStringLiteral("horizonStatus"));
    QVERIFY(table && status);
    auto *proxy = qobject_cast<QSortFilterProxyModel *>(table->model());
    auto *model = static_cast<cbui::HorizonModel *>(proxy->sourceModel());
    const cb::Date newest = w.session()->newestActivity();
    QTRY_VERIFY_WITH_TIMEOUT(model->rowCount() > 0 &&
                                 model->horizon().asOf.toJulianDay() == toQ(newest).toJulianDay(),
                             30000);
    QCOMPARE(model->row(0).night, toQ(newest + 1));
    // Once Horizon is drawn, the data-health check runs in the background and its findings go
    // to the findings panel: the sample's extract starts with arrivals on 2023-11-01, so guests
    // already in house then are missing and the first nights are flagged incomplete.
    QTRY_VERIFY_WITH_TIMEOUT(w.findingsPanel()->count() > 0, cbtest::kBackgroundWaitMs);
    auto *findings = w.findingsPanel()->table();
    QVERIFY(findings->item(0, 4)->text().contains(QStringLiteral("2023-11-01")));
    QVERIFY(findings->item(0, 4)->text().contains(QStringLiteral("incomplete")));

    // A week earlier: the rows start the day after the new reading date.
    QVERIFY(w.setReadingDate(newest - 7));
    QCOMPARE(w.session()->readingDate(), newest - 7);
    QTRY_VERIFY_WITH_TIMEOUT(model->rowCount() > 0 && model->row(0).night == toQ(newest - 6),
                             30000);
    // After the newest activity: refused, said in the status bar, reading date kept.
    QVERIFY(!w.setReadingDate(newest + 1));
    QCOMPARE(w.session()->readingDate(), newest - 7);
    QVERIFY(w.statusBar()->currentMessage().contains(QStringLiteral("after the newest")));

    // Double-click the fourth row of Horizon: Date Study shows that night.
    w.showScreen(cbui::MainWindow::HorizonScreen);
    const QModelIndex cell = proxy->index(3, 1);
    const QDate night = cell.data(cbui::HorizonModel::kNightRole).toDate();
    QCOMPARE(night, toQ(newest - 3));
    QVERIFY(QTest::qWaitForWindowExposed(&w));
    QVERIFY(table->visualRect(cell).isValid());
    // A press first: the view opens an item on a double click of the item it saw pressed.
    QTest::mouseClick(table->viewport(), Qt::LeftButton, {}, table->visualRect(cell).center());
    QTest::mouseDClick(table->viewport(), Qt::LeftButton, {}, table->visualRect(cell).center());
    QCOMPARE(w.currentScreen(), cbui::MainWindow::DateStudyScreen);
    QCOMPARE(w.studiedNight(), night);
    // Date Study's next / previous night (Alt+Right / Alt+Left there) moves the studied night.
    emit w.dateStudy()->nightStepRequested(1);
    QCOMPARE(w.studiedNight(), night.addDays(1));
    emit w.dateStudy()->nightStepRequested(-2);
    QCOMPARE(w.studiedNight(), night.addDays(-1));

    // Enter on a row of Horizon opens it too.
    w.showScreen(cbui::MainWindow::HorizonScreen);
    w.activateWindow();
    QVERIFY(QTest::qWaitForWindowActive(&w));
    const QModelIndex sixth = proxy->index(5, 0);
    table->setCurrentIndex(sixth);
    table->setFocus();
    QTest::keyClick(table, Qt::Key_Return);
    QCOMPARE(w.currentScreen(), cbui::MainWindow::DateStudyScreen);
    QCOMPARE(w.studiedNight(), sixth.data(cbui::HorizonModel::kNightRole).toDate());
  }

  // Two windows on one store: the second reads it but may not write it, and says so; once the
  // first is gone, the store opens writable again.
  void secondWindowOnAStoreIsReadOnly() {
    cbtest::TempDir dir;
    const auto path = dir / "t.curvebench";
    fillStore(path);
    auto first = std::make_unique<cbui::MainWindow>();
    QSignalSpy firstLoaded(first.get(), &cbui::MainWindow::sessionLoaded);
    first->openStore(path);
    QVERIFY(firstLoaded.wait(cbtest::kBackgroundWaitMs));
    QVERIFY(first->readOnlyReason().isEmpty());

    cbui::MainWindow second;
    QSignalSpy loaded(&second, &cbui::MainWindow::sessionLoaded);
    second.openStore(path);
    QVERIFY(loaded.wait(cbtest::kBackgroundWaitMs));
    QVERIFY(second.readOnlyReason().contains(QStringLiteral("open in another Curvebench window")));
    QVERIFY(second.windowTitle().endsWith(QStringLiteral("(read-only)")));
    // It shows the data…
    QVERIFY(second.summaryPanel()->text().contains(QStringLiteral("Test House")));
    // …but an override and a dropped import are refused, and the store keeps its 5 rows.
    auto saveButton = [](cbui::MainWindow &w) -> QPushButton * {
      for (QPushButton *b : w.dateStudy()->findChildren<QPushButton *>())
        if (b->text() == QStringLiteral("Save override"))
          return b;
      return nullptr;
    };
    QVERIFY(saveButton(*first) && saveButton(second));
    QVERIFY(saveButton(*first)->isEnabled());
    QVERIFY(!saveButton(second)->isEnabled());
    second.showNight(d("2026-06-13"));
    QVERIFY(!second.dateStudy()->saveOverride(12, QStringLiteral("fair")));
    QSignalSpy imported(&second, &cbui::MainWindow::importFinished);
    cbtest::writeFile(dir / "more.csv", "id\n");
    second.importCsv(dir / "more.csv");
    QCOMPARE(imported.size(), 1);
    QCOMPARE(imported.front().front().toBool(), false);
    QCOMPARE(cb::Store::open(path)->reservationCount(), std::int64_t(5));

    // The first window closes: a window opened now may write again.
    first.reset();
    cbui::MainWindow third;
    QSignalSpy thirdLoaded(&third, &cbui::MainWindow::sessionLoaded);
    third.openStore(path);
    QVERIFY(thirdLoaded.wait(cbtest::kBackgroundWaitMs));
    QVERIFY(third.readOnlyReason().isEmpty());
  }

  void badStoreReportsFailure() {
    cbtest::TempDir dir;
    cbtest::writeFile(dir / "junk.curvebench", "not a database at all");
    cbui::MainWindow w;
    QSignalSpy failed(&w, &cbui::MainWindow::loadFailed);
    w.openStore(dir / "junk.curvebench");
    QVERIFY(failed.wait(cbtest::kBackgroundWaitMs));
    QVERIFY(failed.front().front().toString().contains(QStringLiteral("junk.curvebench")));
  }
};

QTEST_MAIN(MainWindowTest)
#include "test_mainwindow.moc"
