// The workbench window: opens a store off the UI thread and shows its screens — Horizon (the next
// N nights), Date Study (one night), Segment Compare, Year Map, Accuracy, Group offer, Data
// (imports) and Property (the editor) — under a prominent, changeable reading date ("As of").
// Remembers geometry, the last screen and recent stores; a CSV dropped on the window is imported
// into the open store in the background, its findings listed in a dock, not a dialog.
#pragma once

#include "ui/importcontrol.h"

#include <QDate>
#include <QMainWindow>
#include <QStringList>

#include <cstdint>
#include <filesystem>
#include <memory>

class QDateEdit;
class QLabel;
class QToolButton;
class QMenu;
class QProgressBar;
class QTabWidget;
class QDockWidget;

// Forward declarations only: moc of Qt 6.4 cannot parse the C++20 library headers core uses.
namespace cb {
class Date;
class Store;
} // namespace cb

namespace cbui {

class WorkbenchSession;
class DateStudyPanel;
class PropertySummaryPanel;
class PropertyEditorPanel;
class HorizonPanel;
class SegmentComparePanel;
class YearMapPanel;
class FindingsPanel;
class AccuracyPanel;
class DataPanel;
class GroupOfferPanel;

class MainWindow : public QMainWindow {
  Q_OBJECT
public:
  enum Screen {
    HorizonScreen = 0,
    DateStudyScreen = 1,
    SegmentCompareScreen = 2,
    YearMapScreen = 3,
    AccuracyScreen = 4,
    GroupOfferScreen = 5,
    DataScreen = 6,
    PropertyScreen = 7
  };

  explicit MainWindow(QWidget *parent = nullptr);
  ~MainWindow() override;

  /// Opens a store in the background; `sessionLoaded` or `loadFailed` follows.
  void openStore(const std::filesystem::path &store);
  /// Builds the sample property's store at `store` (background), then opens it.
  void buildSampleAndOpen(const std::filesystem::path &store);
  /// Shows `night` in Date Study (does not switch screens).
  void showNight(cb::Date night);
  /// Looks at every screen as of `date`. Refuses (message in the status bar, returns false) a date
  /// after the newest booking or cancellation, or before the first booking.
  bool setReadingDate(cb::Date date);
  /// Imports a reservation CSV (native format, strict) into the open store in the background,
  /// then reopens the store; `importFinished` follows.
  void importCsv(const std::filesystem::path &file);
  void showScreen(Screen screen);
  Screen currentScreen() const;
  /// The screens' names, in Screen order, as `--screen` and the saved settings spell them
  /// ("horizon", "date-study", …).
  static QStringList screenNames();
  /// The screen named `name` (see screenNames), or -1.
  static int screenFromName(const QString &name);

  const WorkbenchSession *session() const { return session_.get(); }
  DateStudyPanel *dateStudy() const { return dateStudy_; }
  PropertySummaryPanel *summaryPanel() const { return summary_; }
  PropertyEditorPanel *propertyEditor() const { return propertyEditor_; }
  HorizonPanel *horizonPanel() const { return horizon_; }
  SegmentComparePanel *segmentComparePanel() const { return compare_; }
  YearMapPanel *yearMapPanel() const { return yearMap_; }
  FindingsPanel *findingsPanel() const { return findings_; }
  AccuracyPanel *accuracyPanel() const { return accuracy_; }
  DataPanel *dataPanel() const { return data_; }
  GroupOfferPanel *groupOfferPanel() const { return groupOffer_; }
  /// Cancels the running import (as its Cancel button does); nothing is written.
  void cancelImport();
  /// The night Date Study shows.
  QDate studiedNight() const;
  /// Why this window may not write the open store (another window holds it), or empty.
  QString readOnlyReason() const { return readOnlyReason_; }

signals:
  void sessionLoaded();
  void loadFailed(const QString &message);
  void importFinished(bool written);

protected:
  void closeEvent(QCloseEvent *event) override;
  void dragEnterEvent(QDragEnterEvent *event) override;
  void dropEvent(QDropEvent *event) override;

private:
  void buildMenus();
  void rebuildRecentMenu();
  void startLoad(const std::filesystem::path &store, bool buildSampleFirst, const QString &what);
  void setSession(std::unique_ptr<WorkbenchSession> session);
  void setBusy(const QString &what);
  void setIdle(const QString &message);
  void startHealthCheck();
  /// Segment Compare and Year Map compute only when shown: gives the session to the one on
  /// screen when it has not seen the current session / reading date yet.
  void refreshLazyScreens();
  /// After a property edit: reloads the session in the background, keeping the reading date and
  /// the studied night (capacity and settings change forecasts).
  void reloadAfterEdit();

  std::unique_ptr<WorkbenchSession> session_;
  QTabWidget *tabs_;
  HorizonPanel *horizon_;
  PropertyEditorPanel *propertyEditor_;
  PropertySummaryPanel *summary_;
  SegmentComparePanel *compare_;
  YearMapPanel *yearMap_;
  bool compareStale_ = true, yearMapStale_ = true;
  DateStudyPanel *dateStudy_;
  AccuracyPanel *accuracy_;
  GroupOfferPanel *groupOffer_ = nullptr;
  DataPanel *data_;
  QDateEdit *asOfEdit_;
  QLabel *asOfNote_;
  QDate night_; ///< the night Date Study shows
  QProgressBar *progress_;
  QMenu *recentMenu_ = nullptr;
  QDockWidget *findingsDock_;
  FindingsPanel *findings_;
  QToolButton *findingsButton_;
  QToolButton *cancelImport_;
  std::shared_ptr<ImportControl> importControl_; ///< the running import's cancel flag, progress
  bool importing_ = false;
  bool healthChecked_ = false;
  /// The open store's writer lock (Store::Access::WriterElseReadOnly): held while this window
  /// shows the store, so a second window on it opens read-only and says so.
  std::unique_ptr<cb::Store> writer_;
  QString readOnlyReason_;
  QLabel *readOnlyLabel_;
};

} // namespace cbui
