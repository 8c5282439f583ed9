#include "ui/csvexport.h"

#include <QAbstractItemModel>
#include <QSaveFile>
#include <QStringList>

namespace cbui {

QString csvField(const QString &text) {
  QString t = text;
  if (!t.isEmpty()) {
    const QChar c = t.front();
    const bool risky = c == QLatin1Char('=') || c == QLatin1Char('+') || c == QLatin1Char('-') ||
                       c == QLatin1Char('@') || c == QLatin1Char('\t') || c == QLatin1Char('\r');
    bool number = false;
    (void)t.toDouble(&number);
    if (risky && !number)
      t.prepend(QLatin1Char('\''));
  }
  if (t.contains(QLatin1Char(',')) || t.contains(QLatin1Char('"')) ||
      t.contains(QLatin1Char('\n')) || t.contains(QLatin1Char('\r'))) {
    t.replace(QStringLiteral("\""), QStringLiteral("\"\""));
    t = QLatin1Char('"') + t + QLatin1Char('"');
  }
  return t;
}

QString tableToCsv(const QAbstractItemModel &model) {
  QString out;
  QStringList cells;
  for (int c = 0; c < model.columnCount(); ++c)
    cells << csvField(model.headerData(c, Qt::Horizontal, Qt::DisplayRole).toString());
  out += cells.join(QLatin1Char(',')) + QLatin1Char('\n');
  for (int r = 0; r < model.rowCount(); ++r) {
    cells.clear();
    for (int c = 0; c < model.columnCount(); ++c) {
      const QModelIndex i = model.index(r, c);
      const QVariant raw = model.data(i, kCsvValueRole);
      cells << csvField(raw.isValid() ? raw.toString() : model.data(i, Qt::DisplayRole).toString());
    }
    out += cells.join(QLatin1Char(',')) + QLatin1Char('\n');
  }
  return out;
}

bool writeTextFile(const QString &file, const QString &text, QString *error) {
  QSaveFile f(file); // written whole or not at all
  const QByteArray bytes = text.toUtf8();
  if (!f.open(QIODevice::WriteOnly) || f.write(bytes) != bytes.size() || !f.commit()) {
    if (error)
      *error = QStringLiteral("%1: %2").arg(file, f.errorString());
    return false;
  }
  return true;
}

} // namespace cbui
