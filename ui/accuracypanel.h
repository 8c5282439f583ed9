// Accuracy: how well each forecast method did on this property — a backtest over the last weeks of
// reading dates (in the background, with progress and cancel), error by lead per method as a chart
// and a table (MAE, RMSE, MAPE, WAPE, bias, MASE, band coverage, value added by overrides), and
// which method auto-selection picks per lead bucket, with the evidence.
#pragma once

#include <QString>
#include <QWidget>

class QComboBox;
class QLabel;
class QProgressBar;
class QPushButton;
class QShowEvent;
class QTableWidget;

namespace cbui {

class WorkbenchSession;
class AccuracyChart;

class AccuracyPanel : public QWidget {
  Q_OBJECT
public:
  explicit AccuracyPanel(QWidget *parent = nullptr);
  ~AccuracyPanel() override;
  /// The session to read (not owned; nullptr stops the backtest and clears the screen).
  void setSession(WorkbenchSession *session);
  /// Starts the backtest with the chosen window and segment (cancels a running one).
  void run();
  void cancel();
  bool isRunning() const;
  QTableWidget *table() const;
  AccuracyChart *chart() const;
  QComboBox *weeksPicker() const;
  QComboBox *segmentPicker() const;
  /// The auto-selection summary and the status line, as shown.
  QString autoText() const;
  QString statusText() const;

signals:
  void finished();

protected:
  void showEvent(QShowEvent *event) override;

private:
  struct Impl;
  Impl *d_;
};

} // namespace cbui
