// The Accuracy chart: one error measure (MAE, RMSE, WAPE or bias) by lead for each method, lines
// with markers; colours from the Okabe–Ito palette, line styles repeat after eight methods.
#pragma once

#include <QString>
#include <QStringList>
#include <QVector>
#include <QWidget>

class QCustomPlot;

namespace cbui {

struct AccuracyChartData {
  QString measure; ///< axis title, e.g. "MAE (rooms)"
  QStringList methods;
  QVector<QVector<double>> leads, values; ///< per method
  QString highlight;                      ///< method drawn thicker (auto's usual pick)
};

class AccuracyChart : public QWidget {
  Q_OBJECT
public:
  explicit AccuracyChart(QWidget *parent = nullptr);
  void setData(const AccuracyChartData &data);
  QCustomPlot *plot() const { return plot_; }
  bool exportTo(const QString &file); ///< PNG or PDF by extension

private:
  QCustomPlot *plot_;
};

} // namespace cbui
