#include "ui/datestudychart.h"

#include "ui/palette.h"

#include <QElapsedTimer>
#include <QToolTip>
#include <QVBoxLayout>
#include <qcustomplot.h>

#include <algorithm>
#include <cmath>
#include <optional>

namespace cbui {
namespace {

// Okabe–Ito colours not yet in ui/palette.h (Okabe & Ito 2008): forecast, band, override.
QColor forecastColour() { return QColor(0xD5, 0x5E, 0x00); } // vermillion
QColor bandColour() { return QColor(0x56, 0xB4, 0xE9); }     // sky blue
QColor overrideColour() { return QColor(0x00, 0x9E, 0x73); } // bluish green

std::optional<double> at(const QVector<double> &xs, const QVector<double> &ys, double x) {
  for (qsizetype i = 0; i < xs.size() && i < ys.size(); ++i)
    if (std::abs(xs[i] - x) < 0.5)
      return ys[i];
  return std::nullopt;
}

QString rooms(double v) {
  return QString::number(v, 'f', std::abs(v - std::round(v)) < 1e-9 ? 0 : 1);
}

} // namespace

DateStudyChart::DateStudyChart(QWidget *parent) : QWidget(parent), plot_(new QCustomPlot(this)) {
  auto *layout = new QVBoxLayout(this);
  layout->setContentsMargins(0, 0, 0, 0);
  layout->addWidget(plot_);
  plot_->setMinimumSize(420, 300);
  plot_->xAxis->setLabel(tr("Days before arrival (arrival = 0)"));
  plot_->yAxis->setLabel(tr("Rooms on the books"));
  plot_->legend->setVisible(true);
  plot_->legend->setFont(QFont(font().family(), 8));
  plot_->axisRect()->insetLayout()->setInsetAlignment(0, Qt::AlignTop | Qt::AlignLeft);
  plot_->setInteractions(QCP::iRangeDrag | QCP::iRangeZoom);
  plot_->setMouseTracking(true);
  connect(plot_, &QCustomPlot::mouseMove, this, &DateStudyChart::onMouseMove);
}

void DateStudyChart::setData(const DateStudyChartData &c) {
  data_ = c;
  plot_->clearGraphs();
  plot_->clearItems();
  tracer_ = nullptr;
  yMax_ = std::max(1.0, c.capacity);
  auto grow = [&](const QVector<double> &ys) {
    for (double y : ys)
      yMax_ = std::max(yMax_, y);
  };

  // Comparable band first, so the curves are drawn over it.
  if (!c.bandX.isEmpty()) {
    QCPGraph *low = plot_->addGraph();
    low->setData(c.bandX, c.bandLow); // leads 0 … D run right to left: let QCustomPlot sort
    low->setPen(Qt::NoPen);
    low->removeFromLegend();
    QCPGraph *high = plot_->addGraph();
    high->setName(tr("Comparable nights 10–90 % (%1 nights)").arg(c.bandNights));
    high->setData(c.bandX, c.bandHigh);
    high->setPen(QPen(bandColour().lighter(130), 1));
    QColor fill = bandColour();
    fill.setAlpha(60);
    high->setBrush(fill);
    high->setChannelFillGraph(low);
    grow(c.bandHigh);
  }

  QCPGraph *thisYear = nullptr;
  if (!c.stackNames.isEmpty()) {
    QVector<double> base(c.thisYearX.size(), 0.0);
    QCPGraph *below = nullptr;
    for (qsizetype i = 0; i < c.stackNames.size(); ++i) {
      QVector<double> top = base;
      for (qsizetype k = 0; k < top.size() && k < c.stackY[i].size(); ++k)
        top[k] += c.stackY[i][k];
      QCPGraph *g = plot_->addGraph();
      g->setName(c.stackNames[i]);
      g->setData(c.thisYearX, top, true);
      g->setLineStyle(QCPGraph::lsStepLeft);
      QColor col = c.stackColours.value(i, palette::thisYear());
      g->setPen(QPen(col.darker(120), 1));
      col.setAlpha(150);
      g->setBrush(col);
      if (below)
        g->setChannelFillGraph(below);
      below = g;
      base = top;
      grow(top);
    }
  }

  QCPGraph *lastYear = plot_->addGraph();
  lastYear->setName(c.lastYearLabel);
  lastYear->setData(c.lastYearX, c.lastYearY, true);
  lastYear->setLineStyle(QCPGraph::lsStepLeft);
  lastYear->setPen(QPen(palette::lastYear(), 2.2, Qt::DashLine));
  grow(c.lastYearY);

  thisYear = plot_->addGraph();
  thisYear->setName(c.thisYearLabel);
  thisYear->setData(c.thisYearX, c.thisYearY, true);
  thisYear->setLineStyle(QCPGraph::lsStepLeft);
  thisYear->setPen(QPen(palette::thisYear(), 2.8, Qt::SolidLine));
  grow(c.thisYearY);

  if (c.hasForecast) {
    if (c.hasForecastBand) {
      QCPGraph *lo = plot_->addGraph();
      lo->setData(QVector<double>{c.readingX, 0}, QVector<double>{c.otb, c.forecastLow});
      lo->setPen(Qt::NoPen);
      lo->removeFromLegend();
      QCPGraph *hi = plot_->addGraph();
      hi->setName(tr("Forecast band %1–%2").arg(rooms(c.forecastLow), rooms(c.forecastHigh)));
      hi->setData(QVector<double>{c.readingX, 0}, QVector<double>{c.otb, c.forecastHigh});
      hi->setPen(Qt::NoPen);
      QColor fill = forecastColour();
      fill.setAlpha(45);
      hi->setBrush(fill);
      hi->setChannelFillGraph(lo);
      grow({c.forecastHigh});
    }
    QCPGraph *fc = plot_->addGraph();
    fc->setName(c.forecastLabel);
    fc->setData(QVector<double>{c.readingX, 0}, QVector<double>{c.otb, c.forecast});
    fc->setPen(QPen(forecastColour(), 2.4, Qt::DashDotDotLine));
    fc->setScatterStyle(QCPScatterStyle(QCPScatterStyle::ssCircle, forecastColour(), 7));
    grow({c.forecast});
  }

  if (!c.overrides.isEmpty()) {
    QCPGraph *ov = plot_->addGraph();
    ov->setName(tr("Override"));
    ov->setData(QVector<double>(c.overrides.size(), 0.0), c.overrides);
    ov->setLineStyle(QCPGraph::lsNone);
    ov->setScatterStyle(QCPScatterStyle(QCPScatterStyle::ssDiamond, QPen(overrideColour(), 2),
                                        overrideColour(), 11));
    grow(c.overrides);
  }

  QCPGraph *cap = plot_->addGraph();
  cap->setName(tr("Capacity %1 rooms").arg(c.capacity));
  cap->setData(QVector<double>{c.xMin, 0}, QVector<double>{c.capacity, c.capacity});
  cap->setPen(QPen(palette::capacity(), 1.6, Qt::DotLine));

  if (c.hasReading) {
    auto *line = new QCPItemStraightLine(plot_);
    line->point1->setCoords(c.readingX, 0);
    line->point2->setCoords(c.readingX, 1);
    line->setPen(QPen(palette::readingDate(), 1.5, Qt::DashDotLine));
    auto *label = new QCPItemText(plot_);
    label->position->setCoords(c.readingX, yMax_ * 1.08);
    label->setPositionAlignment(Qt::AlignRight | Qt::AlignTop);
    label->setText(tr("reading date "));
    label->setColor(palette::readingDate());
  }

  // The hover crosshair follows a curve with points (a tracer on an empty graph warns at
  // every replot); none when neither year has any.
  QCPGraph *traced = thisYear->data()->isEmpty() ? lastYear : thisYear;
  if (traced->data()->isEmpty()) {
    resetView();
    return;
  }
  tracer_ = new QCPItemTracer(plot_);
  tracer_->setGraph(traced);
  tracer_->setStyle(QCPItemTracer::tsCrosshair);
  tracer_->setPen(QPen(QColor(0x66, 0x66, 0x66), 0.8, Qt::DotLine));
  tracer_->setVisible(false);
  resetView();
}

void DateStudyChart::resetView() {
  plot_->xAxis->setRange(data_.xMin - 1, 1);
  plot_->yAxis->setRange(0, yMax_ * 1.12 + 1);
  QElapsedTimer t;
  t.start();
  plot_->replot();
  if (qEnvironmentVariableIsSet("CURVEBENCH_TRACE_DATESTUDY"))
    qInfo("replot %lld us (%g ms per layer)", static_cast<long long>(t.nsecsElapsed() / 1000),
          plot_->replotTime());
}

QString DateStudyChart::valuesAt(double x) const {
  const double xr = std::round(x);
  QStringList out;
  out << tr("%1 days before arrival").arg(static_cast<int>(-xr));
  if (auto v = at(data_.thisYearX, data_.thisYearY, xr))
    out << tr("%1: %2 rooms").arg(data_.thisYearLabel, rooms(*v));
  for (qsizetype i = 0; i < data_.stackNames.size(); ++i)
    if (auto v = at(data_.thisYearX, data_.stackY[i], xr))
      out << tr("  %1: %2").arg(data_.stackNames[i], rooms(*v));
  if (auto v = at(data_.lastYearX, data_.lastYearY, xr))
    out << tr("%1: %2 rooms").arg(data_.lastYearLabel, rooms(*v));
  auto lo = at(data_.bandX, data_.bandLow, xr), hi = at(data_.bandX, data_.bandHigh, xr);
  if (lo && hi)
    out << tr("Comparable nights: %1–%2").arg(rooms(*lo), rooms(*hi));
  if (data_.hasForecast && xr >= data_.readingX && xr <= 0 && data_.readingX < 0) {
    const double share = (xr - data_.readingX) / -data_.readingX;
    out << tr("Forecast path: %1").arg(rooms(data_.otb + share * (data_.forecast - data_.otb)));
    if (xr == 0 && data_.hasForecastBand)
      out << tr("Forecast band: %1–%2").arg(rooms(data_.forecastLow), rooms(data_.forecastHigh));
  }
  if (xr == 0)
    for (double o : data_.overrides)
      out << tr("Override: %1").arg(rooms(o));
  out << tr("Capacity: %1").arg(data_.capacity);
  return out.join(QLatin1Char('\n'));
}

bool DateStudyChart::exportPng(const QString &file) { return plot_->savePng(file, 0, 0, 2.0); }
bool DateStudyChart::exportPdf(const QString &file) { return plot_->savePdf(file); }

void DateStudyChart::onMouseMove(QMouseEvent *event) {
  const double x = plot_->xAxis->pixelToCoord(event->position().x());
  if (x < data_.xMin - 0.5 || x > 0.5 || !tracer_) {
    QToolTip::hideText();
    if (tracer_ && tracer_->visible()) {
      tracer_->setVisible(false);
      plot_->replot(QCustomPlot::rpQueuedReplot);
    }
    return;
  }
  tracer_->setGraphKey(std::round(x));
  tracer_->setVisible(true);
  plot_->replot(QCustomPlot::rpQueuedReplot);
  QToolTip::showText(event->globalPosition().toPoint(), valuesAt(x), plot_);
}

} // namespace cbui
