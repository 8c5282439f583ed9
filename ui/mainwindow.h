// The workbench window: opens a store off the UI thread, shows the property summary and one
// night's booking curve. Screens of later work plug in beside these panels.
#pragma once

#include <QMainWindow>

#include <filesystem>
#include <memory>

class QComboBox;
class QDateEdit;
class QLabel;
class QProgressBar;
class QSpinBox;

namespace cb {
class Date;
}

// Forward declarations only: moc of Qt 6.4 cannot parse the C++20 library headers core uses.
namespace cbui {

class WorkbenchSession;
class NightCurveChart;
class PropertySummaryPanel;

class MainWindow : public QMainWindow {
  Q_OBJECT
public:
  explicit MainWindow(QWidget *parent = nullptr);
  ~MainWindow() override;

  /// Opens a store in the background; `sessionLoaded` or `loadFailed` follows.
  void openStore(const std::filesystem::path &store);
  /// Builds the sample property's store at `store` (background), then opens it.
  void buildSampleAndOpen(const std::filesystem::path &store);
  void showNight(cb::Date night);

  const WorkbenchSession *session() const { return session_.get(); }
  NightCurveChart *chart() const { return chart_; }
  PropertySummaryPanel *summaryPanel() const { return summary_; }

signals:
  void sessionLoaded();
  void loadFailed(const QString &message);

private:
  void startLoad(const std::filesystem::path &store, bool buildSampleFirst, const QString &what);
  void setSession(std::unique_ptr<WorkbenchSession> session);
  void refreshChart();
  void setBusy(const QString &what);
  void setIdle(const QString &message);

  std::unique_ptr<WorkbenchSession> session_;
  PropertySummaryPanel *summary_;
  NightCurveChart *chart_;
  QDateEdit *nightEdit_;
  QComboBox *segmentCombo_;
  QSpinBox *leadSpin_;
  QLabel *nightLabel_;
  QProgressBar *progress_;
};

} // namespace cbui
