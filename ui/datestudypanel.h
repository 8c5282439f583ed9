// Date Study: one night in depth — this year's and last year's booking curves, the comparable-
// nights band, the forecast with its error band, capacity, constrained vs unconstrained demand,
// the segment table with protection, expert overrides and the reservations behind a figure.
#pragma once

#include <QString>
#include <QWidget>

class QComboBox;
class QTableWidget;
class QListWidget;
class QShowEvent;

// Forward declarations only: moc of Qt 6.4 cannot parse the C++20 library headers core uses.
namespace cb {
class Date;
}

namespace cbui {

class WorkbenchSession;
class DateStudyModel;
class DateStudyChart;

class DateStudyPanel : public QWidget {
  Q_OBJECT
public:
  explicit DateStudyPanel(QWidget *parent = nullptr);
  ~DateStudyPanel() override;
  /// The session to read (not owned; nullptr clears the panel). Call again after the session's
  /// reading date changed.
  void setSession(WorkbenchSession *session);
  /// Shows one night (redraws within the night-switch budget, 50 ms on the sample property).
  void setNight(cb::Date night);
  /// Starts the background forecasts of every method (done by itself when the panel is shown;
  /// the window calls it once Horizon is drawn, so the cache is warm early without slowing the
  /// start). A session set while the panel is hidden waits for this again.
  void startBackgroundWork();

  // For tests and the benchmark.
  DateStudyModel *model() const;
  DateStudyChart *chart() const;
  QComboBox *segmentPicker() const;
  QComboBox *methodPicker() const;
  QTableWidget *segmentTable() const;
  QTableWidget *reservationTable() const;
  QListWidget *overrideHistory() const;
  /// True while forecasts (or protection) are being computed in the background.
  bool isComputing() const;
  /// The forecast figure as shown ("Forecast 132 rooms …"), empty when none.
  QString forecastText() const;
  /// Microseconds the last night switch (setNight) and the last method switch took.
  qint64 lastNightSwitchMicros() const;
  qint64 lastMethodSwitchMicros() const;
  /// What the override form's Save does; returns false (and says why) when it cannot save.
  bool saveOverride(double value, const QString &reason);
  /// Another window writes this store: overrides are refused with `reason` (shown on the form).
  void setReadOnly(bool readOnly, const QString &reason = {});
  /// The drill-down: lists the reservations behind the OTB figure and shows them.
  void showReservations();

protected:
  void showEvent(QShowEvent *event) override;

signals:
  /// The user asked for the previous / next night (keyboard or buttons); the window decides.
  void nightStepRequested(int days);
  /// An override was saved to the store (other screens may refresh).
  void overrideSaved();

private:
  struct Impl;
  Impl *d_;
};

} // namespace cbui
