// The property at a glance: name, capacity, counts and the data's date range.
#pragma once

#include <QWidget>

class QLabel;

namespace cbui {
class WorkbenchSession;

class PropertySummaryPanel : public QWidget {
  Q_OBJECT
public:
  explicit PropertySummaryPanel(QWidget *parent = nullptr);
  void showSession(const WorkbenchSession &session);
  /// The text shown, for tests.
  QString text() const;

private:
  QLabel *label_;
};

} // namespace cbui
