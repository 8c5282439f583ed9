// Group offer: a what-if for a group's request. The manager enters the offer (name, arrival,
// rooms per night, rate, other revenue and cost per room-night); Evaluate checks it in the
// background (progress and cancel: a far-out night means forecasting every night up to it) and
// shows the displacement verdict per night (shoulder nights included) as a table and a chart,
// the totals and break-even rate, and the advisory caution. Table to CSV/XLSX, chart to PNG/PDF.
#pragma once

#include <QString>
#include <QWidget>

class QAbstractItemModel;
class QCheckBox;
class QDateEdit;
class QDoubleSpinBox;
class QLineEdit;
class QShowEvent;
class QSpinBox;
class QTableWidget;

// Forward declarations only: moc of Qt 6.4 cannot parse the C++20 library headers core uses.
namespace cbui {

class WorkbenchSession;
class GroupOfferChart;
struct GroupOffer;
struct GroupOfferResult;

class GroupOfferPanel : public QWidget {
  Q_OBJECT
public:
  explicit GroupOfferPanel(QWidget *parent = nullptr);
  ~GroupOfferPanel() override;
  /// The session to read (not owned; each check works on a copy; nullptr clears). A new
  /// store starts the editor on the starting offer; a new reading date keeps the offer.
  void setSession(WorkbenchSession *session);
  /// Puts `offer` into the editor (rooms per night as given; "Same for every night" is ticked
  /// when they are all equal).
  void setOffer(const GroupOffer &offer);
  /// The offer as the editor holds it.
  GroupOffer offer() const;
  /// Checks the editor's offer; when valid, starts the check in the background (`evaluated`
  /// follows), else shows what is wrong and clears the result.
  void evaluate();
  void cancel();
  bool isRunning() const;
  /// The last result shown; nullptr when none.
  const GroupOfferResult *result() const;
  QAbstractItemModel *table() const;
  GroupOfferChart *chart() const;
  QTableWidget *roomsEditor() const;
  QCheckBox *sameEveryNight() const;
  QSpinBox *nightsEditor() const;
  /// The message under the editor (what is wrong with the offer, progress, cancelled).
  QString messageText() const;
  /// The verdict, totals and break-even rate as shown, and the caution under them.
  QString verdictText() const;
  QString cautionText() const;

signals:
  /// A check ended (with a result, an error or cancelled).
  void evaluated();

protected:
  void showEvent(QShowEvent *event) override;

private:
  struct Impl;
  Impl *d_;
};

} // namespace cbui
