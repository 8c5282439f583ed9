// The Horizon's compact chart: rooms on the books (bars), the unconstrained forecast (dashed
// line) with its 80 % band (shaded), and capacity (solid step line) across the next N nights.
#pragma once

#include <QWidget>

class QCustomPlot;

// Forward declarations only: moc of Qt 6.4 cannot parse the C++20 library headers core uses.
namespace cbui {
struct HorizonData;

class HorizonChart : public QWidget {
  Q_OBJECT
public:
  explicit HorizonChart(QWidget *parent = nullptr);
  void showHorizon(const HorizonData &data);
  QCustomPlot *plot() const { return plot_; }
  /// Saves the chart as PNG or PDF (by the file's extension); false when it cannot be written.
  bool exportTo(const QString &file);

private:
  QCustomPlot *plot_;
};

} // namespace cbui
