// Date Study on the sample property, offscreen: the model's figures against core computed
// independently (the curve cube, Reservation::onBooks), method and segment switches served from
// the forecast cache, an override stored and listed, the drill-down adding up to the OTB figure.
#include "core/curvecube.h"
#include "core/samplestore.h"
#include "testsupport.h"
#include "ui/datestudychart.h"
#include "ui/datestudyjobs.h"
#include "ui/datestudymodel.h"
#include "ui/datestudypanel.h"
#include "ui/workbenchsession.h"

#include <QApplication>
#include <QComboBox>
#include <QElapsedTimer>
#include <QListWidget>
#include <QTabWidget>
#include <QTableWidget>
#include <QTest>
#include <qcustomplot.h>

#include <cmath>
#include <memory>

class DateStudyTest : public QObject {
  Q_OBJECT
  std::unique_ptr<cbtest::TempDir> dir_;
  std::unique_ptr<cbui::WorkbenchSession> session_;

  cb::CurveCube cube(cb::Date night, int maxDba, cb::SeriesBy by) const {
    return cb::CurveCube::build(session_->reservations(),
                                {night, night, maxDba, by, session_->readingDate()});
  }

private slots:
  void initTestCase() {
    dir_ = std::make_unique<cbtest::TempDir>();
    cb::buildSampleStore(*dir_ / "s.curvebench", *dir_ / "files");
    session_ = cbui::WorkbenchSession::open(*dir_ / "s.curvebench");
  }

  // A protection cancelled by a reset (a reload of the store) is never shown as current: the
  // request made while it was still ending runs after it and is the only result delivered, with
  // figures, not "cancelled". A request equal to the one under way does not run twice.
  void protectionAfterResetIsTheNewOne() {
    QObject parent;
    cbui::DateStudyJobs jobs(&parent);
    std::vector<cbui::ProtectionOut> got;
    jobs.onProtection = [&](const cbui::ProtectionOut &o) { got.push_back(o); };
    const cb::Date night = session_->defaultNight();
    const cb::Date other = night + 1;
    jobs.reset(session_.get());
    jobs.requestProtection(night, "pickup-adv");
    jobs.reset(session_.get()); // cancels it
    jobs.requestProtection(other, "pickup-adv");
    jobs.requestProtection(night, "pickup-adv"); // the latest request wins
    QVERIFY(jobs.protecting());
    QTRY_VERIFY_WITH_TIMEOUT(!jobs.protecting(), 120000);
    QTest::qWait(50); // anything else would be delivered by now
    QCOMPARE(got.size(), std::size_t(1));
    QCOMPARE(got[0].night, night);
    QCOMPARE(got[0].asOf, session_->readingDate());
    QVERIFY2(got[0].error.empty(), got[0].error.c_str());
    QVERIFY(got[0].protection.has_value());

    got.clear();
    jobs.requestProtection(other, "pickup-adv");
    jobs.requestProtection(other, "pickup-adv"); // already coming
    QTRY_VERIFY_WITH_TIMEOUT(!jobs.protecting(), 120000);
    QTest::qWait(50);
    QCOMPARE(got.size(), std::size_t(1));
    QCOMPARE(got[0].night, other);
    QVERIFY(got[0].protection.has_value());

    // The panel's Cancel stops the forecasts, not the night's protection.
    got.clear();
    const int lead = night - session_->readingDate();
    jobs.ensure(lead, lead + 7, "pickup-adv");
    QVERIFY(jobs.forecasting());
    jobs.requestProtection(night, "pickup-adv");
    jobs.cancelForecasts();
    QVERIFY(!jobs.forecasting());
    QTRY_VERIFY_WITH_TIMEOUT(!jobs.protecting(), 120000);
    QTest::qWait(50);
    QCOMPARE(got.size(), std::size_t(1));
    QCOMPARE(got[0].night, night);
    QVERIFY(got[0].protection.has_value());
  }

  // This year's curve of the model is OTB(s, s − d) of the curve cube (brief §4 definition),
  // for the hotel and for one segment; the drill-down's rooms are the OTB at the reading date.
  void modelCurveEqualsCube() {
    cbui::DateStudyModel m(*session_);
    const cb::Date night = session_->defaultNight();
    m.setNight(night);
    const cbui::NightCurves c = m.curves();
    const cb::CurveCube total = cube(night, m.maxLead(), cb::SeriesBy::Total);
    QVERIFY(m.lead() >= 14);
    for (int lead : {m.lead(), m.lead() + 1, m.lead() + 7, m.lead() + 30}) {
      const auto i = static_cast<std::size_t>(m.maxLead() - lead);
      QCOMPARE(c.thisYear.x[i], double(-lead));
      QCOMPARE(c.thisYear.y[i], double(total.otbRooms(0, night, lead)));
    }
    QCOMPARE(m.roomsOnBooks(), total.otbRooms(0, night, m.lead()));

    const std::string seg = session_->segments().front().code;
    m.setSegment(seg);
    const cb::CurveCube bySeg = cube(night, m.maxLead(), cb::SeriesBy::Segment);
    const std::size_t si = *bySeg.seriesIndex(seg);
    const cbui::NightCurves cs = m.curves();
    QCOMPARE(cs.thisYear.y.back(), double(bySeg.otbRooms(si, night, m.lead())));
    QCOMPARE(m.roomsOnBooks(), bySeg.otbRooms(si, night, m.lead()));
    QVERIFY(m.roomsOnBooks() < total.otbRooms(0, night, m.lead()));
  }

  // Two methods computed once; switching reads the cache and gives the method's own forecast.
  void methodSwitchReadsTheCache() {
    cbui::DateStudyModel m(*session_);
    m.setNight(session_->defaultNight());
    QVERIFY(!m.forecast("pickup-add")); // nothing cached yet
    auto cache = std::make_shared<cbui::ForecastCache>(cbui::computeForecastCache(
        *session_, session_->readingDate(), m.horizonNeeded(), {"pickup-add", "mavg"}));
    QVERIFY(cache->failures.empty());
    m.setCache(cache);
    QElapsedTimer t;
    t.start();
    const auto a = m.forecast("pickup-add");
    const auto b = m.forecast("mavg");
    const qint64 us = t.nsecsElapsed() / 1000;
    QVERIFY(a && b);
    QCOMPARE(m.cacheReads(), 2);
    QVERIFY(a->forecast != b->forecast);
    QCOMPARE(a->method, std::string("pickup-add"));
    QCOMPARE(a->otb, m.roomsOnBooks());
    // pickup-add forecasts OTB plus a pickup (brief §5): never below the rooms on the books.
    QVERIFY(a->forecast >= a->otb);
    QVERIFY(m.mae("pickup-add").has_value());
    qInfo("two forecasts read from the cache in %lld us", static_cast<long long>(us));
    // Demand against capacity: constrained ≤ capacity and ≤ demand; sell-out in [0, 1]
    // (brief §6 definitions, E[min(D, C)]).
    const auto cap = m.capacityFigures("pickup-add");
    QVERIFY(cap);
    QVERIFY(cap->constrained <= cap->capacity + 1e-9);
    QVERIFY(cap->constrained <= cap->forecast + 1e-9);
    QVERIFY(std::abs(cap->constrained + cap->spill - cap->forecast) < 1e-6);
  }

  // The panel: background forecasts, method and segment switch, override, drill-down.
  void panelDrivesEverything() {
    cbui::DateStudyPanel panel;
    panel.resize(1366, 768);
    panel.show();
    panel.setSession(session_.get());
    const cb::Date night = session_->defaultNight();
    QCOMPARE(panel.model()->night(), night);
    // Methods arrive one by one in the background; mavg is among the first.
    QTRY_VERIFY_WITH_TIMEOUT(panel.model()->forecast("mavg").has_value(), 600000);
    QVERIFY(panel.forecastText().contains(QStringLiteral("Forecast")));

    // Method switch: served from the cache.
    const QString before = panel.forecastText();
    const int reads = panel.model()->cacheReads();
    panel.methodPicker()->setCurrentIndex(panel.methodPicker()->findData(QStringLiteral("mavg")));
    QVERIFY(panel.model()->cacheReads() > reads);
    QVERIFY(panel.forecastText() != before);
    qInfo("method switch: %lld us", static_cast<long long>(panel.lastMethodSwitchMicros()));

    // Night switch within the cached horizon.
    panel.setNight(night + 1);
    qInfo("night switch: %lld us", static_cast<long long>(panel.lastNightSwitchMicros()));
    QVERIFY(panel.model()->forecast("mavg").has_value());
    panel.setNight(night);

    // Segment switch: the model follows, the chart's this-year curve ends at the segment OTB.
    const std::string seg = session_->segments().front().code;
    panel.segmentPicker()->setCurrentIndex(
        panel.segmentPicker()->findData(QString::fromStdString(seg)));
    QCOMPARE(panel.model()->segment(), seg);
    const cb::CurveCube bySeg = cube(night, panel.model()->maxLead(), cb::SeriesBy::Segment);
    const int segOtb = bySeg.otbRooms(*bySeg.seriesIndex(seg), night, panel.model()->lead());
    QVERIFY(panel.chart()
                ->valuesAt(-panel.model()->lead())
                .contains(QStringLiteral(": %1 rooms").arg(segOtb)));

    // Drill-down: the listed rooms add up to the OTB figure.
    panel.showReservations();
    QTableWidget *res = panel.reservationTable();
    int rooms = 0;
    for (int r = 0; r < res->rowCount(); ++r)
      rooms += res->item(r, 4)->text().toInt();
    QCOMPARE(rooms, segOtb);

    // Override: refused without a reason, stored and listed with one.
    QVERIFY(!panel.saveOverride(150, QString()));
    QVERIFY(panel.saveOverride(150, QStringLiteral("conference announced")));
    QCOMPARE(panel.overrideHistory()->count(), 1);
    QVERIFY(panel.overrideHistory()->item(0)->text().contains(QStringLiteral("conference")));
    const auto stored = panel.model()->overrides();
    QCOMPARE(stored.size(), std::size_t(1));
    QCOMPARE(stored[0].value, 150.0);
    QCOMPARE(stored[0].segment, seg);

    // Protection table filled (EMSR-b) once the background work is done.
    panel.segmentPicker()->setCurrentIndex(0);
    QTRY_VERIFY_WITH_TIMEOUT(panel.segmentTable()->rowCount() > 0, 300000);

    const QByteArray shots = qgetenv("CURVEBENCH_SCREENSHOT_DIR");
    if (!shots.isEmpty()) {
      panel.methodPicker()->setCurrentIndex(
          panel.methodPicker()->findData(QStringLiteral("pickup-adv")));
      QTRY_VERIFY_WITH_TIMEOUT(panel.segmentTable()->rowCount() > 0, 300000);
      panel.findChild<QTabWidget *>()->setCurrentIndex(0); // segments, protection, caution
      QVERIFY(panel.grab().save(QString::fromLocal8Bit(shots) +
                                QStringLiteral("/date-study-sample.png")));
    }
  }
};

// The background forecasts of every method take minutes on a busy machine: a longer limit
// than Qt Test's default 5 minutes per function.
int main(int argc, char **argv) {
  qputenv("QTEST_FUNCTION_TIMEOUT", "1200000");
  QApplication app(argc, argv);
  DateStudyTest test;
  return QTest::qExec(&test, argc, argv);
}
#include "test_datestudy.moc"
