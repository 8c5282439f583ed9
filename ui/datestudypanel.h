// Date Study: one night in depth — this year's and last year's booking curves, the comparable-
// nights band, the forecast with its error band, capacity, constrained vs unconstrained demand,
// the segment table with protection, expert overrides and the reservations behind a figure.
#pragma once

#include <QWidget>

// Forward declarations only: moc of Qt 6.4 cannot parse the C++20 library headers core uses.
namespace cb {
class Date;
}

namespace cbui {

class WorkbenchSession;

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
