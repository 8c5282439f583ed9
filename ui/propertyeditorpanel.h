// The Property screen: the property's settings and reference lists, edited in place. Sections on
// the left (General, Capacity changes, Room types, Segments, Channels, Seasons, Costs, Events &
// holiday map), one page each on the right. Every edit is an undoable command of
// PropertyEditModel that writes the store; a refused value shows its message on its page.
#pragma once

#include <QWidget>

#include <filesystem>
#include <map>

class QAction;
class QLabel;
class QListWidget;
class QStackedWidget;
class QLineEdit;
class QSpinBox;
class QDoubleSpinBox;
class QComboBox;
class QDateEdit;
class QTableView;

namespace cbui {

class PropertyEditModel;
class PropertySummaryPanel;
class PropertyTableModel;
class WorkbenchSession;

class PropertyEditorPanel : public QWidget {
  Q_OBJECT
public:
  explicit PropertyEditorPanel(QWidget *parent = nullptr);
  ~PropertyEditorPanel() override;

  /// Shows the session's summary and edits its store (the same store keeps the undo history).
  void showSession(const WorkbenchSession &session);
  PropertyEditModel *model() const { return model_; }
  PropertySummaryPanel *summaryPanel() const { return summary_; }
  /// Edit ▸ Undo / Redo: enabled while this screen is shown and there is something to undo.
  QAction *undoAction() const { return undoAction_; }
  QAction *redoAction() const { return redoAction_; }
  /// Another window writes this store: the pages show the settings disabled, with `reason`.
  void setReadOnly(bool readOnly, const QString &reason = {});
  /// Shows section `index` (PropertyEditModel::Section).
  void showSection(int index);
  /// The refusal shown on a section's page (empty when none), for tests.
  QString message(int section) const;

signals:
  /// The store was written (edit, undo or redo): screens that read it must reload.
  void storeWritten();

protected:
  void showEvent(QShowEvent *event) override;
  void hideEvent(QHideEvent *event) override;

private:
  QWidget *buildGeneral();
  QWidget *buildCapacity();
  QWidget *buildRoomTypes();
  QWidget *buildSegments();
  QWidget *buildChannels();
  QWidget *buildSeasons();
  QWidget *buildCosts();
  QWidget *buildEvents();
  QWidget *page(int section, const QString &title, const QString &hint, QWidget *content);
  QTableView *table(PropertyTableModel *m);
  void refresh();
  void updateActions();
  void done(int section, const QString &refusal);

  PropertyEditModel *model_;
  PropertySummaryPanel *summary_;
  QListWidget *sections_;
  QStackedWidget *pages_;
  std::map<int, QLabel *> messages_;
  QAction *undoAction_, *redoAction_;
  bool shown_ = false;
  bool readOnly_ = false;
  QLabel *readOnlyNote_ = nullptr;

  QLineEdit *name_ = nullptr, *currency_ = nullptr;
  QSpinBox *capacity_ = nullptr;
  QDoubleSpinBox *margin_ = nullptr;
  QComboBox *stly_ = nullptr;
  QDoubleSpinBox *shoulder_ = nullptr, *peak_ = nullptr;
  QDoubleSpinBox *walkCost_ = nullptr, *tentative_ = nullptr;
  QSpinBox *lateDays_ = nullptr;
  QLabel *seasonsNow_ = nullptr, *holidayHint_ = nullptr;
  PropertyTableModel *capacityTable_ = nullptr, *roomTable_ = nullptr, *segmentTable_ = nullptr,
                     *channelTable_ = nullptr, *eventTable_ = nullptr, *pairTable_ = nullptr;
};

} // namespace cbui
