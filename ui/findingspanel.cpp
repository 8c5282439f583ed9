#include "ui/findingspanel.h"

#include "core/finding.h"
#include "ui/csvexport.h"
#include "ui/tableexport.h"

#include <QFile>
#include <QFileDialog>
#include <QHBoxLayout>
#include <QHeaderView>
#include <QLabel>
#include <QLocale>
#include <QPlainTextEdit>
#include <QPushButton>
#include <QRegularExpression>
#include <QSplitter>
#include <QTableWidget>
#include <QVBoxLayout>

#include <algorithm>

namespace cbui {

QString sourceExcerpt(const QString &file, qint64 line, int column, int radius) {
  if (line < 1)
    return {};
  QFile f(file);
  if (!f.open(QIODevice::ReadOnly))
    return {};
  constexpr qsizetype kShown = 160; // characters shown of a long line, around the column
  QStringList out;
  const qint64 first = std::max<qint64>(1, line - radius);
  const int width = static_cast<int>(QString::number(line + radius).size());
  qint64 n = 0;
  bool found = false;
  while (!f.atEnd() && n < line + radius) {
    ++n;
    // Read the line in chunks, keeping only the part shown: a 10-million-character line costs
    // a read, not the memory to show it. On the marked line the part kept is around the column.
    const qint64 from = (n == line && column > kShown) ? column - 1 - kShown / 2 : 0;
    QByteArray kept;
    qint64 pos = 0;
    bool more = false, ended = false;
    while (!ended && !f.atEnd()) {
      QByteArray chunk = f.readLine(64 * 1024);
      ended = chunk.endsWith('\n');
      if (ended)
        chunk.chop(chunk.endsWith("\r\n") ? 2 : 1);
      const qint64 lo = std::max<qint64>(from, pos),
                   hi = std::min<qint64>(from + kShown, pos + chunk.size());
      if (hi > lo)
        kept += chunk.mid(lo - pos, hi - lo);
      if (pos + chunk.size() > from + kShown)
        more = true;
      pos += chunk.size();
    }
    if (n < first)
      continue;
    QString shown = QString::fromUtf8(kept);
    const qsizetype start = from;
    if (start > 0)
      shown.prepend(QStringLiteral("…"));
    if (more)
      shown.append(QStringLiteral("…"));
    const QString number = QString::number(n).rightJustified(width);
    out << QStringLiteral("%1 %2 | %3")
               .arg(n == line ? QStringLiteral(">") : QStringLiteral(" "), number, shown);
    if (n == line) {
      found = true;
      if (column > 0) {
        const qsizetype at = column - 1 - start + (start > 0 ? 1 : 0);
        out << QString(width + 5 + at, QLatin1Char(' ')) + QLatin1Char('^');
      }
    }
  }
  return found ? out.join(QLatin1Char('\n')) : QString();
}

QDate nightNamed(const QString &message) {
  static const QRegularExpression iso(QStringLiteral("\\b(\\d{4})-(\\d{2})-(\\d{2})\\b"));
  const auto m = iso.match(message);
  if (!m.hasMatch())
    return {};
  return QDate(m.captured(1).toInt(), m.captured(2).toInt(), m.captured(3).toInt());
}

FindingsPanel::FindingsPanel(QWidget *parent) : QWidget(parent) {
  auto *lay = new QVBoxLayout(this);
  lay->setContentsMargins(2, 2, 2, 2);
  heading_ = new QLabel(tr("No findings."));
  heading_->setWordWrap(true);
  table_ = new QTableWidget(0, 5);
  table_->setObjectName(QStringLiteral("findingsTable"));
  table_->setHorizontalHeaderLabels(
      {tr("Severity"), tr("File"), tr("Line"), tr("Column"), tr("What was found")});
  table_->verticalHeader()->hide();
  table_->setSelectionBehavior(QAbstractItemView::SelectRows);
  table_->setSelectionMode(QAbstractItemView::SingleSelection);
  table_->setEditTriggers(QAbstractItemView::NoEditTriggers);
  table_->horizontalHeader()->setStretchLastSection(true);
  table_->setToolTip(tr("Select a finding to see the lines of the file around it; double-click "
                        "one that names a night to open it in Date Study"));
  detail_ = new QPlainTextEdit;
  detail_->setObjectName(QStringLiteral("findingDetail"));
  detail_->setReadOnly(true);
  detail_->setLineWrapMode(QPlainTextEdit::NoWrap);
  QFont mono(QStringLiteral("monospace"));
  mono.setStyleHint(QFont::Monospace);
  detail_->setFont(mono);
  auto *split = new QSplitter(Qt::Horizontal);
  split->addWidget(table_);
  split->addWidget(detail_);
  split->setStretchFactor(0, 3);
  split->setStretchFactor(1, 2);
  auto *top = new QHBoxLayout;
  auto *csv = new QPushButton(tr("Findings CSV…"));
  top->addWidget(heading_, 1);
  auto *xlsx = new QPushButton(tr("XLSX…"));
  xlsx->setToolTip(tr("Save the findings as an Excel workbook"));
  top->addWidget(csv);
  top->addWidget(xlsx);
  lay->addLayout(top);
  lay->addWidget(split, 1);
  connect(csv, &QPushButton::clicked, this, [this] {
    const QString f = QFileDialog::getSaveFileName(
        this, tr("Save the findings"), QStringLiteral("findings.csv"), tr("CSV files (*.csv)"));
    QString error;
    if (!f.isEmpty() && !writeTextFile(f, tableToCsv(*table_->model()), &error))
      heading_->setText(tr("Not saved: %1").arg(error));
  });
  connect(xlsx, &QPushButton::clicked, this, [this] {
    const QString done =
        saveTableAs(this, *table_->model(), QStringLiteral("findings"), TableFormat::Xlsx);
    if (done.startsWith(QStringLiteral("Not saved")))
      heading_->setText(done);
  });

  connect(table_, &QTableWidget::currentCellChanged, this,
          [this](int row, int, int, int) { showDetail(row); });
  connect(table_, &QTableWidget::cellActivated, this, [this](int row, int) {
    if (row < 0 || row >= rows_.size())
      return;
    const QDate night = nightNamed(rows_[row].message);
    if (night.isValid())
      emit nightRequested(night);
  });
}

void FindingsPanel::setFindings(const QString &source, const QString &heading,
                                const std::vector<cb::Finding> &findings) {
  QList<FindingRow> kept;
  for (const FindingRow &r : rows_)
    if (r.source != source)
      kept << r;
  for (const cb::Finding &f : findings)
    kept << FindingRow{source,
                       QString::fromUtf8(cb::severityName(f.severity)),
                       QString::fromStdString(f.file),
                       QString::fromStdString(f.message),
                       f.line,
                       f.column};
  rows_ = kept;
  headings_.removeIf([&](const QString &h) { return h.startsWith(source + QLatin1Char(':')); });
  headings_ << source + QLatin1Char(':') + heading;
  rebuild();
}

void FindingsPanel::rebuild() {
  table_->setRowCount(static_cast<int>(rows_.size()));
  for (int i = 0; i < rows_.size(); ++i) {
    const FindingRow &r = rows_[i];
    const QString where = r.file.section(QLatin1Char('/'), -1);
    auto *file = new QTableWidgetItem(where);
    file->setToolTip(r.file);
    table_->setItem(i, 0, new QTableWidgetItem(r.severity));
    table_->setItem(i, 1, file);
    table_->setItem(i, 2, new QTableWidgetItem(r.line > 0 ? QString::number(r.line) : QString()));
    table_->setItem(i, 3,
                    new QTableWidgetItem(r.column > 0 ? QString::number(r.column) : QString()));
    auto *msg = new QTableWidgetItem(r.message);
    msg->setToolTip(r.message);
    table_->setItem(i, 4, msg);
  }
  table_->resizeColumnsToContents();
  QStringList lines;
  for (const QString &h : headings_)
    lines << h.section(QLatin1Char(':'), 1);
  heading_->setText(rows_.isEmpty() ? tr("No findings.") : lines.join(QStringLiteral(" · ")));
  detail_->clear();
  emit countChanged(attentionCount());
}

int FindingsPanel::count() const { return static_cast<int>(rows_.size()); }

int FindingsPanel::attentionCount() const {
  return static_cast<int>(std::count_if(rows_.begin(), rows_.end(), [](const FindingRow &r) {
    return r.severity != QLatin1String(cb::severityName(cb::Severity::Info));
  }));
}

void FindingsPanel::select(int row) {
  table_->setCurrentCell(row, 0);
  showDetail(row);
}

void FindingsPanel::showDetail(int row) {
  if (row < 0 || row >= rows_.size()) {
    detail_->clear();
    return;
  }
  const FindingRow &r = rows_[row];
  QString where = r.file;
  if (r.line > 0)
    where += QStringLiteral(", line %1").arg(r.line);
  if (r.column > 0)
    where += QStringLiteral(", column %1").arg(r.column);
  QString text = QStringLiteral("%1 — %2\n%3\n").arg(r.severity, where, r.message);
  const QString excerpt = sourceExcerpt(r.file, r.line, r.column);
  if (!excerpt.isEmpty())
    text += QLatin1Char('\n') + excerpt + QLatin1Char('\n');
  else if (r.line > 0)
    text += tr("\n(the file cannot be read now, so its lines are not shown)\n");
  const QDate night = nightNamed(r.message);
  if (night.isValid())
    text += tr("\nDouble-click to open %1 in Date Study.")
                .arg(QLocale().toString(night, QStringLiteral("ddd d MMM yyyy")));
  detail_->setPlainText(text);
}

QString FindingsPanel::detailText() const { return detail_->toPlainText(); }

} // namespace cbui
