// The Horizon's model layer on the sample property, headless: the rows must carry core's outlook
// for each night, pickup by the definition of brief section 4, sort by real values and switch to a
// segment's own figures.
#include "core/outlook.h"
#include "core/pickup.h"
#include "core/samplestore.h"
#include "testsupport.h"
#include "ui/horizonmodel.h"
#include "ui/workbenchsession.h"

#include <QSortFilterProxyModel>
#include <QTest>

#include <map>
#include <memory>

namespace {

cb::Date fromQDate(const QDate &d) {
  return cb::Date::fromYmd(d.year(), static_cast<unsigned>(d.month()),
                           static_cast<unsigned>(d.day()));
}

// OTB(s, t) by the definition of brief section 4: rooms of reservations covering night s, booked
// on or before t and not cancelled on or before t; optionally of one segment.
int otbByHand(const std::vector<cb::Reservation> &rows, cb::Date s, cb::Date t,
              const std::string &segment = {}) {
  int n = 0;
  for (const auto &r : rows)
    if ((segment.empty() || r.segment == segment) && r.arrival <= s && s < r.departure &&
        r.bookedOn <= t && !(r.cancelledOn && *r.cancelledOn <= t))
      n += r.rooms;
  return n;
}

} // namespace

class HorizonTest : public QObject {
  Q_OBJECT
  std::unique_ptr<cbtest::TempDir> dir_;
  std::unique_ptr<cbui::WorkbenchSession> session_;

private slots:
  void initTestCase() {
    dir_ = std::make_unique<cbtest::TempDir>();
    cb::buildSampleStore(*dir_ / "s.curvebench", *dir_ / "files");
    session_ = cbui::WorkbenchSession::open(*dir_ / "s.curvebench");
  }

  void rowsCarryTheOutlook() {
    cbui::HorizonModel model;
    model.setData(cbui::computeHorizon(*session_, 30, {}));
    QCOMPARE(model.rowCount(), 30);
    QCOMPARE(model.columnCount(), int(cbui::HorizonModel::ColumnCount));

    cb::OutlookOptions o;
    o.asOf = session_->readingDate();
    o.days = 30;
    const cb::Outlook outlook =
        cb::computeOutlook(session_->reservations(), session_->property(),
                           session_->censorSources(), session_->events(), o);
    QCOMPARE(outlook.nights.size(), std::size_t(30));
    for (int i : {0, 6, 29}) {
      const cb::OutlookNight &n = outlook.nights[static_cast<std::size_t>(i)];
      const cbui::HorizonRow &r = model.row(i);
      QCOMPARE(fromQDate(r.night), n.night);
      QCOMPARE(r.otb, n.otb);
      QCOMPARE(r.forecast, n.forecast);
      QCOMPARE(*r.constrained, n.constrained);
      QCOMPARE(*r.pSellout, n.pSellout);
      // OTB against the definition (brief §4), counted by hand from the reservations.
      QCOMPARE(r.otb, otbByHand(session_->reservations(), n.night, o.asOf));
      // Pickup = OTB(s, t) − OTB(s, t − k) (brief §4), against core/pickup.h's own count.
      QCOMPARE(r.pickup1, cb::pickupOf(session_->reservations(), n.night,
                                       cb::PickupWindow::lastDays(o.asOf, 1))
                              .net);
      QCOMPARE(r.pickup7, cb::pickupOf(session_->reservations(), n.night,
                                       cb::PickupWindow::lastDays(o.asOf, 7))
                              .net);
      // The shown text is the figure with thousands separators (core/textformat.h).
      QCOMPARE(model.index(i, cbui::HorizonModel::Otb).data().toString(), QString::number(n.otb));
    }
  }

  void csvHasPlainNumbers() {
    cbui::HorizonModel model;
    model.setData(cbui::computeHorizon(*session_, 7, {}));
    const QStringList lines = model.toCsv().split(QLatin1Char('\n'), Qt::SkipEmptyParts);
    QCOMPARE(lines.size(), 8); // header + 7 nights
    QVERIFY(lines[0].startsWith(QStringLiteral("night,weekday,event,lead,capacity,otb,")));
    const cbui::HorizonRow &r = model.row(0);
    const QString expected = QStringLiteral("%1,%2,").arg(
        r.night.toString(Qt::ISODate), QLocale::c().toString(r.night, QStringLiteral("ddd")));
    QVERIFY(lines[1].startsWith(expected));
    QVERIFY(
        lines[1].contains(QStringLiteral(",%1,%2,%3,").arg(r.capacity).arg(r.otb).arg(r.pickup1)));
  }

  void sortsByRealValues() {
    cbui::HorizonModel model;
    model.setData(cbui::computeHorizon(*session_, 60, {}));
    QSortFilterProxyModel proxy;
    proxy.setSourceModel(&model);
    proxy.setSortRole(cbui::HorizonModel::kSortRole);
    proxy.sort(cbui::HorizonModel::Occupancy, Qt::AscendingOrder);
    double previous = -1;
    for (int i = 0; i < proxy.rowCount(); ++i) {
      const int source = proxy.mapToSource(proxy.index(i, 0)).row();
      const double occ = *model.row(source).occupancy;
      QVERIFY2(occ >= previous, qPrintable(QStringLiteral("row %1").arg(i)));
      previous = occ;
    }
    proxy.sort(cbui::HorizonModel::Night, Qt::DescendingOrder);
    QCOMPARE(proxy.index(0, 0).data(cbui::HorizonModel::kNightRole).toDate(), model.row(59).night);
  }

  // Occupancies whose texts sort differently ("100 %" < "5 %" < "50 %" as text).
  void sortsNumbersNotTexts() {
    cbui::HorizonData data;
    for (double occ : {0.05, 1.0, 0.5}) {
      cbui::HorizonRow r;
      r.night = QDate(2026, 6, 1).addDays(static_cast<int>(data.rows.size()));
      r.occupancy = occ;
      data.rows.push_back(r);
    }
    cbui::HorizonModel model;
    model.setData(data);
    QSortFilterProxyModel proxy;
    proxy.setSourceModel(&model);
    proxy.setSortRole(cbui::HorizonModel::kSortRole);
    proxy.sort(cbui::HorizonModel::Occupancy, Qt::AscendingOrder);
    QCOMPARE(proxy.index(0, cbui::HorizonModel::Occupancy).data().toString(),
             QStringLiteral("5 %"));
    QCOMPARE(proxy.index(1, cbui::HorizonModel::Occupancy).data().toString(),
             QStringLiteral("50 %"));
    QCOMPARE(proxy.index(2, cbui::HorizonModel::Occupancy).data().toString(),
             QStringLiteral("100 %"));
  }

  void segmentShowsItsOwnFigures() {
    // The segment with most rooms on the books over the next 30 nights.
    const cb::Date t = session_->readingDate();
    std::map<std::string, int> bySegment;
    for (const auto &s : session_->segments())
      for (cb::Date n = t + 1; n <= t + 30; ++n)
        bySegment[s.code] += otbByHand(session_->reservations(), n, t, s.code);
    std::string code;
    for (const auto &[c, rooms] : bySegment)
      if (code.empty() || rooms > bySegment[code])
        code = c;
    QVERIFY(!code.empty());

    const cbui::HorizonData total = cbui::computeHorizon(*session_, 30, {});
    const cbui::HorizonData seg = cbui::computeHorizon(*session_, 30, code);
    QCOMPARE(seg.rows.size(), std::size_t(30));
    bool differs = false;
    for (std::size_t i = 0; i < seg.rows.size(); ++i) {
      const cbui::HorizonRow &r = seg.rows[i];
      const cb::Date night = fromQDate(r.night);
      QCOMPARE(r.otb, otbByHand(session_->reservations(), night, t, code));
      QCOMPARE(r.pickup7, otbByHand(session_->reservations(), night, t, code) -
                              otbByHand(session_->reservations(), night, t - 7, code));
      QVERIFY(!r.constrained && !r.occupancy && !r.pSellout); // hotel-level only
      QVERIFY(r.forecast >= 0);
      differs = differs || r.otb != total.rows[i].otb;
    }
    QVERIFY(differs);
    cbui::HorizonModel model;
    model.setData(seg);
    QVERIFY(model.index(0, cbui::HorizonModel::Occupancy).data().toString().isEmpty());
    QVERIFY(model.index(0, cbui::HorizonModel::Occupancy)
                .data(Qt::ToolTipRole)
                .toString()
                .contains(QStringLiteral("Hotel-level")));

    // Another segment given this one's cube reads it and shows what a fresh computation shows;
    // the hotel's outlook given a segment cube builds its own.
    QVERIFY(seg.cube);
    QCOMPARE(seg.cube->by(), cb::SeriesBy::Segment);
    std::string other;
    for (const auto &[c, rooms] : bySegment)
      if (c != code && rooms > 0)
        other = c;
    QVERIFY(!other.empty());
    const cbui::HorizonData fresh = cbui::computeHorizon(*session_, 30, other);
    const cbui::HorizonData reused = cbui::computeHorizon(*session_, 30, other, seg.cube);
    QCOMPARE(reused.cube.get(), seg.cube.get());
    QCOMPARE(reused.rows.size(), fresh.rows.size());
    for (std::size_t i = 0; i < fresh.rows.size(); ++i) {
      QCOMPARE(reused.rows[i].otb, fresh.rows[i].otb);
      QCOMPARE(reused.rows[i].forecast, fresh.rows[i].forecast);
      QCOMPARE(reused.rows[i].lo, fresh.rows[i].lo);
      QCOMPARE(reused.rows[i].hi, fresh.rows[i].hi);
    }
    const cbui::HorizonData hotel = cbui::computeHorizon(*session_, 30, {}, seg.cube);
    QVERIFY(hotel.cube && hotel.cube.get() != seg.cube.get());
    for (std::size_t i = 0; i < hotel.rows.size(); ++i)
      QCOMPARE(hotel.rows[i].forecast, total.rows[i].forecast);
  }
};

QTEST_MAIN(HorizonTest)
#include "test_horizon.moc"
