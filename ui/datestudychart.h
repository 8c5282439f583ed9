// The Date Study chart (QCustomPlot): one night's booking curve this year, last year's, the
// comparable-nights band, the forecast to arrival with its band, capacity, the reading date,
// overrides; hover shows exact values, drag pans, wheel zooms, resetView() restores.
#pragma once

#include <QColor>
#include <QString>
#include <QStringList>
#include <QVector>
#include <QWidget>

class QCustomPlot;
class QCPItemTracer;
class QMouseEvent;

namespace cbui {

/// What the chart draws, in Qt types (x = −days before arrival, arrival at 0; y = rooms).
struct DateStudyChartData {
  QString thisYearLabel, lastYearLabel;
  QVector<double> thisYearX, thisYearY, lastYearX, lastYearY;
  /// Stacked view: one this-year curve per segment (same x as thisYearX); empty = not stacked.
  QStringList stackNames;
  QVector<QColor> stackColours;
  QVector<QVector<double>> stackY;
  /// Comparable-nights band (low / high quantile at each x); empty = none.
  QVector<double> bandX, bandLow, bandHigh;
  int bandNights = 0;
  double capacity = 0;
  bool hasReading = false;
  double readingX = 0; ///< −lead of the reading date
  /// Forecast: from (readingX, otb) to (0, forecast), band lo–hi at arrival.
  bool hasForecast = false;
  double otb = 0, forecast = 0;
  bool hasForecastBand = false;
  double forecastLow = 0, forecastHigh = 0;
  QString forecastLabel;
  QVector<double> overrides; ///< override values at arrival
  double xMin = -90;
};

class DateStudyChart : public QWidget {
  Q_OBJECT
public:
  explicit DateStudyChart(QWidget *parent = nullptr);
  void setData(const DateStudyChartData &data);
  /// Back to the whole curve (after zoom or pan).
  void resetView();
  QCustomPlot *plot() const { return plot_; }
  /// The text the hover shows at x (−days before arrival): every drawn value there.
  QString valuesAt(double x) const;
  bool exportPng(const QString &file);
  bool exportPdf(const QString &file);

private:
  void onMouseMove(QMouseEvent *event);
  QCustomPlot *plot_;
  QCPItemTracer *tracer_ = nullptr;
  DateStudyChartData data_;
  double yMax_ = 1;
};

} // namespace cbui
