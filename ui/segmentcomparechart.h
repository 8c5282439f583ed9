// Segment Compare's charts (QCustomPlot): one widget per view — the segments' booking curves by
// days before arrival (this year solid, last year dashed; rooms or share of final), their booking
// windows (share of room-nights per lead bucket, grouped bars) and average rate per lead bucket.
#pragma once

#include <QStringList>
#include <QWidget>

class QCustomPlot;

// Forward declarations only: moc of Qt 6.4 cannot parse the C++20 library headers core uses.
namespace cbui {
struct SegmentCompareData;

class SegmentCompareChart : public QWidget {
  Q_OBJECT
public:
  enum Kind { Curves, Window, Rate };
  explicit SegmentCompareChart(Kind kind, QWidget *parent = nullptr);
  /// Draws the series whose codes are in `shown`; `share` = curves in share of final, else
  /// rooms; `lastYear` = last year's curves dashed beside this year's.
  void showData(const SegmentCompareData &compare, const QStringList &shown, bool share,
                bool lastYear);
  Kind kind() const { return kind_; }
  QCustomPlot *plot() const { return plot_; }
  /// Saves the chart as PNG or PDF (by the file's extension); false when it cannot be written.
  bool exportTo(const QString &file);

private:
  Kind kind_;
  QCustomPlot *plot_;
};

} // namespace cbui
