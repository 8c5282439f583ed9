// The Accuracy screen on the sample property, offscreen: the model's figures obey what the
// definitions force (counts from the look-ahead rule, RMSE ≥ MAE ≥ |bias|, coverage a share),
// auto's picks add up to its decisions, and the panel runs, fills, exports and cancels.
#include "core/samplestore.h"
#include "testsupport.h"
#include "ui/accuracychart.h"
#include "ui/accuracymodel.h"
#include "ui/accuracypanel.h"
#include "ui/csvexport.h"
#include "ui/workbenchsession.h"

#include <QComboBox>
#include <QSignalSpy>
#include <QTableWidget>
#include <QTest>
#include <qcustomplot.h>

#include <cmath>
#include <memory>

class AccuracyTest : public QObject {
  Q_OBJECT
  std::unique_ptr<cbtest::TempDir> dir_;
  std::unique_ptr<cbui::WorkbenchSession> session_;

private slots:
  void initTestCase() {
    dir_ = std::make_unique<cbtest::TempDir>();
    cb::buildSampleStore(*dir_ / "s.curvebench", *dir_ / "files");
    session_ = cbui::WorkbenchSession::open(*dir_ / "s.curvebench");
  }

  // Two weeks of nights s = R−13 … R (R the reading date), each forecast at every lead h from
  // its own reading date s − h: 14 forecasts per lead, none of a night after R.
  void countsFollowTheLookAheadRule() {
    cbui::AccuracyRequest req;
    req.weeks = 2;
    req.methods = {"pickup-add", "mavg", "auto"};
    req.leads = {7, 14, 30};
    const cbui::AccuracyData a = cbui::computeAccuracy(*session_, req);
    QCOMPARE(a.to, session_->readingDate());
    QCOMPARE(a.from, session_->readingDate() - 13);
    QCOMPARE(a.series, std::string("ALL"));
    for (const char *m : {"pickup-add", "mavg", "auto"}) {
      const cbui::AccuracyLine *l7 = a.line(m, 7), *l14 = a.line(m, 14), *l30 = a.line(m, 30);
      QVERIFY(l7 && l14 && l30);
      QCOMPARE(l7->accuracy.count, std::int64_t(14));
      QCOMPARE(l14->accuracy.count, std::int64_t(14));
      QCOMPARE(l30->accuracy.count, std::int64_t(14));
      // Definitions: RMSE ≥ MAE ≥ |bias| (quadratic mean ≥ mean ≥ |mean|); coverage a share.
      QVERIFY(l7->accuracy.rmse >= l7->accuracy.mae - 1e-9);
      QVERIFY(l7->accuracy.mae >= std::abs(l7->accuracy.bias) - 1e-9);
      QVERIFY(!l7->coverage || (*l7->coverage >= 0 && *l7->coverage <= 1));
    }
    // auto decided per reading date and lead bucket; each bucket's latest choice comes with its
    // evidence, best first, and only the candidates listed are ever chosen.
    QVERIFY(!a.autoPicks.empty());
    for (const cbui::AutoPick &p : a.autoPicks) {
      int total = 0;
      for (const auto &[method, n] : p.picks) {
        QVERIFY(method == "pickup-add" || method == "mavg");
        total += n;
      }
      QVERIFY(total >= 1);
      QVERIFY(!p.latestEvidence.empty());
      QCOMPARE(p.latestEvidence.front().first, p.latest); // best first
    }
  }

  void panelRunsFillsAndCancels() {
    cbui::AccuracyPanel panel;
    panel.resize(1300, 700);
    panel.weeksPicker()->setCurrentIndex(0); // 4 weeks
    QSignalSpy done(&panel, &cbui::AccuracyPanel::finished);
    panel.setSession(session_.get());
    panel.show(); // the first show starts the backtest
    QVERIFY(panel.isRunning());
    QVERIFY(done.wait(600000));
    QVERIFY2(panel.statusText().contains(QStringLiteral("each forecast at every lead")),
             qPrintable(panel.statusText()));
    // Every method but mlp, plus auto, at each of the 7 leads.
    QTableWidget *t = panel.table();
    QVERIFY(t->rowCount() >= 7 * 10);
    QVERIFY(panel.autoText().contains(QStringLiteral("Leads")));
    QVERIFY(panel.chart()->plot()->graphCount() >= 10);
    const QString csv = cbui::tableToCsv(*t->model());
    QVERIFY(csv.startsWith(QStringLiteral("Method,Lead,Forecasts,MAE,")));

    // A segment, then cancelled at once: the status says so and the table keeps the last run.
    const int rows = t->rowCount();
    panel.segmentPicker()->setCurrentIndex(1);
    panel.run();
    panel.cancel();
    QVERIFY(done.wait(600000));
    QVERIFY(panel.statusText().contains(QStringLiteral("cancelled")));
    QCOMPARE(t->rowCount(), rows);
    panel.setSession(nullptr);
  }
};

QTEST_MAIN(AccuracyTest)
#include "test_accuracy.moc"
