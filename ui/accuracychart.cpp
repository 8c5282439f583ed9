#include "ui/accuracychart.h"

#include <QVBoxLayout>
#include <qcustomplot.h>

#include <algorithm>

namespace cbui {

AccuracyChart::AccuracyChart(QWidget *parent) : QWidget(parent), plot_(new QCustomPlot) {
  auto *lay = new QVBoxLayout(this);
  lay->setContentsMargins(0, 0, 0, 0);
  lay->addWidget(plot_);
  plot_->xAxis->setLabel(QStringLiteral("Days before arrival (lead)"));
  plot_->legend->setVisible(true);
  plot_->legend->setFont(QFont(font().family(), 8));
  // The legend beside the plot, not over it: the short leads at the left matter most.
  plot_->plotLayout()->addElement(0, 1, plot_->legend);
  plot_->plotLayout()->setColumnStretchFactor(1, 0.001);
  plot_->setInteractions(QCP::iRangeDrag | QCP::iRangeZoom);
  plot_->setMinimumHeight(220);
}

void AccuracyChart::setData(const AccuracyChartData &d) {
  plot_->clearGraphs();
  // Okabe–Ito (Okabe & Ito 2008), then the same colours dashed, then dotted.
  static const QColor colours[] = {QColor(0x00, 0x72, 0xB2), QColor(0xE6, 0x9F, 0x00),
                                   QColor(0x00, 0x9E, 0x73), QColor(0xCC, 0x79, 0xA7),
                                   QColor(0x56, 0xB4, 0xE9), QColor(0xD5, 0x5E, 0x00),
                                   QColor(0x00, 0x00, 0x00), QColor(0x99, 0x99, 0x99)};
  static const Qt::PenStyle styles[] = {Qt::SolidLine, Qt::DashLine, Qt::DotLine};
  static const QCPScatterStyle::ScatterShape shapes[] = {
      QCPScatterStyle::ssCircle, QCPScatterStyle::ssSquare, QCPScatterStyle::ssTriangle,
      QCPScatterStyle::ssDiamond, QCPScatterStyle::ssCross};
  double yMin = 0, yMax = 1, xMax = 1;
  for (int i = 0; i < d.methods.size(); ++i) {
    QCPGraph *g = plot_->addGraph();
    g->setName(d.methods[i]);
    QPen pen(colours[i % 8], d.methods[i] == d.highlight ? 3.0 : 1.5, styles[(i / 8) % 3]);
    g->setPen(pen);
    g->setScatterStyle(QCPScatterStyle(shapes[i % 5], 6));
    g->setData(d.leads[i], d.values[i]);
    for (double v : d.values[i]) {
      yMin = std::min(yMin, v);
      yMax = std::max(yMax, v);
    }
    for (double x : d.leads[i])
      xMax = std::max(xMax, x);
  }
  plot_->yAxis->setLabel(d.measure);
  plot_->xAxis->setRange(0, xMax + 2);
  plot_->yAxis->setRange(yMin < 0 ? yMin * 1.1 : 0, yMax * 1.1);
  plot_->replot();
}

bool AccuracyChart::exportTo(const QString &file) {
  return file.endsWith(QStringLiteral(".pdf"), Qt::CaseInsensitive) ? plot_->savePdf(file)
                                                                    : plot_->savePng(file);
}

} // namespace cbui
