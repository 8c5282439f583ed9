// The workbench window over a small hand-made store, offscreen: what it shows must match the
// definitions of brief section 4 computed by hand for these few bookings.
#include "core/store.h"
#include "testsupport.h"
#include "ui/mainwindow.h"
#include "ui/nightcurvechart.h"
#include "ui/propertysummarypanel.h"
#include "ui/workbenchsession.h"

#include <QSignalSpy>
#include <QTest>
#include <qcustomplot.h>

namespace {

cb::Date d(const char *iso) { return *cb::Date::parseIso(iso); }

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

  void windowShowsSummaryAndCurve() {
    cbtest::TempDir dir;
    fillStore(dir / "t.curvebench");
    cbui::MainWindow w;
    QSignalSpy loaded(&w, &cbui::MainWindow::sessionLoaded);
    w.openStore(dir / "t.curvebench");
    QVERIFY(loaded.wait(10000));
    QVERIFY(w.summaryPanel()->text().contains(QStringLiteral("Test House")));
    w.showNight(d("2026-06-13"));
    QCustomPlot *plot = w.chart()->plot();
    QCOMPARE(plot->graphCount(), 3); // last year, this year, capacity
    QCPGraph *thisYear = plot->graph(1);
    QVERIFY(thisYear->name().contains(QStringLiteral("2026-06-13")));
    QCOMPARE(thisYear->data()->at(thisYear->data()->size() - 1)->value, 5.0);
    QVERIFY(!w.grab().isNull());
  }

  void badStoreReportsFailure() {
    cbtest::TempDir dir;
    cbtest::writeFile(dir / "junk.curvebench", "not a database at all");
    cbui::MainWindow w;
    QSignalSpy failed(&w, &cbui::MainWindow::loadFailed);
    w.openStore(dir / "junk.curvebench");
    QVERIFY(failed.wait(10000));
    QVERIFY(failed.front().front().toString().contains(QStringLiteral("junk.curvebench")));
  }
};

QTEST_MAIN(MainWindowTest)
#include "test_mainwindow.moc"
