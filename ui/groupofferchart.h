// The Group offer chart: per night of the offer (shoulder nights shaded), the expected transient
// demand and the group rooms (groups already held, the offer stacked on them) as bars side by
// side, capacity as a step line, and the displaced rooms on the right-hand axis.
#pragma once

#include <QString>
#include <QVector>
#include <QWidget>

class QCustomPlot;
class QLabel;
class QStackedLayout;

namespace cbui {

struct GroupOfferChartData {
  QVector<QString> labels; ///< tick label per night, e.g. "Thu\n3 Dec"
  QVector<bool> shoulder;
  QVector<double> capacity, transientDemand, groupsHeld, offered, displaced;
};

class GroupOfferChart : public QWidget {
  Q_OBJECT
public:
  explicit GroupOfferChart(QWidget *parent = nullptr);
  /// Draws `data` (no nights: an empty chart).
  void setData(const GroupOfferChartData &data);
  QCustomPlot *plot() const { return plot_; }
  /// Saves the chart as PNG or PDF (by the file's extension); false when it cannot be written.
  bool exportTo(const QString &file);

private:
  QCustomPlot *plot_;
  QLabel *empty_;
  QStackedLayout *stack_;
};

} // namespace cbui
