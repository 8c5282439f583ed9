// Group offer, offscreen, on the sample property: the screen's check gives the same per-night
// displaced rooms, verdicts and break-even rate as cb::displacementFromData called directly with
// the CLI's options, and as `curvebench displace` prints for the same offer (run as a process); an
// invalid offer (0 rooms, a night on the reading date, a negative rate, no nights) gives a message
// and no result; the panel evaluates in the background, shows the caution, exports, cancels; the
// main window has the tab.
#include "core/advice.h"
#include "core/displacement.h"
#include "core/samplestore.h"
#include "core/store.h"
#include "testsupport.h"
#include "ui/csvexport.h"
#include "ui/groupofferchart.h"
#include "ui/groupoffermodel.h"
#include "ui/groupofferpanel.h"
#include "ui/mainwindow.h"
#include "ui/tableexport.h"
#include "ui/workbenchsession.h"

#include <QAbstractItemModel>
#include <QCheckBox>
#include <QFile>
#include <QProcess>
#include <QSignalSpy>
#include <QStandardItemModel>
#include <QStandardPaths>
#include <QTableWidget>
#include <QTest>

#include <cmath>
#include <memory>

namespace {

// An offer a month out: Thursday to Saturday, fewer rooms on the last night, with extras.
cbui::GroupOffer sampleOffer(cb::Date asOf) {
  cbui::GroupOffer o;
  o.name = "Test congress";
  o.arrival = asOf + 33;
  o.rooms = {40, 40, 30};
  o.rate = 95;
  o.otherRevenue = 20;
  o.cost = 8;
  return o;
}

cb::Displacement direct(const cbui::WorkbenchSession &s, const cbui::GroupOffer &offer) {
  cb::OutlookOptions o; // as `curvebench displace STORE --offer FILE --as-of DATE`
  o.asOf = s.readingDate();
  return cb::displacementFromData(s.reservations(), cb::Store::open(s.path())->blockRecords(),
                                  s.property(), s.censorSources(), s.events(), offer.offerNights(),
                                  o);
}

bool near(double a, double b) { return std::fabs(a - b) <= 1e-9 * std::max(1.0, std::fabs(b)); }

} // namespace

class GroupOfferTest : public QObject {
  Q_OBJECT
  std::unique_ptr<cbtest::TempDir> dir_;
  std::unique_ptr<cbui::WorkbenchSession> session_;

  void sameAsCore(const cbui::GroupOfferResult &r, const cb::Displacement &want) {
    QVERIFY(r.ok());
    const cb::Displacement &got = r.displacement;
    QCOMPARE(got.nights.size(), want.nights.size());
    for (std::size_t i = 0; i < want.nights.size(); ++i) {
      const cb::DisplacementNight &g = got.nights[i], &w = want.nights[i];
      QCOMPARE(g.night, w.night);
      QCOMPARE(g.shoulder, w.shoulder);
      QCOMPARE(g.offer.rooms, w.offer.rooms);
      QVERIFY2(near(g.displacedRooms, w.displacedRooms),
               qPrintable(QString::fromStdString(g.night.toIso())));
      QVERIFY(near(g.displacedValue, w.displacedValue));
      QVERIFY(near(g.net, w.net));
      QCOMPARE(cbui::nightVerdict(g), cbui::nightVerdict(w));
    }
    QVERIFY(want.breakEvenRate.has_value());
    QVERIFY(near(*got.breakEvenRate, *want.breakEvenRate));
    QCOMPARE(got.worthIt, want.worthIt);
  }

private slots:
  void initTestCase() {
    QStandardPaths::setTestModeEnabled(true);
    dir_ = std::make_unique<cbtest::TempDir>();
    cb::buildSampleStore(*dir_ / "s.curvebench", *dir_ / "files");
    session_ = cbui::WorkbenchSession::open(*dir_ / "s.curvebench");
  }

  void sameNumbersAsCore() {
    const cbui::GroupOffer offer = sampleOffer(session_->readingDate());
    const cbui::GroupOfferResult r = cbui::evaluateGroupOffer(*session_, offer);
    const cb::Displacement want = direct(*session_, offer);
    sameAsCore(r, want);
    // Three offer nights and the two shoulder nights around them.
    QCOMPARE(r.displacement.nights.size(), std::size_t(5));
    QVERIFY(r.displacement.nights.front().shoulder);
    QVERIFY(r.displacement.nights.back().shoulder);
    QCOMPARE(r.displacement.nights.front().night, offer.arrival - 1);
    QCOMPARE(r.displacement.nights.back().night, offer.departure());
    // Group value of an offer night: rooms × (rate + other revenue − cost) = 40 × 107.
    QCOMPARE(r.displacement.nights[1].groupValue, 40 * (95.0 + 20.0 - 8.0));
    // The break-even rate is the rate at which the group value equals the displaced value:
    // rate × 110 room-nights + 110 × (20 − 8) = displaced value.
    QVERIFY(near(*r.displacement.breakEvenRate * 110 + 110 * 12.0, r.displacement.displacedValue));

    // The table: one row per night, plain numbers for the export.
    QStandardItemModel table;
    cbui::fillGroupOfferTable(table, r);
    QCOMPARE(table.rowCount(), 5);
    QCOMPARE(table.columnCount(), int(cbui::GroupOfferColumnCount));
    QCOMPARE(table.headerData(cbui::ColDisplacedValue, Qt::Horizontal).toString(),
             QStringLiteral("Displaced revenue (EUR)"));
    QCOMPARE(table.index(0, cbui::ColKind).data().toString(), QStringLiteral("shoulder"));
    QCOMPARE(table.index(4, cbui::ColKind).data().toString(), QStringLiteral("shoulder"));
    QCOMPARE(table.index(2, cbui::ColKind).data().toString(), QStringLiteral("offer"));
    QCOMPARE(table.index(2, cbui::ColNight).data(cbui::kCsvValueRole).toString(),
             QString::fromStdString((offer.arrival + 1).toIso()));
    QCOMPARE(table.index(2, cbui::ColDisplaced).data(cbui::kCsvValueRole).toString(),
             QString::number(want.nights[2].displacedRooms, 'f', 4));
    QCOMPARE(table.index(2, cbui::ColVerdict).data().toString(),
             cbui::nightVerdict(want.nights[2]));
    // Money with thousands separators: 40 × 107 = 4,280.00.
    QCOMPARE(table.index(1, cbui::ColGroupValue).data().toString(), QStringLiteral("4,280.00"));
    QVERIFY(cbui::offerTotals(r).contains(QStringLiteral("Group value EUR 11,770.00")));
    QVERIFY(cbui::breakEvenText(r).startsWith(QStringLiteral("Break-even group rate: EUR ")));
  }

  void sameNumbersAsTheCli() {
    const cb::Date asOf = session_->readingDate();
    const cbui::GroupOffer offer = sampleOffer(asOf);
    const cbui::GroupOfferResult r = cbui::evaluateGroupOffer(*session_, offer);
    QVERIFY(r.ok());
    cbtest::TempDir tmp;
    const QString csv = QString::fromStdString((tmp / "offer.csv").string());
    {
      QFile f(csv);
      QVERIFY(f.open(QIODevice::WriteOnly));
      f.write("night,rooms,rate,other_revenue,cost\n");
      for (const cb::OfferNight &n : offer.offerNights())
        f.write(QStringLiteral("%1,%2,%3,%4,%5\n")
                    .arg(QString::fromStdString(n.night.toIso()))
                    .arg(n.rooms)
                    .arg(n.rate)
                    .arg(n.otherRevenue)
                    .arg(n.cost)
                    .toUtf8());
    }
    QProcess cli;
    cli.start(QStringLiteral(CURVEBENCH_CLI),
              {QStringLiteral("displace"), QString::fromStdString(session_->path().string()),
               QStringLiteral("--offer"), csv, QStringLiteral("--as-of"),
               QString::fromStdString(asOf.toIso())});
    QVERIFY(cli.waitForFinished(120000));
    QCOMPARE(cli.exitCode(), 0);
    const QStringList lines =
        QString::fromUtf8(cli.readAllStandardOutput()).split(QLatin1Char('\n'), Qt::SkipEmptyParts);
    const QString notes = QString::fromUtf8(cli.readAllStandardError());
    // Header, then one line per night: the CLI's night, kind, displaced_rooms (col 15), net
    // (col 17) and verdict (col 18), each to its two printed decimals.
    QCOMPARE(lines.size(), int(r.displacement.nights.size()) + 1);
    const QStringList head = lines[0].split(QLatin1Char(','));
    QCOMPARE(head[14], QStringLiteral("displaced_rooms"));
    QCOMPARE(head[16], QStringLiteral("net"));
    QCOMPARE(head[17], QStringLiteral("verdict"));
    const QString cliVerdicts[] = {QStringLiteral("group pays"),
                                   QStringLiteral("displaces more than it pays"),
                                   QStringLiteral("loses"), QStringLiteral("even")};
    const QString ourVerdicts[] = {
        QStringLiteral("Group pays"), QStringLiteral("Group does not pay"),
        QStringLiteral("Shoulder: loses"), QStringLiteral("Shoulder: no loss")};
    for (std::size_t i = 0; i < r.displacement.nights.size(); ++i) {
      const cb::DisplacementNight &n = r.displacement.nights[i];
      const QStringList f = lines[int(i) + 1].split(QLatin1Char(','));
      QCOMPARE(f[0], QString::fromStdString(n.night.toIso()));
      QCOMPARE(f[2], n.shoulder ? QStringLiteral("shoulder") : QStringLiteral("offer"));
      QCOMPARE(f[14], QString::number(n.displacedRooms, 'f', 2));
      QCOMPARE(f[16], QString::number(n.net, 'f', 2));
      int k = 0;
      while (k < 4 && cliVerdicts[k] != f[17])
        ++k;
      QVERIFY2(k < 4, qPrintable(f[17]));
      QCOMPARE(cbui::nightVerdict(n), ourVerdicts[k]);
    }
    QVERIFY2(notes.contains(QStringLiteral("break-even group rate: %1 per room-night")
                                .arg(*r.displacement.breakEvenRate, 0, 'f', 2)),
             qPrintable(notes));
    QVERIFY(notes.contains(
        QStringLiteral("group value %1,").arg(r.displacement.groupValue, 0, 'f', 2)));
  }

  void invalidOffersGiveAMessageAndNoResult() {
    const cb::Date asOf = session_->readingDate();
    cbui::GroupOffer zero = sampleOffer(asOf);
    zero.rooms[1] = 0;
    cbui::GroupOffer early = sampleOffer(asOf);
    early.arrival = asOf;
    cbui::GroupOffer negative = sampleOffer(asOf);
    negative.rate = -1;
    cbui::GroupOffer none = sampleOffer(asOf);
    none.rooms.clear();
    const std::pair<cbui::GroupOffer, QString> cases[] = {
        {zero, QStringLiteral("has 0 rooms: every night of the offer needs 1 room or more")},
        {early, QStringLiteral("is on or before the reading date")},
        {negative, QStringLiteral("The rate cannot be negative.")},
        {none, QStringLiteral("The offer has no nights")}};
    for (const auto &[offer, message] : cases) {
      QVERIFY2(cbui::checkGroupOffer(offer, asOf).contains(message), qPrintable(message));
      const cbui::GroupOfferResult r = cbui::evaluateGroupOffer(*session_, offer);
      QVERIFY(!r.ok());
      QVERIFY(r.error.contains(message));
      QVERIFY(r.displacement.nights.empty());
      QStandardItemModel table;
      cbui::fillGroupOfferTable(table, r);
      QCOMPARE(table.rowCount(), 0);
    }
    QVERIFY(cbui::checkGroupOffer(sampleOffer(asOf), asOf).isEmpty());
  }

  void panelEvaluatesInTheBackground() {
    cbui::GroupOfferPanel panel;
    panel.resize(1300, 700);
    QSignalSpy evaluated(&panel, &cbui::GroupOfferPanel::evaluated);
    panel.setSession(session_.get());
    panel.show(); // the starting offer is checked when the screen is first shown
    QVERIFY(evaluated.wait(cbtest::kBackgroundWaitMs));
    QVERIFY(panel.result() != nullptr);
    QCOMPARE(panel.result()->offer.nights(), 3);

    const cbui::GroupOffer offer = sampleOffer(session_->readingDate());
    panel.setOffer(offer);
    QVERIFY(!panel.sameEveryNight()->isChecked()); // 40, 40, 30
    QCOMPARE(panel.roomsEditor()->rowCount(), 3);
    panel.evaluate();
    QVERIFY(panel.isRunning());
    QVERIFY(evaluated.wait(cbtest::kBackgroundWaitMs));
    QVERIFY(!panel.isRunning());
    sameAsCore(*panel.result(), direct(*session_, offer));
    QCOMPARE(panel.table()->rowCount(), 5);
    QVERIFY(panel.verdictText().contains(QStringLiteral("Break-even group rate: EUR")));
    QCOMPARE(panel.cautionText(), QString::fromUtf8(cb::kAdvisoryCaution.data(),
                                                    qsizetype(cb::kAdvisoryCaution.size())));

    // Exports: the table as CSV and XLSX, the chart as PNG and PDF.
    cbtest::TempDir out;
    auto file = [&](const char *name) { return QString::fromStdString((out / name).string()); };
    QString error;
    QVERIFY(cbui::writeTable(*panel.table(), file("t.csv"), cbui::TableFormat::Csv,
                             QStringLiteral("group-offer"), &error));
    QFile csv(file("t.csv"));
    QVERIFY(csv.open(QIODevice::ReadOnly));
    const QString text = QString::fromUtf8(csv.readAll());
    QVERIFY(text.startsWith(QStringLiteral("Night,Day,Type,Capacity,Transient OTB")));
    QVERIFY(text.contains(QString::fromStdString(offer.arrival.toIso()) +
                          QStringLiteral(",Thu,offer,")));
    QVERIFY(cbui::writeTable(*panel.table(), file("t.xlsx"), cbui::TableFormat::Xlsx,
                             QStringLiteral("group-offer"), &error));
    QVERIFY(panel.chart()->exportTo(file("c.png")));
    QVERIFY(panel.chart()->exportTo(file("c.pdf")));
    QVERIFY(std::filesystem::file_size(out / "c.pdf") > 1000);

    // "Same for every night" sets every night; untick it and give one night 0 rooms: a message,
    // no result, an empty table.
    panel.sameEveryNight()->setChecked(true);
    QCOMPARE(panel.offer().rooms, (std::vector<int>{40, 40, 40}));
    panel.sameEveryNight()->setChecked(false);
    panel.roomsEditor()->item(1, 1)->setData(Qt::EditRole, 0);
    panel.evaluate();
    QCOMPARE(evaluated.size(), 3);
    QVERIFY(!panel.isRunning());
    QVERIFY(panel.messageText().contains(QStringLiteral("has 0 rooms")));
    QVERIFY(panel.result() == nullptr);
    QCOMPARE(panel.table()->rowCount(), 0);
    QVERIFY(panel.cautionText().isEmpty());

    // A far-out offer cancelled at once: no result, the message says so.
    cbui::GroupOffer far = offer;
    far.arrival = session_->readingDate() + 600;
    panel.setOffer(far);
    panel.evaluate();
    panel.cancel();
    QVERIFY(evaluated.wait(cbtest::kBackgroundWaitMs));
    QCOMPARE(panel.messageText(), QStringLiteral("Check cancelled."));
    QVERIFY(panel.result() == nullptr);
  }

  void mainWindowHasTheScreen() {
    cbui::MainWindow w;
    QSignalSpy loaded(&w, &cbui::MainWindow::sessionLoaded);
    w.openStore(*dir_ / "s.curvebench");
    QVERIFY(loaded.wait(cbtest::kBackgroundWaitMs));
    w.showScreen(cbui::MainWindow::GroupOfferScreen);
    QCOMPARE(w.currentScreen(), cbui::MainWindow::GroupOfferScreen);
    QVERIFY(w.groupOfferPanel()->isVisibleTo(&w));
    QCOMPARE(w.groupOfferPanel()->offer().arrival.isoWeekday(), 4u); // the starting offer
  }
};

QTEST_MAIN(GroupOfferTest)
#include "test_groupoffer.moc"
