// Segment Compare, the screen used before setting rates: pick a night or a period and segments;
// see their booking curves (rooms or % of final, this year and last year), booking windows, rate
// by lead and a this-year-vs-last-year table. Computed off the UI thread; charts export to
// PNG/PDF, the table to CSV.
#pragma once

#include <QDate>
#include <QStringList>
#include <QWidget>

namespace cbui {

class WorkbenchSession;
struct SegmentCompareData;

class SegmentComparePanel : public QWidget {
  Q_OBJECT
public:
  explicit SegmentComparePanel(QWidget *parent = nullptr);
  ~SegmentComparePanel() override;
  /// The session to read (not owned; nullptr clears). Call again after the reading date changed.
  void setSession(WorkbenchSession *session);
  /// Nights first … last (recomputed in the background).
  void setPeriod(const QDate &first, const QDate &last);
  /// Curves in % of final (true) or rooms.
  void setShare(bool share);
  /// Shows or hides a series ("ALL" = hotel total) on the charts.
  void setSeriesShown(const QString &code, bool shown);
  QStringList shownSeries() const;
  /// The data on screen (nullptr before the first result).
  const SegmentCompareData *data() const;

signals:
  /// A computed comparison is on screen.
  void computed();

private:
  void recompute();
  void redraw();
  struct Impl;
  Impl *d_;
};

} // namespace cbui
