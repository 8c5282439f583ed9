// Year Map, offscreen. On a small hand-made store (a past year, so every night shows actuals):
// rooms, season class and segment share of known nights worked out by hand below and checked
// against core's classifySeason; the panel clicked (nightActivated with the right date, and the
// main window opening Date Study on it). On the sample property: future nights carry
// cb::computeOutlook's forecast and season, past nights the curve cube's actuals.
#include "core/curvecube.h"
#include "core/outlook.h"
#include "core/samplestore.h"
#include "core/seasons.h"
#include "core/store.h"
#include "testsupport.h"
#include "ui/csvexport.h"
#include "ui/mainwindow.h"
#include "ui/workbenchsession.h"
#include "ui/yearmapmodel.h"
#include "ui/yearmappanel.h"
#include "ui/yearmapview.h"

#include <QApplication>
#include <QHelpEvent>
#include <QSignalSpy>
#include <QStandardItemModel>
#include <QStandardPaths>
#include <QTest>
#include <QToolTip>

#include <memory>

namespace {

cb::Date d(const char *iso) { return *cb::Date::parseIso(iso); }

cb::Reservation res(const char *id, const char *booked, const char *arr, const char *dep, int rooms,
                    const char *seg,
                    cb::ReservationStatus status = cb::ReservationStatus::CheckedOut) {
  cb::Reservation r;
  r.id = id;
  r.bookedOn = d(booked);
  r.arrival = d(arr);
  r.departure = d(dep);
  r.rooms = rooms;
  r.segment = seg;
  r.rate = 100;
  r.status = status;
  return r;
}

// Capacity 20. 2025-06-14: CORP 5 + FLEX 2 = 7 rooms. 2025-08-01: GRP 19. 2025-08-02: FLEX 15
// and a CORP no-show (final 16, actual 15). A 2026 booking makes the reading date 2026-06-20.
void fillStore(const std::filesystem::path &path) {
  cb::Property p;
  p.name = "Map House";
  p.capacity = 20;
  auto store = cb::Store::create(path, p);
  cb::Store::Transaction tx(*store);
  store->upsertReservation(res("a", "2025-06-01", "2025-06-14", "2025-06-15", 5, "CORP"), 0);
  store->upsertReservation(res("b", "2025-06-10", "2025-06-14", "2025-06-15", 2, "FLEX"), 0);
  store->upsertReservation(res("g", "2025-05-01", "2025-08-01", "2025-08-02", 19, "GRP"), 0);
  store->upsertReservation(res("f", "2025-07-01", "2025-08-02", "2025-08-03", 15, "FLEX"), 0);
  store->upsertReservation(
      res("n", "2025-07-20", "2025-08-02", "2025-08-03", 1, "CORP", cb::ReservationStatus::NoShow),
      0);
  store->upsertReservation(
      res("z", "2026-06-20", "2026-07-01", "2026-07-02", 1, "CORP", cb::ReservationStatus::Booked),
      0);
  tx.commit();
}

std::size_t dayIndex(int year, cb::Date night) {
  return static_cast<std::size_t>(night - cb::Date::fromYmd(year, 1, 1));
}

} // namespace

class YearMapTest : public QObject {
  Q_OBJECT
  std::unique_ptr<cbtest::TempDir> dir_;
  std::unique_ptr<cbui::WorkbenchSession> session_;

private slots:
  void initTestCase() {
    QStandardPaths::setTestModeEnabled(true);
    dir_ = std::make_unique<cbtest::TempDir>();
    fillStore(*dir_ / "m.curvebench");
    session_ = cbui::WorkbenchSession::open(*dir_ / "m.curvebench");
    QCOMPARE(session_->readingDate().toIso(), std::string("2026-06-20"));
  }

  void pastYearByHand() {
    const cbui::YearMapData map = cbui::computeYearMap(*session_, 2025);
    QCOMPARE(map.nights.size(), std::size_t(365));
    QVERIFY(map.method.empty()); // no future night in 2025: no forecast
    QCOMPARE(map.segments, (std::vector<std::string>{"CORP", "FLEX", "GRP"}));
    const cb::SeasonBands bands = session_->property().settings.seasons; // 0.70 / 0.90 default

    // 2025-06-14: 7 of 20 rooms = 35 % → low (below 70 %).
    const auto &june = map.nights[dayIndex(2025, d("2025-06-14"))];
    QVERIFY(june.past);
    QCOMPARE(*june.rooms, 7.0);
    QCOMPARE(*june.season, cb::classifySeason(7, 20, bands));
    QCOMPARE(*june.season, cb::SeasonClass::Low);
    auto cell =
        cbui::yearMapCell(map, dayIndex(2025, d("2025-06-14")), cbui::YearMapColouring::Season);
    QCOMPARE(cell.text, QStringLiteral("L"));
    cell = cbui::yearMapCell(map, dayIndex(2025, d("2025-06-14")), cbui::YearMapColouring::Demand);
    QCOMPARE(cell.text, QStringLiteral("35"));
    QCOMPARE(cell.band, 0); // under 50 %
    // CORP's share: 5 of 7 rooms = 71 % → the top band (60 % or more).
    cell = cbui::yearMapCell(map, dayIndex(2025, d("2025-06-14")),
                             cbui::YearMapColouring::SegmentShare, 0);
    QCOMPARE(cell.text, QStringLiteral("71"));
    QCOMPARE(cell.band, 4);

    // 2025-08-01: 19 / 20 = 95 % → peak; 2025-08-02: actual 15 (final 16 less a no-show) → 75 %
    // → shoulder.
    const auto &aug1 = map.nights[dayIndex(2025, d("2025-08-01"))];
    QCOMPARE(*aug1.season, cb::SeasonClass::Peak);
    QCOMPARE(cbui::yearMapCell(map, dayIndex(2025, d("2025-08-01")), cbui::YearMapColouring::Season)
                 .text,
             QStringLiteral("P"));
    const auto &aug2 = map.nights[dayIndex(2025, d("2025-08-02"))];
    QCOMPARE(*aug2.final, 16);
    QCOMPARE(*aug2.rooms, 15.0);
    QCOMPARE(*aug2.season, cb::classifySeason(15, 20, bands));
    QCOMPARE(*aug2.season, cb::SeasonClass::Shoulder);
    // Before the first arrival: no figure, drawn grey without text.
    const auto jan =
        cbui::yearMapCell(map, dayIndex(2025, d("2025-01-05")), cbui::YearMapColouring::Season);
    QCOMPARE(jan.band, -1);
    QVERIFY(jan.text.isEmpty());
    // The legend states the property's bands.
    const auto legend = cbui::yearMapLegend(map, cbui::YearMapColouring::Season);
    QCOMPARE(legend.size(), std::size_t(3));
    QCOMPARE(legend[2].label, QStringLiteral("Peak: 90 % or more"));
    QCOMPARE(legend[0].label, QStringLiteral("Low: under 70 % of capacity"));
    // Hover text and CSV carry the night's figures.
    QVERIFY(cbui::yearMapTip(map, dayIndex(2025, d("2025-08-02")), std::nullopt)
                .contains(QStringLiteral("Actual: 15 rooms (final 16)")));
    QVERIFY(cbui::yearMapCsv(map).contains(QStringLiteral("2025-08-02,Sat,1,15.00,16,")));
    // The XLSX export takes numbers from kCsvValueRole: figures carry one, text columns none.
    const auto table = cbui::yearMapTable(map);
    const int row = static_cast<int>(dayIndex(2025, d("2025-08-02")));
    QCOMPARE(table->headerData(3, Qt::Horizontal).toString(), QStringLiteral("rooms"));
    QCOMPARE(table->index(row, 3).data(cbui::kCsvValueRole).toString(), QStringLiteral("15.00"));
    QCOMPARE(table->index(row, 4).data(cbui::kCsvValueRole).toString(), QStringLiteral("16"));
    QVERIFY(!table->index(row, 0).data(cbui::kCsvValueRole).isValid()); // the night: text
    QVERIFY(!table->index(row, 1).data(cbui::kCsvValueRole).isValid()); // the weekday: text
  }

  void panelClickEmitsTheNight() {
    cbui::YearMapPanel panel;
    panel.resize(1300, 640);
    panel.show();
    QSignalSpy computed(&panel, &cbui::YearMapPanel::computed);
    QSignalSpy activated(&panel, &cbui::YearMapPanel::nightActivated);
    panel.setSession(session_.get());
    panel.setYear(2025); // supersedes the reading date's year
    QVERIFY(computed.wait(cbtest::kBackgroundWaitMs));
    QCOMPARE(panel.data()->year, 2025);
    cbui::YearMapView *view = panel.view();
    const QRect cell = view->cellRect(QDate(2025, 8, 1));
    QVERIFY(cell.isValid());
    QCOMPARE(view->nightAt(cell.center()), std::optional<QDate>(QDate(2025, 8, 1)));
    QTest::mouseClick(view, Qt::LeftButton, {}, cell.center());
    QCOMPARE(activated.size(), 1);
    QCOMPARE(activated.at(0).at(0).toDate(), QDate(2025, 8, 1));
    // Hover: the night's figures (19 of 20 rooms, peak) in the tooltip.
    QHelpEvent help(QEvent::ToolTip, cell.center(), view->mapToGlobal(cell.center()));
    QApplication::sendEvent(view, &help);
    QVERIFY(QToolTip::text().contains(QStringLiteral("Actual: 19 rooms")));
    QVERIFY(QToolTip::text().contains(QStringLiteral("season peak")));
    // Segment filter: the colouring follows the segment's share; exports write files.
    panel.setSegment(QStringLiteral("CORP"));
    cbtest::TempDir out;
    QVERIFY(view->exportTo(QString::fromStdString((out / "m.png").string())));
    QVERIFY(view->exportTo(QString::fromStdString((out / "m.pdf").string())));
    QVERIFY(std::filesystem::file_size(out / "m.pdf") > 1000);
  }

  // Keys (the view's header states them): ← / → one night, ↑ / ↓ the same day one month row up or
  // down (clamped to a shorter month), Home / End the ends of the month row, Ctrl+Home / Ctrl+End
  // the ends of the year, Enter opens the night; the focus outline is drawn while focused.
  void keyboardMovesTheFocusedNight() {
    cbui::YearMapPanel panel;
    panel.resize(1300, 640);
    panel.show();
    QVERIFY(QTest::qWaitForWindowExposed(&panel));
    QSignalSpy computed(&panel, &cbui::YearMapPanel::computed);
    QSignalSpy activated(&panel, &cbui::YearMapPanel::nightActivated);
    panel.setSession(session_.get());
    panel.setYear(2025);
    QVERIFY(computed.wait(cbtest::kBackgroundWaitMs));
    cbui::YearMapView *view = panel.view();
    panel.activateWindow();
    view->setFocus();
    QVERIFY(QTest::qWaitForWindowActive(&panel));
    QTRY_VERIFY(view->hasFocus());
    QVERIFY(!view->focusedNight().isValid());
    // The first key lands on 1 Jan (the reading date, 2026-06-20, is not in 2025).
    QTest::keyClick(view, Qt::Key_Right);
    QCOMPARE(view->focusedNight(), QDate(2025, 1, 1));
    QTest::keyClick(view, Qt::Key_Left); // 1 Jan is the map's first night: stays
    QCOMPARE(view->focusedNight(), QDate(2025, 1, 1));
    QTest::keyClick(view, Qt::Key_End);
    QCOMPARE(view->focusedNight(), QDate(2025, 1, 31));
    QTest::keyClick(view, Qt::Key_Right); // across the month end
    QCOMPARE(view->focusedNight(), QDate(2025, 2, 1));
    QTest::keyClick(view, Qt::Key_Left);
    QCOMPARE(view->focusedNight(), QDate(2025, 1, 31));
    QTest::keyClick(view, Qt::Key_Down); // February 2025 has 28 days
    QCOMPARE(view->focusedNight(), QDate(2025, 2, 28));
    QTest::keyClick(view, Qt::Key_Up);
    QCOMPARE(view->focusedNight(), QDate(2025, 1, 28));
    QTest::keyClick(view, Qt::Key_Up); // no row above January
    QCOMPARE(view->focusedNight(), QDate(2025, 1, 28));
    QTest::keyClick(view, Qt::Key_Home);
    QCOMPARE(view->focusedNight(), QDate(2025, 1, 1));
    QTest::keyClick(view, Qt::Key_End, Qt::ControlModifier);
    QCOMPARE(view->focusedNight(), QDate(2025, 12, 31));
    QTest::keyClick(view, Qt::Key_Right); // 31 Dec is the last night: stays
    QCOMPARE(view->focusedNight(), QDate(2025, 12, 31));
    QTest::keyClick(view, Qt::Key_Home, Qt::ControlModifier);
    QCOMPARE(view->focusedNight(), QDate(2025, 1, 1));
    // To 1 Aug: seven rows down, then Enter opens it as a click does.
    for (int i = 0; i < 7; ++i)
      QTest::keyClick(view, Qt::Key_Down);
    QCOMPARE(view->focusedNight(), QDate(2025, 8, 1));
    QCOMPARE(activated.size(), 0);
    QTest::keyClick(view, Qt::Key_Return);
    QCOMPARE(activated.size(), 1);
    QCOMPARE(activated.at(0).at(0).toDate(), QDate(2025, 8, 1));
    // The outline is drawn on the focused cell's edge (black and white dashes) and on no other.
    const QImage shot = view->grab().toImage();
    auto outlined = [&](const QDate &night) {
      const QRect c = view->cellRect(night);
      int marks = 0;
      for (int x = c.left() + 1; x < c.right() - 1; ++x) {
        const QColor px = shot.pixelColor(x, c.top() + 1);
        marks += px == QColor(Qt::black) || px == QColor(Qt::white);
      }
      return marks >= c.width() - 4;
    };
    QVERIFY(outlined(QDate(2025, 8, 1)));
    QVERIFY(!outlined(QDate(2025, 8, 2)));
    // A click moves the keyboard's night too.
    QTest::mouseClick(view, Qt::LeftButton, {}, view->cellRect(QDate(2025, 6, 14)).center());
    QCOMPARE(view->focusedNight(), QDate(2025, 6, 14));
    QTest::keyClick(view, Qt::Key_Right);
    QCOMPARE(view->focusedNight(), QDate(2025, 6, 15));
  }

  void mainWindowOpensDateStudy() {
    cbui::MainWindow w;
    QSignalSpy loaded(&w, &cbui::MainWindow::sessionLoaded);
    w.openStore(*dir_ / "m.curvebench");
    QVERIFY(loaded.wait(cbtest::kBackgroundWaitMs));
    w.showScreen(cbui::MainWindow::YearMapScreen);
    QSignalSpy computed(w.yearMapPanel(), &cbui::YearMapPanel::computed);
    w.yearMapPanel()->setYear(2025);
    QVERIFY(computed.wait(cbtest::kBackgroundWaitMs));
    cbui::YearMapView *view = w.yearMapPanel()->view();
    QTest::mouseClick(view, Qt::LeftButton, {}, view->cellRect(QDate(2025, 6, 14)).center());
    QCOMPARE(w.currentScreen(), cbui::MainWindow::DateStudyScreen);
    QCOMPARE(w.studiedNight(), QDate(2025, 6, 14));
  }

  void sampleFutureNightsCarryTheOutlook() {
    cbtest::TempDir dir;
    cb::buildSampleStore(dir / "s.curvebench", dir / "files");
    auto s = cbui::WorkbenchSession::open(dir / "s.curvebench");
    const cb::Date asOf = s->readingDate();
    const int year = asOf.year();
    const cbui::YearMapData map = cbui::computeYearMap(*s, year);
    const cb::Date dec31 = cb::Date::fromYmd(year, 12, 31);
    QVERIFY(dec31 > asOf); // the sample's reading date leaves future nights in its year
    cb::OutlookOptions o;
    o.asOf = asOf;
    o.days = dec31 - asOf;
    const cb::Outlook outlook =
        cb::computeOutlook(s->reservations(), s->property(), s->censorSources(), s->events(), o);
    QCOMPARE(QString::fromStdString(map.method), QString::fromStdString(outlook.method));
    for (std::size_t k : {std::size_t(0), outlook.nights.size() / 2, outlook.nights.size() - 1}) {
      const cb::OutlookNight &n = outlook.nights[k];
      const auto &m = map.nights[dayIndex(year, n.night)];
      QVERIFY(!m.past);
      QCOMPARE(*m.rooms, n.forecast);
      QCOMPARE(*m.season, n.season);
      QCOMPARE(*m.otb, n.otb);
    }
    // A past night: the cube's actual (finals less no-shows).
    const cb::Date past = asOf - 30;
    const auto cube =
        cb::CurveCube::build(s->reservations(), {past, past, 0, cb::SeriesBy::Total, asOf});
    QCOMPARE(*map.nights[dayIndex(year, past)].rooms, double(*cube.actual(0, past)));
  }
};

QTEST_MAIN(YearMapTest)
#include "test_yearmap.moc"
