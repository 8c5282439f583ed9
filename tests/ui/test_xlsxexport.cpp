// XLSX export (ui/xlsxexport.h): a table with numbers, negative numbers, text that a spreadsheet
// would run as a formula and non-ASCII names is written to a path with spaces and non-ASCII
// characters, then read back by a general-purpose reader — openpyxl, through
// tests/reference/read_xlsx.py — which must see the same values with the right types: numbers as
// numbers, "=1+1" as a string and no formula anywhere.
#include "core/samplestore.h"
#include "testsupport.h"
#include "ui/csvexport.h"
#include "ui/horizonmodel.h"
#include "ui/tableexport.h"
#include "ui/workbenchsession.h"
#include "ui/xlsxexport.h"

#include <QDir>
#include <QFile>
#include <QJsonArray>
#include <QJsonDocument>
#include <QJsonObject>
#include <QProcess>
#include <QStandardItemModel>
#include <QTemporaryDir>
#include <QTest>

#include <cmath>

namespace {

QStandardItem *text(const QString &t) { return new QStandardItem(t); }
// A figure as a screen shows it (grouped) with its plain value for exports.
QStandardItem *figure(const QString &shown, const QString &plain) {
  auto *i = new QStandardItem(shown);
  i->setData(plain, cbui::kCsvValueRole);
  return i;
}

// Reads the workbook with openpyxl; the JSON of read_xlsx.py's first sheet.
QJsonObject readBack(const QString &file) {
  QProcess p;
  p.start(QStringLiteral(CURVEBENCH_PYTHON), {QStringLiteral(READ_XLSX_SCRIPT), file});
  if (!p.waitForFinished(60000) || p.exitCode() != 0) {
    qWarning("read_xlsx.py failed: %s", p.readAllStandardError().constData());
    return {};
  }
  const QJsonDocument doc = QJsonDocument::fromJson(p.readAllStandardOutput());
  return doc.object().value(QStringLiteral("sheets")).toArray().first().toObject();
}

// The cell at (row, column), 1-based as in the spreadsheet: [row, col, data_type, type, value].
QJsonArray cellAt(const QJsonObject &sheet, int row, int column) {
  for (const QJsonValue v : sheet.value(QStringLiteral("cells")).toArray()) {
    const QJsonArray c = v.toArray();
    if (c.at(0).toInt() == row && c.at(1).toInt() == column)
      return c;
  }
  return {};
}

} // namespace

class XlsxExportTest : public QObject {
  Q_OBJECT
private slots:
  void valuesAndTypesSurviveAGeneralPurposeReader() {
    QStandardItemModel model(0, 4);
    model.setHorizontalHeaderLabels({QStringLiteral("Segment"), QStringLiteral("Rooms"),
                                     QStringLiteral("Rate"), QStringLiteral("Note")});
    model.appendRow({text(QStringLiteral("Übernachtung – Firmen")),
                     figure(QStringLiteral("12"), QStringLiteral("12")),
                     figure(QStringLiteral("-3.50"), QStringLiteral("-3.5")),
                     text(QStringLiteral("=1+1"))});
    model.appendRow({text(QStringLiteral("Reisegruppe 東京")),
                     figure(QStringLiteral("-7"), QStringLiteral("-7")),
                     figure(QStringLiteral("1,234.56"), QStringLiteral("1234.56")),
                     text(QStringLiteral("@SUM(A1)"))});
    model.appendRow({text(QStringLiteral("+x")), text(QStringLiteral("-cmd")),
                     figure(QStringLiteral("n/a"), QStringLiteral("n/a")), text(QString())});

    QTemporaryDir tmp;
    QVERIFY(tmp.isValid());
    const QString dir = tmp.filePath(QStringLiteral("exports with spaces ü é 東京"));
    QVERIFY(QDir().mkpath(dir));
    const QString file = dir + QStringLiteral("/Segmente März.xlsx");
    QString error;
    QVERIFY2(cbui::tableToXlsx(model, file, QStringLiteral("Segments: 2026/10"), &error),
             qPrintable(error));
    QVERIFY(QFile::exists(file));
    QCOMPARE(QDir(dir).entryList(QDir::Files | QDir::Hidden).size(), 1); // no temporary left

    const QJsonObject sheet = readBack(file);
    QVERIFY(!sheet.isEmpty());
    QCOMPARE(sheet.value(QStringLiteral("name")).toString(),
             QStringLiteral("Segments_ 2026_10")); // ":" and "/" are not allowed in sheet names
    QCOMPARE(sheet.value(QStringLiteral("freeze")).toString(), QStringLiteral("A2"));
    for (const QJsonValue b : sheet.value(QStringLiteral("header_bold")).toArray())
      QVERIFY(b.toBool());

    auto expectText = [&](int r, int c, const QString &want) {
      const QJsonArray cell = cellAt(sheet, r, c);
      QCOMPARE(cell.at(2).toString(), QStringLiteral("s")); // a string cell, not "f" (formula)
      QCOMPARE(cell.at(3).toString(), QStringLiteral("str"));
      QCOMPARE(cell.at(4).toString(), want);
    };
    auto expectNumber = [&](int r, int c, double want) {
      const QJsonArray cell = cellAt(sheet, r, c);
      QCOMPARE(cell.at(2).toString(), QStringLiteral("n"));
      QVERIFY(cell.at(3).toString() == QStringLiteral("int") ||
              cell.at(3).toString() == QStringLiteral("float"));
      QCOMPARE(cell.at(4).toDouble(), want);
    };
    expectText(1, 1, QStringLiteral("Segment"));
    expectText(1, 4, QStringLiteral("Note"));
    expectText(2, 1, QStringLiteral("Übernachtung – Firmen"));
    expectNumber(2, 2, 12);
    expectNumber(2, 3, -3.5);
    expectText(2, 4, QStringLiteral("=1+1")); // formula injection: text, never a formula
    expectText(3, 1, QStringLiteral("Reisegruppe 東京"));
    expectNumber(3, 2, -7);
    expectNumber(3, 3, 1234.56); // the plain value, not the grouped "1,234.56"
    expectText(3, 4, QStringLiteral("@SUM(A1)"));
    expectText(4, 1, QStringLiteral("+x"));
    expectText(4, 2, QStringLiteral("-cmd"));
    expectText(4, 3, QStringLiteral("n/a")); // an export value that is no number stays text
    QVERIFY(cellAt(sheet, 4, 4).isEmpty());  // an empty cell is left out
    int cells = 0;
    for (const QJsonValue v : sheet.value(QStringLiteral("cells")).toArray()) {
      QVERIFY(v.toArray().at(2).toString() != QStringLiteral("f"));
      ++cells;
    }
    QCOMPARE(cells, 4 + 4 + 4 + 3);

    // Widths fitted: the long segment names' column is wider than the short "Rooms" one.
    const QJsonArray widths = sheet.value(QStringLiteral("widths")).toArray();
    QCOMPARE(widths.size(), 4);
    QVERIFY(widths.at(0).toDouble() > widths.at(1).toDouble());
    QVERIFY(widths.at(0).toDouble() >= 21); // "Übernachtung – Firmen" is 21 characters
  }

  // The Horizon table of the sample store: its figures reach the workbook as numbers (OTB, the
  // shares as fractions), the night as its text.
  void horizonFiguresAreNumbers() {
    cbtest::TempDir dir;
    cb::buildSampleStore(dir / "s.curvebench", dir / "files");
    auto session = cbui::WorkbenchSession::open(dir / "s.curvebench");
    cbui::HorizonModel model;
    model.setData(cbui::computeHorizon(*session, 7, {}));
    QCOMPARE(model.rowCount(), 7);
    const QString file = QString::fromStdString((dir / "horizon.xlsx").string());
    QString error;
    QVERIFY2(cbui::tableToXlsx(model, file, QStringLiteral("horizon"), &error), qPrintable(error));
    const QJsonObject sheet = readBack(file);
    for (int r = 0; r < model.rowCount(); ++r) {
      const cbui::HorizonRow &row = model.row(r);
      const QJsonArray night = cellAt(sheet, r + 2, cbui::HorizonModel::Night + 1);
      QCOMPARE(night.at(2).toString(), QStringLiteral("s"));
      QCOMPARE(night.at(4).toString(), model.index(r, cbui::HorizonModel::Night).data().toString());
      const QJsonArray otb = cellAt(sheet, r + 2, cbui::HorizonModel::Otb + 1);
      QCOMPARE(otb.at(2).toString(), QStringLiteral("n"));
      QCOMPARE(otb.at(4).toInt(), row.otb);
      const QJsonArray occ = cellAt(sheet, r + 2, cbui::HorizonModel::Occupancy + 1);
      QCOMPARE(occ.at(2).toString(), QStringLiteral("n"));
      QVERIFY(row.occupancy);
      QVERIFY(std::abs(occ.at(4).toDouble() - *row.occupancy) <= 0.00005); // 4 decimals
    }
  }

  // The buttons' shared writer: CSV as tableToCsv (or the text given), XLSX as tableToXlsx.
  void writeTablePicksTheFormat() {
    QStandardItemModel model(0, 2);
    model.setHorizontalHeaderLabels({QStringLiteral("Segment"), QStringLiteral("Rooms")});
    model.appendRow(
        {text(QStringLiteral("=cmd")), figure(QStringLiteral("1,200"), QStringLiteral("1200"))});
    QTemporaryDir tmp;
    QString error;
    const QString csv = tmp.filePath(QStringLiteral("t.csv"));
    QVERIFY(cbui::writeTable(model, csv, cbui::TableFormat::Csv, {}, &error));
    QFile f(csv);
    QVERIFY(f.open(QIODevice::ReadOnly));
    QCOMPARE(QString::fromUtf8(f.readAll()), QStringLiteral("Segment,Rooms\n'=cmd,1200\n"));
    const QString xlsx = tmp.filePath(QStringLiteral("t.xlsx"));
    QVERIFY(
        cbui::writeTable(model, xlsx, cbui::TableFormat::Xlsx, QStringLiteral("segments"), &error));
    QVERIFY(QFile::permissions(xlsx).testFlag(QFile::ReadOther)); // not left private
    const QJsonObject sheet = readBack(xlsx);
    QCOMPARE(sheet.value(QStringLiteral("name")).toString(), QStringLiteral("segments"));
    QCOMPARE(cellAt(sheet, 2, 1).at(4).toString(), QStringLiteral("=cmd")); // text, no apostrophe
    QCOMPARE(cellAt(sheet, 2, 2).at(4).toInt(), 1200);
  }

  void anUnwritablePlaceGivesAReasonAndNoFile() {
    QStandardItemModel model(1, 1);
    QString error;
    QVERIFY(!cbui::tableToXlsx(model, QStringLiteral("/nonexistent-dir/x.xlsx"), {}, &error));
    QVERIFY(error.contains(QStringLiteral("/nonexistent-dir/x.xlsx")));
  }

  void sheetNamesFollowTheRules() {
    QCOMPARE(cbui::xlsxSheetName(QString()), QStringLiteral("Sheet1"));
    QCOMPARE(cbui::xlsxSheetName(QStringLiteral("a[b]c*d?e\\f")), QStringLiteral("a_b_c_d_e_f"));
    QCOMPARE(cbui::xlsxSheetName(QString(40, QLatin1Char('x'))).size(), 31);
    QCOMPARE(cbui::xlsxSheetName(QStringLiteral("'quoted'")), QStringLiteral("quoted"));
  }
};

QTEST_MAIN(XlsxExportTest)
#include "test_xlsxexport.moc"
