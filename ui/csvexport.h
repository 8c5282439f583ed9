// Tables to CSV for a spreadsheet: RFC 4180 quoting, plain numbers (a cell's kCsvValueRole when
// it has one, else its text), and formula injection neutralised (a text cell starting with
// = + - @, a tab or a carriage return is written with a leading apostrophe).
#pragma once

#include <QString>
#include <Qt>

class QAbstractItemModel;

namespace cbui {

/// Item data role holding the value a CSV export writes (a plain number, no separators).
constexpr int kCsvValueRole = Qt::UserRole + 40;

/// One CSV field: quoted when needed; text a spreadsheet would run as a formula gets a leading
/// apostrophe (numbers such as "-3" or "-0.25" are left as they are).
QString csvField(const QString &text);

/// The model's header and rows (every column, display order) as CSV, LF line ends.
QString tableToCsv(const QAbstractItemModel &model);

/// Writes `text` as UTF-8; false (with the reason in `error`) when the file cannot be written.
bool writeTextFile(const QString &file, const QString &text, QString *error = nullptr);

} // namespace cbui
