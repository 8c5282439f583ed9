// The findings panel: import errors and data-health findings in one list (severity, file,
// line, column, message), never modal. Selecting a finding shows the lines of the file around it
// with the column marked; a finding that names a night opens it in Date Study on double-click.
#pragma once

#include <QDate>
#include <QList>
#include <QString>
#include <QStringList>
#include <QWidget>

#include <vector>

class QLabel;
class QPlainTextEdit;
class QTableWidget;

// Forward declarations only: moc of Qt 6.4 cannot parse the C++20 library headers core uses.
namespace cb {
struct Finding;
}

namespace cbui {

/// The lines of `file` around line `line` (1-based), numbered, with a caret under `column`
/// (1-based; 0 = none). Long lines are cut around the column. Empty when the file cannot be read
/// or has no such line.
QString sourceExcerpt(const QString &file, qint64 line, int column, int radius = 2);

/// The first night (YYYY-MM-DD) a finding's message names; invalid when none.
QDate nightNamed(const QString &message);

/// A finding as the panel keeps it.
struct FindingRow {
  QString source; ///< "import", "health"
  QString severity, file, message;
  qint64 line = 0;
  int column = 0;
};

class FindingsPanel : public QWidget {
  Q_OBJECT
public:
  explicit FindingsPanel(QWidget *parent = nullptr);

  /// Replaces the findings of one source ("import", "health"); the others stay.
  void setFindings(const QString &source, const QString &heading,
                   const std::vector<cb::Finding> &findings);
  int count() const;
  /// Errors and warnings (what deserves the user's attention), without notes.
  int attentionCount() const;
  QTableWidget *table() const { return table_; }
  /// Selects a row (as a click does) and shows its detail.
  void select(int row);
  /// What the detail pane shows.
  QString detailText() const;

signals:
  /// Double-click (or Enter) on a finding that names a night.
  void nightRequested(QDate night);
  void countChanged(int attention);

private:
  void rebuild();
  void showDetail(int row);
  QList<FindingRow> rows_;
  QStringList headings_; ///< one per source shown
  QTableWidget *table_;
  QLabel *heading_;
  QPlainTextEdit *detail_;
};

} // namespace cbui
