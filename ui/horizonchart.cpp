#include "ui/horizonchart.h"

#include "ui/horizonmodel.h"
#include "ui/palette.h"

#include <QLocale>
#include <QVBoxLayout>
#include <qcustomplot.h>

#include <algorithm>

namespace cbui {
namespace {

QColor forecastColour() { return QColor(0x00, 0x9E, 0x73); } // Okabe–Ito bluish green

} // namespace

HorizonChart::HorizonChart(QWidget *parent) : QWidget(parent), plot_(new QCustomPlot(this)) {
  auto *layout = new QVBoxLayout(this);
  layout->setContentsMargins(0, 0, 0, 0);
  layout->addWidget(plot_);
  plot_->setMinimumHeight(170);
  plot_->yAxis->setLabel(QStringLiteral("Rooms"));
  plot_->legend->setVisible(true);
  plot_->legend->setFillOrder(QCPLegend::foColumnsFirst);
  plot_->legend->setWrap(5);
  // The legend in a row of its own above the plot, so it never hides a bar.
  // (Left-aligned at its natural width: a spacer beside it takes the rest of the row.)
  auto *top = new QCPLayoutGrid;
  plot_->plotLayout()->insertRow(0);
  plot_->plotLayout()->addElement(0, 0, top);
  plot_->plotLayout()->setRowStretchFactor(0, 0.001);
  top->addElement(0, 0, plot_->legend);
  top->addElement(0, 1, new QCPLayoutElement(plot_));
  top->setColumnStretchFactor(0, 0.001);
  plot_->legend->setBorderPen(Qt::NoPen);
  plot_->legend->setMargins(QMargins(0, 0, 0, 0));
  QFont small = plot_->legend->font();
  small.setPointSizeF(small.pointSizeF() * 0.85);
  plot_->legend->setFont(small);
}

bool HorizonChart::exportTo(const QString &file) {
  if (file.endsWith(QStringLiteral(".pdf"), Qt::CaseInsensitive))
    return plot_->savePdf(file, 1000, 300);
  return plot_->savePng(file, 1600, 480);
}

void HorizonChart::showHorizon(const HorizonData &horizon) {
  plot_->clearPlottables();
  plot_->clearItems();
  const auto &rows = horizon.rows;
  if (rows.empty()) {
    plot_->replot();
    return;
  }
  // Keys: 1 … N, one per night (the table's order by date), labelled with dates.
  QVector<double> keys, otb, forecast, lo, hi, capacity;
  bool haveBand = false;
  double top = 0;
  for (std::size_t i = 0; i < rows.size(); ++i) {
    const HorizonRow &r = rows[i];
    keys << static_cast<double>(i + 1);
    otb << r.otb;
    forecast << r.forecast;
    lo << r.lo.value_or(r.forecast);
    hi << r.hi.value_or(r.forecast);
    haveBand = haveBand || (r.lo && r.hi);
    capacity << r.capacity;
    top = std::max({top, static_cast<double>(r.otb), r.hi.value_or(r.forecast),
                    horizon.segment.isEmpty() ? static_cast<double>(r.capacity) : 0.0});
  }

  auto *bars = new QCPBars(plot_->xAxis, plot_->yAxis);
  bars->setName(QStringLiteral("On the books"));
  bars->setData(keys, otb, true);
  bars->setWidth(0.7);
  bars->setPen(Qt::NoPen);
  bars->setBrush(palette::thisYear().lighter(130));

  if (haveBand) {
    QCPGraph *upper = plot_->addGraph();
    QCPGraph *lower = plot_->addGraph();
    upper->setData(keys, hi, true);
    lower->setData(keys, lo, true);
    QColor fill = forecastColour();
    fill.setAlpha(50);
    upper->setPen(Qt::NoPen);
    lower->setPen(Qt::NoPen);
    upper->setBrush(fill);
    upper->setChannelFillGraph(lower);
    upper->setName(QStringLiteral("Forecast band (80 %)"));
    lower->removeFromLegend();
  }
  QCPGraph *f = plot_->addGraph();
  f->setName(QStringLiteral("Forecast (unconstrained)"));
  f->setData(keys, forecast, true);
  f->setPen(QPen(forecastColour(), 2.0, Qt::DashLine));

  if (horizon.segment.isEmpty()) {
    QCPGraph *c = plot_->addGraph();
    c->setName(QStringLiteral("Capacity"));
    // Step centred on each night: extend by half a night on either side.
    QVector<double> ck, cv;
    for (int i = 0; i < keys.size(); ++i) {
      ck << keys[i] - 0.5;
      cv << capacity[i];
    }
    ck << keys.back() + 0.5;
    cv << capacity.back();
    c->setData(ck, cv, true);
    c->setLineStyle(QCPGraph::lsStepLeft);
    c->setPen(QPen(palette::capacity(), 1.5, Qt::SolidLine));
  }

  // Date labels: every night for a short horizon, else every 7th night from the first.
  auto ticker = QSharedPointer<QCPAxisTickerText>::create();
  const std::size_t step = rows.size() <= 14 ? 1 : 7;
  for (std::size_t i = 0; i < rows.size(); i += step)
    ticker->addTick(static_cast<double>(i + 1),
                    QLocale().toString(rows[i].night, QStringLiteral("ddd d MMM")));
  plot_->xAxis->setTicker(ticker);
  plot_->xAxis->setRange(0.4, static_cast<double>(rows.size()) + 0.6);
  plot_->yAxis->setRange(0, std::max(1.0, top * 1.08));
  plot_->replot();
}

} // namespace cbui
