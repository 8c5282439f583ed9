#include "ui/nightcurvechart.h"

#include "ui/palette.h"
#include "ui/workbenchsession.h"

#include <QVBoxLayout>
#include <qcustomplot.h>

#include <algorithm>

namespace cbui {
namespace {

QVector<double> toQ(const std::vector<double> &v) { return QVector<double>(v.begin(), v.end()); }

} // namespace

NightCurveChart::NightCurveChart(QWidget *parent) : QWidget(parent), plot_(new QCustomPlot(this)) {
  auto *layout = new QVBoxLayout(this);
  layout->setContentsMargins(0, 0, 0, 0);
  layout->addWidget(plot_);
  plot_->setMinimumSize(480, 320);
  plot_->xAxis->setLabel(QStringLiteral("Days before arrival"));
  plot_->yAxis->setLabel(QStringLiteral("Rooms on the books"));
  plot_->legend->setVisible(true);
  plot_->axisRect()->insetLayout()->setInsetAlignment(0, Qt::AlignTop | Qt::AlignLeft);
  plot_->setInteractions(QCP::iRangeDrag | QCP::iRangeZoom);
}

void NightCurveChart::showCurves(const NightCurves &c) {
  plot_->clearGraphs();
  plot_->clearItems();

  auto addGraph = [&](const CurveSeries &s, const QColor &colour, Qt::PenStyle style) {
    QCPGraph *g = plot_->addGraph();
    g->setName(QString::fromStdString(s.label));
    g->setData(toQ(s.x), toQ(s.y), true);
    g->setLineStyle(QCPGraph::lsStepLeft);
    g->setPen(QPen(colour, 2.5, style));
    return g;
  };
  addGraph(c.lastYear, palette::lastYear(), Qt::DashLine);
  addGraph(c.thisYear, palette::thisYear(), Qt::SolidLine);

  double xmin = 0;
  double ymax = c.capacity;
  for (const auto *s : {&c.thisYear, &c.lastYear}) {
    if (!s->x.empty())
      xmin = std::min(xmin, s->x.front());
    for (double y : s->y)
      ymax = std::max(ymax, y);
  }
  QCPGraph *cap = plot_->addGraph();
  cap->setName(QStringLiteral("Capacity %1 rooms").arg(c.capacity));
  cap->setData(QVector<double>{xmin, 0}, QVector<double>{double(c.capacity), double(c.capacity)});
  cap->setPen(QPen(palette::capacity(), 1.5, Qt::DotLine));

  if (c.readingLead) {
    auto *line = new QCPItemStraightLine(plot_);
    line->point1->setCoords(-*c.readingLead, 0);
    line->point2->setCoords(-*c.readingLead, 1);
    line->setPen(QPen(palette::readingDate(), 1.5, Qt::DashDotLine));
    auto *label = new QCPItemText(plot_);
    label->position->setCoords(-*c.readingLead, ymax * 1.05);
    label->setPositionAlignment(Qt::AlignRight | Qt::AlignTop);
    label->setText(QStringLiteral("reading date "));
    label->setColor(palette::readingDate());
  }
  plot_->xAxis->setRange(xmin, 0);
  plot_->yAxis->setRange(0, ymax * 1.1 + 1);
  plot_->replot();
}

} // namespace cbui
