#include "ui/groupofferchart.h"

#include "ui/palette.h"

#include <QLabel>
#include <QStackedLayout>
#include <qcustomplot.h>

#include <algorithm>

namespace cbui {

GroupOfferChart::GroupOfferChart(QWidget *parent)
    : QWidget(parent), plot_(new QCustomPlot),
      empty_(new QLabel(QStringLiteral("No offer checked yet: the chart shows the nights of "
                                       "the last offer evaluated."))) {
  // One or the other, with the same geometry (the plot keeps its size while the note shows).
  stack_ = new QStackedLayout(this);
  stack_->setContentsMargins(0, 0, 0, 0);
  stack_->addWidget(plot_);
  empty_->setAlignment(Qt::AlignCenter);
  empty_->setStyleSheet(QStringLiteral("color: #666666"));
  stack_->addWidget(empty_);
  plot_->yAxis->setLabel(QStringLiteral("Rooms"));
  plot_->yAxis2->setLabel(QStringLiteral("Displaced rooms"));
  plot_->yAxis2->setVisible(true);
  plot_->yAxis2->setLabelColor(palette::displaced().darker(130));
  plot_->yAxis2->setTickLabelColor(palette::displaced().darker(130));
  plot_->legend->setVisible(true);
  plot_->legend->setFont(QFont(font().family(), 8));
  // The legend in one row under the plot, so no bar hides behind it.
  auto *legendRow = new QCPLayoutGrid;
  plot_->plotLayout()->addElement(1, 0, legendRow);
  legendRow->addElement(0, 0, plot_->legend);
  plot_->legend->setFillOrder(QCPLegend::foColumnsFirst);
  plot_->legend->setBorderPen(Qt::NoPen);
  plot_->plotLayout()->setRowStretchFactor(1, 0.001);
  plot_->setMinimumHeight(200);
}

void GroupOfferChart::setData(const GroupOfferChartData &d) {
  plot_->clearPlottables();
  plot_->clearItems();
  const int n = static_cast<int>(d.labels.size());
  // No offer checked: a note instead of empty axes.
  stack_->setCurrentWidget(n > 0 ? static_cast<QWidget *>(plot_) : empty_);
  if (n == 0)
    return;
  QVector<double> keys;
  for (int i = 0; i < n; ++i)
    keys << i;
  double top = 1, topDisplaced = 0;
  for (int i = 0; i < n; ++i) {
    top = std::max({top, d.capacity[i], d.transientDemand[i], d.groupsHeld[i] + d.offered[i]});
    topDisplaced = std::max(topDisplaced, d.displaced[i]);
  }

  // Shoulder nights: a light band behind the bars.
  for (int i = 0; i < n; ++i)
    if (d.shoulder[i]) {
      auto *band = new QCPItemRect(plot_);
      band->setLayer(QStringLiteral("background"));
      band->topLeft->setCoords(i - 0.5, top * 1.15);
      band->bottomRight->setCoords(i + 0.5, 0);
      band->setPen(Qt::NoPen);
      band->setBrush(QColor(0xEE, 0xEE, 0xEE));
    }

  auto *group = new QCPBarsGroup(plot_);
  group->setSpacingType(QCPBarsGroup::stAbsolute);
  group->setSpacing(2);
  auto *transient = new QCPBars(plot_->xAxis, plot_->yAxis);
  transient->setName(QStringLiteral("Expected transient demand"));
  transient->setData(keys, d.transientDemand, true);
  transient->setPen(QPen(palette::transientDemand().darker(120)));
  transient->setBrush(palette::transientDemand());
  transient->setWidth(0.34);
  transient->setBarsGroup(group);
  auto *held = new QCPBars(plot_->xAxis, plot_->yAxis);
  held->setName(QStringLiteral("Groups already held"));
  held->setData(keys, d.groupsHeld, true);
  held->setPen(QPen(palette::groupsHeld().darker(130)));
  held->setBrush(palette::groupsHeld());
  held->setWidth(0.34);
  held->setBarsGroup(group);
  auto *offered = new QCPBars(plot_->xAxis, plot_->yAxis);
  offered->setName(QStringLiteral("Group rooms offered"));
  offered->setData(keys, d.offered, true);
  offered->setPen(QPen(palette::groupOffer().darker(130)));
  offered->setBrush(palette::groupOffer());
  offered->setWidth(0.34);
  offered->setBarsGroup(group); // placed by the group beside the transient bars, on `held`
  offered->moveAbove(held);

  QCPGraph *cap = plot_->addGraph();
  cap->setName(QStringLiteral("Capacity"));
  QVector<double> ck, cv;
  for (int i = 0; i < n; ++i) {
    ck << i - 0.5;
    cv << d.capacity[i];
  }
  ck << n - 0.5;
  cv << d.capacity.back();
  cap->setData(ck, cv, true);
  cap->setLineStyle(QCPGraph::lsStepLeft);
  cap->setPen(QPen(palette::capacity(), 2.0));

  QCPGraph *disp = plot_->addGraph(plot_->xAxis, plot_->yAxis2);
  disp->setName(QStringLiteral("Displaced rooms (right axis)"));
  disp->setData(keys, d.displaced, true);
  disp->setPen(QPen(palette::displaced(), 2.0, Qt::DashLine));
  disp->setScatterStyle(
      QCPScatterStyle(QCPScatterStyle::ssDiamond, palette::displaced(), palette::displaced(), 9));

  auto ticker = QSharedPointer<QCPAxisTickerText>::create();
  for (int i = 0; i < n; ++i)
    ticker->addTick(i, d.labels[i]);
  plot_->xAxis->setTicker(ticker);
  plot_->xAxis->setRange(-0.6, n - 0.4);
  plot_->yAxis->setRange(0, top * 1.12);
  plot_->yAxis2->setRange(0, std::max(1.0, topDisplaced * 1.25));
  plot_->replot();
}

bool GroupOfferChart::exportTo(const QString &file) {
  return file.endsWith(QStringLiteral(".pdf"), Qt::CaseInsensitive) ? plot_->savePdf(file)
                                                                    : plot_->savePng(file);
}

} // namespace cbui
