// Tables to XLSX with libxlsxwriter (see xlsxexport.h).
#include "ui/xlsxexport.h"

#include "ui/csvexport.h"

#include <QAbstractItemModel>
#include <QDir>
#include <QFile>
#include <QFileInfo>
#include <QTemporaryFile>

#include <xlsxwriter.h>

#include <algorithm>
#include <cmath>
#include <vector>

namespace cbui {
namespace {

// The number a cell exports, when its kCsvValueRole holds one (a plain number, no separators).
bool numberOf(const QAbstractItemModel &model, const QModelIndex &i, double *value) {
  const QVariant raw = model.data(i, kCsvValueRole);
  if (!raw.isValid())
    return false;
  bool ok = false;
  const double v = raw.toString().trimmed().toDouble(&ok);
  if (!ok || !std::isfinite(v))
    return false;
  *value = v;
  return true;
}

QString textOf(const QAbstractItemModel &model, const QModelIndex &i) {
  const QVariant raw = model.data(i, kCsvValueRole);
  return raw.isValid() ? raw.toString() : model.data(i, Qt::DisplayRole).toString();
}

// Excel keeps at most 32,767 bytes of text in a cell; 10,000 UTF-16 units stay under it.
constexpr qsizetype kMaxChars = 10000;

QString describe(lxw_error e) { return QString::fromUtf8(lxw_strerror(e)); }

} // namespace

QString xlsxSheetName(const QString &name) {
  QString out;
  for (const QChar c : name)
    out += QStringLiteral("[]:*?/\\").contains(c) ? QLatin1Char('_') : c;
  out = out.trimmed().left(31);
  // An apostrophe may not start or end a sheet name.
  while (out.startsWith(QLatin1Char('\'')))
    out.remove(0, 1);
  while (out.endsWith(QLatin1Char('\'')))
    out.chop(1);
  return out.isEmpty() ? QStringLiteral("Sheet1") : out;
}

bool tableToXlsx(const QAbstractItemModel &model, const QString &file, const QString &sheetName,
                 QString *error) {
  auto fail = [&](const QString &why) {
    if (error)
      *error = QStringLiteral("%1: %2").arg(file, why);
    return false;
  };
  // Written to a temporary file beside the target and renamed: whole or not at all.
  const QFileInfo target(file);
  QTemporaryFile tmp(target.absoluteDir().filePath(QStringLiteral(".xlsx-XXXXXX")));
  if (!tmp.open())
    return fail(tmp.errorString());
  tmp.close();
  const QByteArray tmpName = QFile::encodeName(tmp.fileName()); // UTF-8 paths on Linux

  lxw_workbook *book = workbook_new(tmpName.constData());
  if (!book)
    return fail(QStringLiteral("cannot create the workbook"));
  const QByteArray sheetUtf8 = xlsxSheetName(sheetName).toUtf8();
  lxw_worksheet *sheet = workbook_add_worksheet(book, sheetUtf8.constData());
  lxw_format *bold = workbook_add_format(book);
  format_set_bold(bold);

  const int columns = model.columnCount();
  std::vector<int> widths(static_cast<std::size_t>(std::max(columns, 0)), 0);
  auto fit = [&](int c, qsizetype chars) {
    auto &w = widths[static_cast<std::size_t>(c)];
    w = std::max(w, static_cast<int>(std::min<qsizetype>(chars, 60)));
  };
  lxw_error status = LXW_NO_ERROR;
  auto keep = [&](lxw_error e) {
    if (status == LXW_NO_ERROR)
      status = e;
  };

  for (int c = 0; c < columns; ++c) {
    const QString h = model.headerData(c, Qt::Horizontal, Qt::DisplayRole).toString();
    keep(worksheet_write_string(sheet, 0, static_cast<lxw_col_t>(c), h.toUtf8().constData(), bold));
    fit(c, h.size());
  }
  const int rows = std::min(model.rowCount(), static_cast<int>(LXW_ROW_MAX) - 1);
  for (int r = 0; r < rows; ++r) {
    const auto row = static_cast<lxw_row_t>(r + 1);
    for (int c = 0; c < columns; ++c) {
      const auto col = static_cast<lxw_col_t>(c);
      const QModelIndex i = model.index(r, c);
      double v = 0;
      if (numberOf(model, i, &v)) {
        keep(worksheet_write_number(sheet, row, col, v, nullptr));
        fit(c, QString::number(v).size());
        continue;
      }
      const QString text = textOf(model, i);
      if (text.isEmpty())
        continue;
      // Always a string cell, never worksheet_write_formula: "=1+1", "@SUM(A1)", "+x" and
      // "-cmd" are stored as text and no spreadsheet runs them (formula injection neutralised).
      keep(worksheet_write_string(sheet, row, col, text.left(kMaxChars).toUtf8().constData(),
                                  nullptr));
      fit(c, text.size());
    }
  }
  for (int c = 0; c < columns; ++c)
    keep(worksheet_set_column(sheet, static_cast<lxw_col_t>(c), static_cast<lxw_col_t>(c),
                              std::max(8, widths[static_cast<std::size_t>(c)] + 2), nullptr));
  worksheet_freeze_panes(sheet, 1, 0); // the header stays in view

  const lxw_error closed = workbook_close(book); // frees the workbook whatever happens
  if (status != LXW_NO_ERROR)
    return fail(describe(status));
  if (closed != LXW_NO_ERROR)
    return fail(describe(closed));
  if (QFile::exists(file) && !QFile::remove(file))
    return fail(QStringLiteral("cannot replace the existing file"));
  if (!QFile::rename(tmp.fileName(), file))
    return fail(QStringLiteral("cannot rename the written workbook into place"));
  tmp.setAutoRemove(false);
  // A temporary file is made private (0600); an export is an ordinary file, readable as usual.
  QFile::setPermissions(file,
                        QFile::ReadOwner | QFile::WriteOwner | QFile::ReadGroup | QFile::ReadOther);
  return true;
}

} // namespace cbui
