// Tables to XLSX (Office Open XML workbook, one sheet) with libxlsxwriter: a cell whose
// kCsvValueRole parses as a number is written as a number, every other cell as a string —
// never as a formula, so text starting with = + - @ stays text (formula injection neutralised by
// construction). Bold header row, frozen under it, column widths fitted to the texts.
#pragma once

#include <QString>

class QAbstractItemModel;

namespace cbui {

/// An Excel sheet name from any text: at most 31 characters, none of [ ] : * ? / \, not empty.
QString xlsxSheetName(const QString &name);

/// Writes the model's header and rows (every column, display order) to `file` as a one-sheet
/// workbook; false (with the reason in `error`) when it cannot be written.
bool tableToXlsx(const QAbstractItemModel &model, const QString &file, const QString &sheetName,
                 QString *error = nullptr);

} // namespace cbui
