// Asking for a file name and writing a table as CSV or XLSX (see tableexport.h).
#include "ui/tableexport.h"

#include "ui/csvexport.h"
#include "ui/xlsxexport.h"

#include <QCoreApplication>
#include <QFileDialog>
#include <QFileInfo>

namespace cbui {

bool writeTable(const QAbstractItemModel &model, const QString &file, TableFormat format,
                const QString &sheetName, QString *error, const QString &csvText) {
  if (format == TableFormat::Xlsx)
    return tableToXlsx(model, file, sheetName, error);
  return writeTextFile(file, csvText.isEmpty() ? tableToCsv(model) : csvText, error);
}

QString saveTableAs(QWidget *parent, const QAbstractItemModel &model, const QString &baseName,
                    TableFormat format, const QString &csvText) {
  const bool xlsx = format == TableFormat::Xlsx;
  const QString suffix = xlsx ? QStringLiteral(".xlsx") : QStringLiteral(".csv");
  QString file = QFileDialog::getSaveFileName(
      parent, QCoreApplication::translate("cbui", "Save the table"), baseName + suffix,
      xlsx ? QCoreApplication::translate("cbui", "Excel workbook (*.xlsx)")
           : QCoreApplication::translate("cbui", "CSV files (*.csv)"));
  if (file.isEmpty())
    return {};
  if (QFileInfo(file).suffix().isEmpty())
    file += suffix;
  QString error;
  return writeTable(model, file, format, baseName, &error, csvText)
             ? QCoreApplication::translate("cbui", "Saved %1").arg(file)
             : QCoreApplication::translate("cbui", "Not saved: %1").arg(error);
}

} // namespace cbui
