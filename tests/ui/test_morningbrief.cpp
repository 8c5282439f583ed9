// The morning brief's model layer, headless: which nights its lists pick (hand-made horizon,
// worked out below) and the PDF of the sample store — one page, written whole, the session's
// reading date left as it was; a date outside the data gives a reason and no file.
#include "core/samplestore.h"
#include "testsupport.h"
#include "ui/horizonmodel.h"
#include "ui/morningbrief.h"
#include "ui/workbenchsession.h"

#include <QFile>
#include <QTest>

#include <memory>

namespace {

cbui::HorizonRow night(int day, int pickup1, int pickup7, const QStringList &flags = {}) {
  cbui::HorizonRow r;
  r.night = QDate(2026, 11, day);
  r.pickup1 = pickup1;
  r.pickup7 = pickup7;
  r.flags = flags;
  return r;
}

} // namespace

class MorningBriefTest : public QObject {
  Q_OBJECT
  std::unique_ptr<cbtest::TempDir> dir_;
  std::unique_ptr<cbui::WorkbenchSession> session_;

private slots:
  void initTestCase() {
    dir_ = std::make_unique<cbtest::TempDir>();
    cb::buildSampleStore(*dir_ / "s.curvebench", *dir_ / "files");
    session_ = cbui::WorkbenchSession::open(*dir_ / "s.curvebench");
  }

  // Nights 1…6 of November with pickups (1 d, 7 d) = (3, 5), (0, 9), (-2, 1), (3, 2), (7, -1),
  // (1, 9). Largest positive 1-day pickups, two at most: 7 (night 5), then 3 — a tie of nights 1
  // and 4, the earlier first → {4, 0} as indices. 7-day: 9 twice (nights 2 and 6) → {1, 5}.
  // Sell-outs: nights flagged "full" or "sell-out likely" in night order → {0, 4} (night 3's
  // "weak" does not count); pace alerts: "pace up"/"pace down" → {2, 3}.
  void listsPickTheRightNights() {
    cbui::HorizonData d;
    d.rows = {night(1, 3, 5, {QStringLiteral("full")}),
              night(2, 0, 9),
              night(3, -2, 1, {QStringLiteral("weak"), QStringLiteral("pace down")}),
              night(4, 3, 2, {QStringLiteral("pace up")}),
              night(5, 7, -1, {QStringLiteral("sell-out likely")}),
              night(6, 1, 9)};
    const cbui::BriefHighlights h = cbui::briefHighlights(d, 2);
    QCOMPARE(h.pickup1, (std::vector<std::size_t>{4, 0}));
    QCOMPARE(h.pickup7, (std::vector<std::size_t>{1, 5}));
    QCOMPARE(h.sellouts, (std::vector<std::size_t>{0, 4}));
    QCOMPARE(h.paceAlerts, (std::vector<std::size_t>{2, 3}));
    // Nothing positive, nothing flagged: empty lists (the brief then says "none").
    cbui::HorizonData quiet;
    quiet.rows = {night(1, 0, -1), night(2, -3, 0)};
    const cbui::BriefHighlights q = cbui::briefHighlights(quiet);
    QVERIFY(q.pickup1.empty() && q.pickup7.empty() && q.sellouts.empty() && q.paceAlerts.empty());
  }

  void sampleBriefIsAOnePagePdf() {
    const cb::Date before = session_->readingDate();
    const QString file = QString::fromStdString((*dir_ / "brief ü.pdf").string());
    QString error;
    QVERIFY2(cbui::renderMorningBrief(*session_, QDate(2026, 10, 31), file, &error),
             qPrintable(error));
    QCOMPARE(session_->readingDate(), before); // the workbench's own date is left alone
    QFile f(file);
    QVERIFY(f.open(QIODevice::ReadOnly));
    const QByteArray pdf = f.readAll();
    QVERIFY(pdf.startsWith("%PDF-"));
    QVERIFY(pdf.size() > 10'000); // text, table and the chart's image
    QCOMPARE(pdf.count("/Type /Page\n") + pdf.count("/Type /Page "), qsizetype(1));
  }

  void aDateOutsideTheDataIsRefused() {
    const cb::Date before = session_->readingDate();
    const QString file = QString::fromStdString((*dir_ / "never.pdf").string());
    QString error;
    QVERIFY(!cbui::renderMorningBrief(*session_, QDate(1990, 1, 1), file, &error));
    QVERIFY(!error.isEmpty());
    QVERIFY(!QFile::exists(file));
    QCOMPARE(session_->readingDate(), before);
  }
};

QTEST_MAIN(MorningBriefTest)
#include "test_morningbrief.moc"
