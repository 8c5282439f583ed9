// Horizon, the morning review: the next N nights as a sortable, filterable table (OTB, pickup,
// STLY, forecast with band, constrained forecast, occupancy, ADR, sell-out probability, season,
// flags) under a compact chart of OTB / forecast / capacity across the horizon.
#pragma once

#include <QDate>
#include <QWidget>

namespace cbui {

class WorkbenchSession;

class HorizonPanel : public QWidget {
  Q_OBJECT
public:
  explicit HorizonPanel(QWidget *parent = nullptr);
  ~HorizonPanel() override;
  /// The session to read (not owned; nullptr clears). Call again after the reading date changed;
  /// the outlook is recomputed off the UI thread with a progress indication.
  void setSession(WorkbenchSession *session);

signals:
  /// Double-click or Enter on a night: open it in Date Study. (A Qt type in signals: moc needs
  /// complete argument types and cannot read core's headers.)
  void nightActivated(QDate night);
  /// A computed outlook is on screen (table and chart).
  void outlookShown();

private:
  void fitColumns();
  struct Impl;
  Impl *d_;
};

} // namespace cbui
