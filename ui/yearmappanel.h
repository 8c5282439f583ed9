// Year Map, the whole year at a glance: every night of a calendar year coloured by season class
// or demand over capacity (the hotel), or by a segment's share of the hotel's rooms; past nights
// show actuals, future nights the forecast (computed off the UI thread). Clicking a night opens it
// in Date Study; the map exports to PNG/PDF and its figures to CSV.
#pragma once

#include <QDate>
#include <QWidget>

namespace cbui {

class WorkbenchSession;
struct YearMapData;
class YearMapView;

class YearMapPanel : public QWidget {
  Q_OBJECT
public:
  explicit YearMapPanel(QWidget *parent = nullptr);
  ~YearMapPanel() override;
  /// The session to read (not owned; nullptr clears). Call again after the reading date changed.
  void setSession(WorkbenchSession *session);
  void setYear(int year);
  /// 0 = season class, 1 = demand / capacity (hotel total only).
  void setColouring(int colouring);
  /// "" = hotel total, else a segment code (coloured by its share of the hotel's rooms).
  void setSegment(const QString &code);
  const YearMapData *data() const;
  YearMapView *view() const;

signals:
  /// A night clicked on the map: open it in Date Study.
  void nightActivated(QDate night);
  /// A computed map is on screen.
  void computed();

private:
  void recompute();
  void redraw();
  struct Impl;
  Impl *d_;
};

} // namespace cbui
