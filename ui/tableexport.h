// The save-a-table step every "Table CSV…" and "XLSX…" button shares: asks for a file name
// (suggested from the table's name, the format's extension) and writes CSV (csvexport.h) or XLSX
// (xlsxexport.h).
#pragma once

#include <QString>

class QAbstractItemModel;
class QWidget;

namespace cbui {

enum class TableFormat { Csv, Xlsx };

/// Asks where to save `model` (suggested file `baseName` + .csv / .xlsx) and writes it; the XLSX
/// sheet is named `baseName`. Returns a status line ("Saved …" / "Not saved: …"), empty when the
/// user cancelled. `csvText`, when given, is written instead of tableToCsv(model) for CSV.
QString saveTableAs(QWidget *parent, const QAbstractItemModel &model, const QString &baseName,
                    TableFormat format, const QString &csvText = {});

/// Writes `model` to `file` in `format` without asking; false with the reason in `error`.
bool writeTable(const QAbstractItemModel &model, const QString &file, TableFormat format,
                const QString &sheetName, QString *error, const QString &csvText = {});

} // namespace cbui
