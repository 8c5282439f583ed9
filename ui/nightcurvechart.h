// One night's booking curve this year against the same night last year (QCustomPlot).
#pragma once

#include <QWidget>

class QCustomPlot;

// Forward declarations only: moc of Qt 6.4 cannot parse the C++20 library headers core uses.
namespace cbui {
struct NightCurves;

class NightCurveChart : public QWidget {
  Q_OBJECT
public:
  explicit NightCurveChart(QWidget *parent = nullptr);
  void showCurves(const NightCurves &curves);
  QCustomPlot *plot() const { return plot_; }

private:
  QCustomPlot *plot_;
};

} // namespace cbui
