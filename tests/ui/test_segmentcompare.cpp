// Segment Compare over a small hand-made store, offscreen: curves in rooms and in share of final,
// last year's comparable night, booking window and rate by lead, worked out by hand below from
// the definitions of brief section 4 and checked against core's own curve cube; then the panel is
// driven (segments ticked and unticked, rooms / % of final).
#include "core/curvecube.h"
#include "core/store.h"
#include "testsupport.h"
#include "ui/segmentcomparechart.h"
#include "ui/segmentcomparemodel.h"
#include "ui/segmentcomparepanel.h"
#include "ui/workbenchsession.h"

#include <QSignalSpy>
#include <QTableView>
#include <QTest>
#include <qcustomplot.h>

#include <memory>

namespace {

cb::Date d(const char *iso) { return *cb::Date::parseIso(iso); }

cb::Reservation res(const char *id, const char *booked, const char *arr, const char *dep, int rooms,
                    const char *seg, double rate, const char *cancelled = nullptr) {
  cb::Reservation r;
  r.id = id;
  r.bookedOn = d(booked);
  r.arrival = d(arr);
  r.departure = d(dep);
  r.rooms = rooms;
  r.segment = seg;
  r.rate = rate;
  if (cancelled) {
    r.status = cb::ReservationStatus::Cancelled;
    r.cancelledOn = d(cancelled);
  }
  return r;
}

// Night 2026-06-13 (Saturday); last year's comparable night by 364 days: 2025-06-14. The newest
// activity (reading date) is 2026-06-20.
void fillStore(const std::filesystem::path &path) {
  cb::Property p;
  p.name = "Test House";
  p.capacity = 20;
  auto store = cb::Store::create(path, p);
  cb::Store::Transaction tx(*store);
  store->upsertReservation(res("a", "2026-05-01", "2026-06-12", "2026-06-14", 3, "CORP", 150), 0);
  store->upsertReservation(res("b", "2026-06-03", "2026-06-13", "2026-06-14", 2, "FLEX", 120), 0);
  store->upsertReservation(
      res("c", "2026-05-20", "2026-06-13", "2026-06-15", 4, "FLEX", 90, "2026-06-10"), 0);
  store->upsertReservation(res("ly", "2025-06-01", "2025-06-14", "2025-06-15", 5, "CORP", 140), 0);
  store->upsertReservation(res("lyf", "2025-06-10", "2025-06-14", "2025-06-15", 2, "FLEX", 80), 0);
  store->upsertReservation(res("z", "2026-06-20", "2026-07-01", "2026-07-02", 1, "CORP", 150), 0);
  tx.commit();
}

const cbui::SegmentCompareSeries &find(const cbui::SegmentCompareData &data, const char *code) {
  for (const auto &s : data.series)
    if (s.code == code)
      return s;
  throw std::runtime_error("no series");
}

double at(const std::vector<std::optional<double>> &v, int dba) {
  const auto &x = v.at(static_cast<std::size_t>(dba));
  return x ? *x : -1.0; // -1 = unknown
}

} // namespace

class SegmentCompareTest : public QObject {
  Q_OBJECT
  std::unique_ptr<cbtest::TempDir> dir_;
  std::unique_ptr<cbui::WorkbenchSession> session_;

private slots:
  void initTestCase() {
    dir_ = std::make_unique<cbtest::TempDir>();
    fillStore(*dir_ / "t.curvebench");
    session_ = cbui::WorkbenchSession::open(*dir_ / "t.curvebench");
    QCOMPARE(session_->readingDate().toIso(), std::string("2026-06-20"));
  }

  void oneNightByHand() {
    const auto data = cbui::computeSegmentCompare(*session_, d("2026-06-13"), d("2026-06-13"), 30);
    QCOMPARE(data.series.size(), std::size_t(3)); // ALL, CORP, FLEX
    QCOMPARE(data.series[0].code, std::string("ALL"));
    QCOMPARE(data.lastYearNights.front().toIso(), std::string("2025-06-14"));
    QVERIFY(!data.windowFromLastYear); // the night is past

    // CORP: a (3 rooms) booked 43 days out → 3 at every lead 0 … 30; final 3, share 100 %.
    const auto &corp = find(data, "CORP");
    for (int dba : {0, 10, 30}) {
      QCOMPARE(at(corp.rooms, dba), 3.0);
      QCOMPARE(at(corp.share, dba), 1.0);
    }
    // FLEX: c (4) on the books from 24 days out (2026-05-20) until cancelled 2026-06-10 (3 days
    // out: cancelled on or before the reading date → off); b (2) from 10 days out (2026-06-03).
    // OTB: d 25…30 → 0; d 11…24 → 4; d 4…10 → 6; d 0…3 → 2. Final 2, so the share of final is
    // 0, 2.0, 3.0 and 1.0 on those stretches (cancellations make it pass 100 %).
    const auto &flex = find(data, "FLEX");
    QCOMPARE(at(flex.rooms, 30), 0.0);
    QCOMPARE(at(flex.rooms, 24), 4.0);
    QCOMPARE(at(flex.rooms, 10), 6.0);
    QCOMPARE(at(flex.rooms, 3), 2.0);
    QCOMPARE(at(flex.share, 24), 2.0);
    QCOMPARE(at(flex.share, 10), 3.0);
    QCOMPARE(at(flex.share, 0), 1.0);
    // Last year, 2025-06-14: CORP ly (5) booked 13 days out; FLEX lyf (2) booked 4 days out.
    QCOMPARE(at(corp.lastYearRooms, 14), 0.0);
    QCOMPARE(at(corp.lastYearRooms, 13), 5.0);
    QCOMPARE(at(corp.lastYearShare, 13), 1.0);
    QCOMPARE(at(flex.lastYearShare, 5), 0.0);
    QCOMPARE(at(flex.lastYearRooms, 4), 2.0);

    // Against core's cube, built here on its own: every lead of every series.
    cb::CubeOptions co{d("2026-06-13"), d("2026-06-13"), 30, cb::SeriesBy::Segment,
                       session_->readingDate()};
    const auto cube = cb::CurveCube::build(session_->reservations(), co);
    for (const auto &s : data.series)
      for (int dba = 0; dba <= 30; ++dba)
        QCOMPARE(at(s.rooms, dba),
                 double(cube.otbRooms(*cube.seriesIndex(s.code), d("2026-06-13"), dba)));

    // The table: the night is past, so OTB now = final; STLY at lead 0 = last year's final.
    QCOMPARE(corp.otbNow, 3.0);
    QCOMPARE(*corp.stlyOtb, 5.0);
    QCOMPARE(*corp.finalNow, 3.0);
    QCOMPARE(*flex.lastYearFinal, 2.0);
    cbui::SegmentCompareTable table;
    table.setData(data);
    QCOMPARE(table.rowCount(), 3);
    const int corpRow = 1;
    QCOMPARE(table.index(corpRow, cbui::SegmentCompareTable::VsStly).data().toString(),
             QStringLiteral("-2"));
    // Share of the hotel's OTB: CORP 3 of 5 rooms = 60 %.
    QCOMPARE(table.index(corpRow, cbui::SegmentCompareTable::ShareOfHotel).data().toString(),
             QStringLiteral("60 %"));

    // Booking window of arrivals on 2026-06-13 as of 2026-06-20: only b (FLEX, 2 room-nights,
    // lead 10 → bucket "8-14", rate 120); c was cancelled, a arrived the day before.
    QCOMPARE(flex.windowRoomNights, std::int64_t(2));
    QCOMPARE(flex.windowShare[3], 1.0);
    QCOMPARE(*flex.rateByLead[3], 120.0);
    QVERIFY(!flex.rateByLead[0]);
    QCOMPARE(corp.windowRoomNights, std::int64_t(0));
  }

  void periodAveragesPerNight() {
    // Nights 12 and 13 June: FLEX has nothing on the 12th, so its rooms per night halve; its
    // share of final is Σ OTB / Σ Final = (0 + 6) / (0 + 2) = 3 at 10 days out.
    const auto data = cbui::computeSegmentCompare(*session_, d("2026-06-12"), d("2026-06-13"), 30);
    QCOMPARE(data.nights, 2);
    const auto &flex = find(data, "FLEX");
    QCOMPARE(at(flex.rooms, 10), 3.0);
    QCOMPARE(at(flex.share, 10), 3.0);
    QCOMPARE(at(find(data, "CORP").rooms, 0), 3.0);
  }

  void futureNightStopsAtTheReadingDate() {
    // 2026-07-01 is 11 days after the reading date: leads below 11 are unknown, no final yet,
    // and the booking window comes from last year's comparable arrivals.
    const auto data = cbui::computeSegmentCompare(*session_, d("2026-07-01"), d("2026-07-01"), 30);
    const auto &corp = find(data, "CORP");
    QCOMPARE(at(corp.rooms, 11), 1.0);
    QCOMPARE(at(corp.rooms, 10), -1.0);
    QCOMPARE(at(corp.share, 11), -1.0);
    QVERIFY(data.windowFromLastYear);
    QVERIFY(!corp.finalNow);
    QVERIFY_THROWS_EXCEPTION(
        std::invalid_argument,
        cbui::computeSegmentCompare(*session_, d("2026-07-02"), d("2026-07-01"), 30));
  }

  void panelDriven() {
    cbui::SegmentComparePanel panel;
    panel.resize(1300, 700);
    QSignalSpy computed(&panel, &cbui::SegmentComparePanel::computed);
    panel.setSession(session_.get());
    QVERIFY(computed.wait(cbtest::kBackgroundWaitMs));
    // Segments ticked, the hotel total not.
    QCOMPARE(panel.shownSeries(), (QStringList{QStringLiteral("CORP"), QStringLiteral("FLEX")}));
    panel.setPeriod(QDate(2026, 6, 13), QDate(2026, 6, 13));
    QVERIFY(computed.wait(cbtest::kBackgroundWaitMs));
    auto *curves = panel.findChild<cbui::SegmentCompareChart *>(QStringLiteral("compareCurves"));
    QVERIFY(curves);
    QCustomPlot *plot = curves->plot();
    // This year and last year per segment, plus the two line-style keys.
    QCOMPARE(plot->graphCount(), 6);
    // Graph 0 = CORP this year, in rooms: 3 at arrival (x = 0, the last point).
    QCOMPARE(plot->graph(0)->data()->at(plot->graph(0)->data()->size() - 1)->value, 3.0);
    panel.setShare(true);
    QCOMPARE(plot->graph(0)->data()->at(plot->graph(0)->data()->size() - 1)->value, 100.0);
    // FLEX this year (graph 2) 10 days out: 300 % of final (see oneNightByHand).
    const auto flexTy = plot->graph(2)->data();
    QCOMPARE(flexTy->findBegin(-10.0, false)->key, -10.0);
    QCOMPARE(flexTy->findBegin(-10.0, false)->value, 300.0);
    panel.setSeriesShown(QStringLiteral("FLEX"), false);
    QCOMPARE(panel.shownSeries(), QStringList{QStringLiteral("CORP")});
    QCOMPARE(plot->graphCount(), 4);
    // The booking-window chart draws one bar set per segment shown.
    auto *window = panel.findChild<cbui::SegmentCompareChart *>(QStringLiteral("compareWindow"));
    QCOMPARE(window->plot()->plottableCount(), 1);
    // A long segment name, cut to fit the table, keeps its code: "Advance pu…(ADV)".
    auto *table = panel.findChild<QTableView *>(QStringLiteral("compareTable"));
    QVERIFY(table);
    QCOMPARE(table->textElideMode(), Qt::ElideMiddle);
    // Exports: PNG and PDF of a chart.
    cbtest::TempDir out;
    QVERIFY(curves->exportTo(QString::fromStdString((out / "c.png").string())));
    QVERIFY(curves->exportTo(QString::fromStdString((out / "c.pdf").string())));
    QVERIFY(std::filesystem::file_size(out / "c.png") > 1000);
  }
};

QTEST_MAIN(SegmentCompareTest)
#include "test_segmentcompare.moc"
