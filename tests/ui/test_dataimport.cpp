// The Data screen's model layer and its import steps, offscreen: mapping by header name,
// profile save / load round trip (read back by the CLI's profile loader), the shipped open-data
// profile, a bad file that validates with findings at line:column and commits nothing in strict
// mode, the lenient commit of the same file, the import log table and the health summary.
#include "core/finding.h"
#include "core/mappingprofile.h"
#include "core/reservationimporter.h"
#include "core/store.h"
#include "testsupport.h"
#include "ui/csvexport.h"
#include "ui/dataimportmodel.h"
#include "ui/datapanel.h"
#include "ui/findingspanel.h"
#include "ui/importjob.h"

#include <QComboBox>
#include <QSignalSpy>
#include <QStandardPaths>
#include <QTableView>
#include <QTableWidget>
#include <QTest>

#include <algorithm>
#include <string>

namespace {

namespace fs = std::filesystem;

QString q(const fs::path &p) { return QString::fromStdString(p.string()); }

QStringList sl(std::initializer_list<const char *> items) {
  QStringList out;
  for (const char *i : items)
    out << QString::fromUtf8(i);
  return out;
}

fs::path dataDir() { return cbtest::sourceDir() / "tests" / "data"; }

/// A store holding tests/data/baseline/reservations.csv (A1 … A4).
void makeBaselineStore(const fs::path &store) {
  cb::Property p;
  p.name = "Test house";
  p.capacity = 40;
  auto s = cb::Store::create(store, p);
  auto rep = cb::importReservations(*s, dataDir() / "baseline" / "reservations.csv");
  QVERIFY(rep.written);
}

bool hasFinding(const cb::Findings &findings, std::int64_t line, int column,
                const std::string &message) {
  return std::any_of(findings.begin(), findings.end(), [&](const cb::Finding &f) {
    return f.line == line && f.column == column && f.message == message;
  });
}

// A reservation-system extract with its own column names (our own test data).
const char *kOtherHeader = "Booking ID,Status,Booking Date,Cancellation Date,Arrival Date,"
                           "Departure Date,Rooms,Room Type,Market Segment,Channel,ADR,Notes\n";
const char *kOtherRows =
    "X1,booked,2026-01-05,,2026-03-01,2026-03-03,1,DBL,Corporate,Direct,120.5,\n"
    "X2,cancelled,2026-01-10,2026-02-01,2026-03-02,2026-03-05,2,TWN,Leisure,Web,95,late\n";

// The open hotel-booking dataset's header, and a row shaped like its first one (values from
// tests/core/test_reservationimporter.cpp, OpenCityHotelDataset: 2015 July 1, 0 + 2 nights,
// lead time 6, adr 0, Check-Out).
const char *kOpenHeader =
    "hotel,is_canceled,lead_time,arrival_date_year,arrival_date_month,arrival_date_week_number,"
    "arrival_date_day_of_month,stays_in_weekend_nights,stays_in_week_nights,adults,children,"
    "babies,meal,country,market_segment,distribution_channel,is_repeated_guest,"
    "previous_cancellations,previous_bookings_not_canceled,reserved_room_type,"
    "assigned_room_type,booking_changes,deposit_type,agent,company,days_in_waiting_list,"
    "customer_type,adr,required_car_parking_spaces,total_of_special_requests,"
    "reservation_status,reservation_status_date\n";
const char *kOpenRow = "City Hotel,0,6,2015,July,27,1,0,2,1,0,0,HB,PRT,Offline TA/TO,TA/TO,0,0,"
                       "0,A,A,0,No Deposit,6,NULL,0,Transient,0,0,0,Check-Out,2015-07-03\n";

} // namespace

class DataImportTest : public QObject {
  Q_OBJECT
private slots:
  void initTestCase() { QStandardPaths::setTestModeEnabled(true); }

  // Header names differ from the native ones: nothing is found until matched by name; then
  // every field is read from its column and the edited (unsaved) profile imports the file.
  void matchByHeaderName() {
    cbtest::TempDir dir;
    cbtest::writeFile(dir / "extract.csv", std::string(kOtherHeader) + kOtherRows);
    cbui::ImportDraft draft;
    QVERIFY(draft.setFile(q(dir / "extract.csv")));
    QCOMPARE(draft.header().size(), 12);
    QCOMPARE(draft.previewRows().size(), 2);
    QCOMPARE(draft.previewLines(), (QList<qint64>{2, 3}));
    // Column names are case-sensitive: all nine required native fields are missing.
    QCOMPARE(draft.unmapped(), sl({"reservation_id", "status", "booked_on", "cancelled_on",
                                   "arrival", "departure", "rooms", "segment", "rate"}));
    QVERIFY(!draft.ready());
    // 9 required + room_type + channel; currency and block_id have no column in this file.
    QCOMPARE(draft.autoMatch(), 11);
    QCOMPARE(draft.row(QStringLiteral("reservation_id")).column, QStringLiteral("Booking ID"));
    QCOMPARE(draft.row(QStringLiteral("booked_on")).column, QStringLiteral("Booking Date"));
    QCOMPARE(draft.row(QStringLiteral("arrival")).column, QStringLiteral("Arrival Date"));
    QCOMPARE(draft.row(QStringLiteral("segment")).column, QStringLiteral("Market Segment"));
    QCOMPARE(draft.row(QStringLiteral("rate")).column, QStringLiteral("ADR"));
    QCOMPARE(draft.row(QStringLiteral("rooms")).column, QStringLiteral("Rooms"));
    QVERIFY(draft.unmapped().isEmpty());
    QVERIFY(draft.ready());
    QVERIFY(draft.edited());
    QCOMPARE(draft.autoMatch(), 0); // nothing left to match

    cbui::MappingModel model(&draft);
    const int rate = static_cast<int>(draft.fields().indexOf(QStringLiteral("rate")));
    QCOMPARE(model.data(model.index(rate, cbui::MappingModel::SourceCol)).toString(),
             QStringLiteral("ADR"));
    QCOMPARE(model.data(model.index(rate, cbui::MappingModel::ValueCol)).toString(),
             QStringLiteral("120.5"));
    QCOMPARE(model.data(model.index(rate, cbui::MappingModel::CheckCol)).toString(),
             QStringLiteral("ok"));

    // The edited profile is imported as JSON text and named as unsaved in the log.
    cb::Property p;
    p.name = "T";
    p.capacity = 10;
    auto store = cb::Store::create(dir / "s.curvebench", p);
    const cb::ImportOptions o = draft.importOptions(cb::ImportMode::Strict, false);
    QCOMPARE(o.profile, std::string("native (edited, not saved)"));
    QVERIFY(!o.profileText.empty());
    auto rep = cb::importReservations(*store, dir / "extract.csv", o);
    QVERIFY(rep.written);
    QCOMPARE(store->reservationCount(), std::int64_t(2));
    QCOMPARE(store->reservation("X2")->rooms, 2);
    QCOMPARE(store->reservation("X1")->rate, 120.5);
    QCOMPARE(store->importLog().back().profile, std::string("native (edited, not saved)"));
  }

  // Saved as JSON, the mapping is read by the CLI's profile loader and by a fresh draft, offered
  // among the profiles next to the store (reservations only), and used by its path.
  void profileSaveLoadRoundTrip() {
    cbtest::TempDir dir;
    cbtest::writeFile(dir / "extract.csv", std::string(kOtherHeader) + kOtherRows);
    cbui::ImportDraft draft;
    draft.setFile(q(dir / "extract.csv"));
    draft.autoMatch();
    QVERIFY(draft.setColumn(QStringLiteral("channel"), QString())); // leave channel out
    const QString path = q(dir / "my-pms.json");
    QString error;
    QVERIFY2(draft.saveProfile(path, &error), qPrintable(error));
    QVERIFY(!draft.edited());
    QCOMPARE(draft.profileName(), QStringLiteral("my-pms"));
    QCOMPARE(draft.profileSource(), path);

    cb::Findings findings;
    auto core = cb::MappingProfile::load(path.toStdString(), findings);
    QVERIFY(core.has_value());
    QCOMPARE(core->name(), std::string("my-pms"));

    cbui::ImportDraft again;
    QVERIFY2(again.startFrom(path, &error), qPrintable(error));
    QVERIFY(!again.edited());
    again.setFile(q(dir / "extract.csv"));
    for (const QString &f : draft.fields()) {
      QCOMPARE(again.row(f).column, draft.row(f).column);
      QCOMPARE(static_cast<int>(again.row(f).source), static_cast<int>(draft.row(f).source));
    }
    QCOMPARE(static_cast<int>(again.row(QStringLiteral("channel")).source),
             static_cast<int>(cbui::MappingRow::Source::NotImported));
    QVERIFY(again.ready());
    const cb::ImportOptions o = again.importOptions(cb::ImportMode::Lenient, true);
    QCOMPARE(o.profile, path.toStdString());
    QVERIFY(o.profileText.empty());
    QVERIFY(o.dryRun);

    const QStringList choices =
        cbui::ImportDraft::profileChoices(cbui::ImportKind::Reservations, q(dir.path()));
    QCOMPARE(choices, sl({"native", "hotel-bookings-open-data"}) << path);
    QCOMPARE(cbui::ImportDraft::profileChoices(cbui::ImportKind::Blocks, q(dir.path())),
             sl({"native"}));
    // A reservations profile cannot start a blocks mapping.
    cbui::ImportDraft blocks;
    blocks.setKind(cbui::ImportKind::Blocks);
    QVERIFY(!blocks.startFrom(path, &error));
    QVERIFY(error.contains(QStringLiteral("not a blocks one")));

    // A profile the importer would refuse is not written.
    draft.setDelimiter(QLatin1Char('"'));
    const QString bad = q(dir / "bad.json");
    QVERIFY(!draft.saveProfile(bad, &error));
    QVERIFY(error.contains(QStringLiteral("delimiter")));
    QVERIFY(!fs::exists(dir / "bad.json"));
  }

  // The shipped open-data profile: derived fields read several columns, a constant, the line
  // number; a file lacking one of those columns shows which field cannot be made.
  void openDataProfile() {
    cbtest::TempDir dir;
    cbtest::writeFile(dir / "open.csv", std::string(kOpenHeader) + kOpenRow);
    cbui::ImportDraft draft;
    QVERIFY(draft.startFrom(QStringLiteral("hotel-bookings-open-data")));
    QVERIFY(draft.setFile(q(dir / "open.csv")));
    QVERIFY(draft.ready());
    QCOMPARE(draft.autoMatch(), 0);
    QVERIFY(!draft.edited());
    const cbui::MappingRow arrival = draft.row(QStringLiteral("arrival"));
    QCOMPARE(static_cast<int>(arrival.source), static_cast<int>(cbui::MappingRow::Source::Derived));
    QCOMPARE(arrival.columnsUsed,
             sl({"arrival_date_year", "arrival_date_month", "arrival_date_day_of_month"}));
    QCOMPARE(static_cast<int>(draft.row(QStringLiteral("reservation_id")).source),
             static_cast<int>(cbui::MappingRow::Source::LineNumber));
    QCOMPARE(draft.row(QStringLiteral("rooms")).description, QStringLiteral("always 1"));
    QCOMPARE(draft.row(QStringLiteral("booked_on")).columnsUsed, sl({"lead_time"}));

    // A dry run of that row: one reservation, ok.
    cb::Property p;
    p.name = "T";
    p.capacity = 10;
    cb::Store::create(dir / "s.curvebench", p);
    const auto out =
        cbui::runImportJob(dir / "s.curvebench", dir / "open.csv", cbui::ImportKind::Reservations,
                           draft.importOptions(cb::ImportMode::Lenient, true), nullptr);
    QCOMPARE(out.report.log.rowsRead, std::int64_t(1));
    QCOMPARE(out.report.log.added, std::int64_t(1));
    QCOMPARE(out.report.log.rejected, std::int64_t(0));
    QCOMPARE(cb::Store::open(dir / "s.curvebench")->reservationCount(), std::int64_t(0));

    // Saved as it is, the derived fields survive and the importer's loader reads it back.
    QString error;
    QVERIFY2(draft.saveProfile(q(dir / "open-copy.json"), &error), qPrintable(error));
    cb::Findings findings;
    QVERIFY(cb::MappingProfile::load((dir / "open-copy.json").string(), findings).has_value());
    cbui::ImportDraft copy;
    QVERIFY(copy.startFrom(q(dir / "open-copy.json")));
    copy.setFile(q(dir / "open.csv"));
    QCOMPARE(copy.row(QStringLiteral("departure")).description,
             draft.row(QStringLiteral("departure")).description);
    QCOMPARE(copy.row(QStringLiteral("departure")).description,
             QStringLiteral("arrival + “stays_in_weekend_nights” + “stays_in_week_nights” days"));
    QVERIFY(copy.ready());

    std::string header = kOpenHeader;
    header.replace(header.find("lead_time,"), 10, "lead,");
    cbtest::writeFile(dir / "nolead.csv", header + kOpenRow);
    QVERIFY(draft.setFile(q(dir / "nolead.csv")));
    QCOMPARE(draft.row(QStringLiteral("booked_on")).missing, sl({"lead_time"}));
    QCOMPARE(draft.unmapped(), sl({"booked_on"}));
    QVERIFY(!draft.ready());
  }

  // The mapping table's Source cell: required fields cannot be left out, optional ones can;
  // only header columns are accepted.
  void mappingModelEdits() {
    cbtest::TempDir dir;
    cbtest::writeFile(dir / "r.csv", cbtest::readFile(dataDir() / "baseline" / "reservations.csv"));
    cbui::ImportDraft draft;
    QVERIFY(draft.setFile(q(dir / "r.csv")));
    cbui::MappingModel model(&draft);
    QCOMPARE(model.rowCount(), 13);
    const int rate = static_cast<int>(draft.fields().indexOf(QStringLiteral("rate")));
    const int channel = static_cast<int>(draft.fields().indexOf(QStringLiteral("channel")));
    QVERIFY(!model.choices(rate).contains(cbui::MappingModel::notImported()));
    QCOMPARE(model.choices(channel).front(), cbui::MappingModel::notImported());
    QCOMPARE(model.choices(channel).size(), 14); // not imported + 13 header columns
    QVERIFY(!model.setData(model.index(rate, cbui::MappingModel::SourceCol),
                           cbui::MappingModel::notImported()));
    QVERIFY(!model.setData(model.index(rate, cbui::MappingModel::SourceCol),
                           QStringLiteral("no such column")));
    QVERIFY(!draft.edited());
    QVERIFY(model.setData(model.index(channel, cbui::MappingModel::SourceCol),
                          cbui::MappingModel::notImported()));
    QVERIFY(draft.edited());
    QCOMPARE(model.data(model.index(channel, cbui::MappingModel::CheckCol)).toString(),
             QStringLiteral("left empty"));
    // Reading rate from the segment column: the mapping takes it (validation will refuse the
    // values, not the mapping).
    QVERIFY(
        model.setData(model.index(rate, cbui::MappingModel::SourceCol), QStringLiteral("segment")));
    QCOMPARE(draft.row(QStringLiteral("rate")).column, QStringLiteral("segment"));
  }

  // A semicolon-separated file stops the preview with a finding until the separator is set.
  void separatorOfThePreview() {
    cbui::ImportDraft draft;
    QVERIFY(!draft.setFile(q(dataDir() / "broken" / "semicolon_delimiter" / "input.csv")));
    QCOMPARE(draft.previewFindings().size(), std::size_t(1));
    QVERIFY(draft.previewFindings()[0].message.find("semicolons") != std::string::npos);
    draft.setDelimiter(QLatin1Char(';'));
    QVERIFY(draft.previewFindings().empty());
    QCOMPARE(draft.header().size(), 13);
    QVERIFY(draft.ready());
  }

  // The bad file: validation finds the negative rate at line 4, column 11 and writes nothing;
  // a strict commit writes no reservation (the attempt is logged as "nothing written"); a
  // lenient commit writes the three good rows (B1, B3 new; A1 updated from 120.5 to 130).
  void badFileStrictNothingLenientGoodRows() {
    cbtest::TempDir dir;
    const fs::path store = dir / "s.curvebench";
    makeBaselineStore(store);
    const fs::path bad = dataDir() / "broken" / "negative_rate" / "input.csv";
    cbui::ImportDraft draft;
    QVERIFY(draft.setFile(q(bad)));
    QCOMPARE(draft.previewRows().size(), 4);
    QVERIFY(draft.ready());

    auto job = [&](cb::ImportMode mode, bool dryRun) {
      return cbui::runImportJob(store, bad, cbui::ImportKind::Reservations,
                                draft.importOptions(mode, dryRun), nullptr);
    };
    // Validate.
    auto out = job(cb::ImportMode::Lenient, true);
    QVERIFY(!out.report.written);
    QVERIFY(hasFinding(out.report.findings, 4, 11, "rate is negative (-10.5)"));
    QCOMPARE(out.report.log.rowsRead, std::int64_t(4));
    QCOMPARE(out.report.log.rejected, std::int64_t(1));
    QVERIFY2(out.summary.contains(QStringLiteral("4 rows read, 3 ok, 1 rejected")),
             qPrintable(out.summary));
    {
      auto s = cb::Store::open(store);
      QCOMPARE(s->reservationCount(), std::int64_t(4));
      QCOMPARE(s->importLog().size(), std::size_t(1)); // the baseline import only
    }
    // Commit strict.
    out = job(cb::ImportMode::Strict, false);
    QVERIFY(!out.report.written);
    QVERIFY(hasFinding(out.report.findings, 4, 11, "rate is negative (-10.5)"));
    {
      auto s = cb::Store::open(store);
      QCOMPARE(s->reservationCount(), std::int64_t(4));
      QCOMPARE(s->reservation("A1")->rate, 120.5);
      QVERIFY(!s->reservation("B1"));
      const auto log = s->importLog();
      QCOMPARE(log.size(), std::size_t(2));
      QCOMPARE(log.back().outcome, std::string("failed"));
      QCOMPARE(log.back().added + log.back().updated + log.back().unchanged, std::int64_t(0));
    }
    // Commit lenient.
    out = job(cb::ImportMode::Lenient, false);
    QVERIFY(out.report.written);
    {
      auto s = cb::Store::open(store);
      QCOMPARE(s->reservationCount(), std::int64_t(6));
      QVERIFY(s->reservation("B1"));
      QVERIFY(s->reservation("B3"));
      QVERIFY(!s->reservation("B2"));
      QCOMPARE(s->reservation("A1")->rate, 130.0);
    }
    cbui::ImportLogModel log;
    log.setEntries(cbui::readImportLog(store));
    QCOMPARE(log.rowCount(), 3);
    auto cell = [&](int row, int col) { return log.data(log.index(row, col)).toString(); };
    // Newest first.
    QCOMPARE(cell(0, cbui::ImportLogModel::ModeCol), QStringLiteral("lenient"));
    QCOMPARE(cell(0, cbui::ImportLogModel::OutcomeCol), QStringLiteral("written"));
    QCOMPARE(cell(0, cbui::ImportLogModel::AddedCol), QStringLiteral("2"));
    QCOMPARE(cell(0, cbui::ImportLogModel::UpdatedCol), QStringLiteral("1"));
    QCOMPARE(cell(0, cbui::ImportLogModel::RejectedCol), QStringLiteral("1"));
    QCOMPARE(cell(0, cbui::ImportLogModel::FileCol), QStringLiteral("input.csv"));
    QCOMPARE(cell(1, cbui::ImportLogModel::ModeCol), QStringLiteral("strict"));
    QCOMPARE(cell(1, cbui::ImportLogModel::OutcomeCol), QStringLiteral("nothing written"));
    QCOMPARE(cell(2, cbui::ImportLogModel::AddedCol), QStringLiteral("4"));
  }

  // The screen runs the same steps in the background: findings reach the findings panel with
  // line and column, strict writes nothing, lenient writes and asks the window to reload.
  void panelRunsTheSteps() {
    cbtest::TempDir dir;
    const fs::path store = dir / "s.curvebench";
    makeBaselineStore(store);
    const fs::path bad = dataDir() / "broken" / "negative_rate" / "input.csv";
    cbui::FindingsPanel findings;
    cbui::DataPanel panel;
    panel.setFindingsPanel(&findings);
    panel.setStore(store);
    QCOMPARE(panel.importLogModel()->rowCount(), 1);
    QVERIFY(panel.chooseFile(q(bad)));
    QSignalSpy finished(&panel, &cbui::DataPanel::jobFinished);
    QSignalSpy written(&panel, &cbui::DataPanel::storeWritten);

    panel.validate();
    QVERIFY(panel.busy());
    QVERIFY(finished.wait(cbtest::kBackgroundWaitMs));
    QCOMPARE(finished.last().at(0).toBool(), false);
    QVERIFY2(panel.resultText().contains(QStringLiteral("Commit strict would write nothing")),
             qPrintable(panel.resultText()));
    QCOMPARE(findings.count(), 1);
    QCOMPARE(findings.table()->item(0, 2)->text(), QStringLiteral("4"));
    QCOMPARE(findings.table()->item(0, 3)->text(), QStringLiteral("11"));
    QCOMPARE(panel.importLogModel()->rowCount(), 1);

    panel.commit(false);
    QVERIFY(finished.wait(cbtest::kBackgroundWaitMs));
    QCOMPARE(finished.last().at(0).toBool(), false);
    QCOMPARE(written.count(), 0);
    QCOMPARE(cb::Store::open(store)->reservationCount(), std::int64_t(4));
    QCOMPARE(panel.importLogModel()->rowCount(), 2);

    panel.commit(true);
    QVERIFY(finished.wait(cbtest::kBackgroundWaitMs));
    QCOMPARE(finished.last().at(0).toBool(), true);
    QCOMPARE(written.count(), 1);
    QCOMPARE(cb::Store::open(store)->reservationCount(), std::int64_t(6));
    QCOMPARE(panel.importLogModel()->rowCount(), 3);
  }

  // Picking a column in the mapping table's combo (as a user does) changes the draft; the
  // screen's notes follow once the editor has closed.
  void mappingTableComboEdits() {
    cbtest::TempDir dir;
    cbtest::writeFile(dir / "extract.csv", std::string(kOtherHeader) + kOtherRows);
    cbui::DataPanel panel;
    panel.resize(1200, 700);
    panel.show();
    QVERIFY(QTest::qWaitForWindowExposed(&panel));
    QVERIFY(panel.chooseFile(q(dir / "extract.csv")));
    QCOMPARE(panel.draft().row(QStringLiteral("rate")).column, QStringLiteral("ADR"));
    auto *view = panel.findChild<QTableView *>(QStringLiteral("mappingTable"));
    QVERIFY(view);
    const int rate = static_cast<int>(panel.draft().fields().indexOf(QStringLiteral("rate")));
    const QModelIndex cell = view->model()->index(rate, cbui::MappingModel::SourceCol);
    view->setCurrentIndex(cell);
    view->edit(cell);
    QComboBox *combo = view->findChild<QComboBox *>();
    QVERIFY(combo);
    QCOMPARE(combo->currentText(), QStringLiteral("ADR"));
    QVERIFY(combo->findText(QStringLiteral("Notes")) >= 0);
    combo->setCurrentIndex(combo->findText(QStringLiteral("Notes")));
    QTest::keyClick(combo, Qt::Key_Return);
    QTRY_COMPARE(panel.draft().row(QStringLiteral("rate")).column, QStringLiteral("Notes"));
    QVERIFY(panel.draft().edited());
    QTRY_COMPARE(view->model()->index(rate, cbui::MappingModel::ValueCol).data().toString(),
                 QString()); // the first row's Notes is empty
  }

  // Group blocks: their own fields and native profile.
  void blocksKind() {
    cbtest::TempDir dir;
    cbtest::writeFile(dir / "blocks.csv",
                      "block_id,name,segment,arrival,departure,rooms_per_night,cutoff,status\n"
                      "G1,Choir,GRP,2026-05-01,2026-05-03,20,2026-04-10,definite\n");
    cbui::ImportDraft draft;
    draft.setKind(cbui::ImportKind::Blocks);
    QVERIFY(draft.setFile(q(dir / "blocks.csv")));
    QCOMPARE(draft.fields().size(), 10);
    QVERIFY(draft.row(QStringLiteral("rooms_per_night")).required);
    QVERIFY(!draft.row(QStringLiteral("contracted_on")).required);
    QVERIFY(draft.ready()); // contracted_on and room_type are optional columns
    QCOMPARE(draft.importOptions(cb::ImportMode::Strict, false).profile, std::string("native"));
    cb::Property p;
    p.name = "T";
    p.capacity = 50;
    cb::Store::create(dir / "s.curvebench", p);
    const auto out =
        cbui::runImportJob(dir / "s.curvebench", dir / "blocks.csv", cbui::ImportKind::Blocks,
                           draft.importOptions(cb::ImportMode::Strict, false), nullptr);
    QVERIFY(out.report.written);
    QCOMPARE(cb::Store::open(dir / "s.curvebench")->blockRecords().size(), std::size_t(1));
  }

  // Import log cells: thousands separators on screen, plain numbers for CSV, UTC time.
  void importLogCells() {
    cb::ImportLogEntry e;
    e.file = "/data/extracts/h1.csv";
    e.kind = "reservations";
    e.profile = "/data/profiles/pms.json";
    e.mode = "strict";
    e.rowsRead = 119390;
    e.added = 119390;
    e.startedAt = "2026-12-02T07:31:39Z";
    e.outcome = "written";
    cbui::ImportLogModel m;
    m.setEntries({e});
    auto cell = [&](int col, int role = Qt::DisplayRole) {
      return m.data(m.index(0, col), role).toString();
    };
    QCOMPARE(cell(cbui::ImportLogModel::ReadCol), QStringLiteral("119,390"));
    QCOMPARE(cell(cbui::ImportLogModel::ReadCol, cbui::kCsvValueRole), QStringLiteral("119390"));
    QCOMPARE(cell(cbui::ImportLogModel::WhenCol), QStringLiteral("2026-12-02 07:31 UTC"));
    QCOMPARE(cell(cbui::ImportLogModel::FileCol), QStringLiteral("h1.csv"));
    QCOMPARE(cell(cbui::ImportLogModel::FileCol, cbui::kCsvValueRole),
             QStringLiteral("/data/extracts/h1.csv"));
    QCOMPARE(cell(cbui::ImportLogModel::ProfileCol), QStringLiteral("pms.json"));
    QCOMPARE(m.headerData(cbui::ImportLogModel::RejectedCol, Qt::Horizontal).toString(),
             QStringLiteral("Rejected"));
    // The CSV export has plain numbers and full paths.
    const QString csv = cbui::tableToCsv(m);
    QVERIFY2(csv.contains(QStringLiteral("2026-12-02T07:31:39Z,/data/extracts/h1.csv,reservations,"
                                         "/data/profiles/pms.json,strict,119390,119390,0,0,0,"
                                         "written")),
             qPrintable(csv));
  }

  void healthSummary() {
    const cb::Findings f = {{cb::Severity::Warning, "s", 0, 0, "a"},
                            {cb::Severity::Warning, "s", 0, 0, "b"},
                            {cb::Severity::Info, "s", 0, 0, "c"},
                            {cb::Severity::Error, "s", 0, 0, "d"}};
    const cbui::HealthCounts c = cbui::countBySeverity(f);
    QCOMPARE(c.errors, 1);
    QCOMPARE(c.warnings, 2);
    QCOMPARE(c.notes, 1);
    QCOMPARE(cbui::healthCountsText(c), QStringLiteral("1 error, 2 warnings, 1 note"));
    QCOMPARE(cbui::healthCountsText(cbui::countBySeverity({})), QStringLiteral("no findings"));
    cbui::DataPanel panel;
    panel.setStore("/tmp/none/x.curvebench");
    panel.setHealthFindings(f);
    QCOMPARE(panel.healthText(), QStringLiteral("x.curvebench: 1 error, 2 warnings, 1 note"));
  }
};

QTEST_MAIN(DataImportTest)
#include "test_dataimport.moc"
