// Segment Compare's charts: see segmentcomparechart.h.
#include "ui/segmentcomparechart.h"

#include "ui/segmentcomparemodel.h"

#include <QVBoxLayout>
#include <qcustomplot.h>

#include <algorithm>

namespace cbui {

SegmentCompareChart::SegmentCompareChart(Kind kind, QWidget *parent)
    : QWidget(parent), kind_(kind), plot_(new QCustomPlot(this)) {
  auto *layout = new QVBoxLayout(this);
  layout->setContentsMargins(0, 0, 0, 0);
  layout->addWidget(plot_);
  plot_->setMinimumHeight(150);
  plot_->plotLayout()->insertRow(0);
  const char *titles[] = {"Booking curves by days before arrival",
                          "Booking window: share of room-nights by lead",
                          "Average rate by lead (days)"};
  auto *title = new QCPTextElement(plot_, QString::fromUtf8(titles[kind]));
  QFont bold = title->font();
  bold.setBold(true);
  title->setFont(bold);
  plot_->plotLayout()->addElement(0, 0, title);
  plot_->plotLayout()->setRowStretchFactor(0, 0.001);
  QFont small = plot_->xAxis->tickLabelFont();
  small.setPointSizeF(small.pointSizeF() * 0.9);
  plot_->xAxis->setTickLabelFont(small);
  plot_->yAxis->setTickLabelFont(small);
  plot_->legend->setFont(small);
  plot_->legend->setBrush(QColor(255, 255, 255, 200));
  plot_->legend->setBorderPen(Qt::NoPen);
}

bool SegmentCompareChart::exportTo(const QString &file) {
  if (file.endsWith(QStringLiteral(".pdf"), Qt::CaseInsensitive))
    return plot_->savePdf(file, 900, 450);
  return plot_->savePng(file, 1200, 600);
}

void SegmentCompareChart::showData(const SegmentCompareData &compare, const QStringList &shown,
                                   bool share, bool lastYear) {
  plot_->clearPlottables();
  plot_->clearItems();
  std::vector<const SegmentCompareSeries *> series;
  for (const auto &s : compare.series)
    if (shown.contains(QString::fromStdString(s.code)))
      series.push_back(&s);
  plot_->legend->setVisible(kind_ == Curves && lastYear && !series.empty());
  double top = 0;

  if (kind_ == Curves) {
    auto line = [&](const SegmentCompareSeries &s, const std::vector<std::optional<double>> &y,
                    bool dashed) {
      QVector<double> xs, ys;
      for (std::size_t d = y.size(); d-- > 0;)
        if (y[d]) {
          xs << -static_cast<double>(d);
          ys << *y[d] * (share ? 100.0 : 1.0);
          top = std::max(top, ys.back());
        }
      if (xs.isEmpty())
        return;
      QCPGraph *g = plot_->addGraph();
      g->setData(xs, ys, true);
      g->setPen(QPen(s.colour, dashed ? 1.4 : 2.2, dashed ? Qt::DashLine : Qt::SolidLine));
      g->setName(s.label + (dashed ? QStringLiteral(" last year") : QString()));
      g->removeFromLegend();
    };
    for (const auto *s : series) {
      line(*s, share ? s->share : s->rooms, false);
      if (lastYear)
        line(*s, share ? s->lastYearShare : s->lastYearRooms, true);
    }
    if (plot_->legend->visible()) { // a key for the line styles, colours are the checkboxes'
      QCPGraph *ty = plot_->addGraph();
      ty->setPen(QPen(Qt::darkGray, 2.2));
      ty->setName(QStringLiteral("this year"));
      QCPGraph *ly = plot_->addGraph();
      ly->setPen(QPen(Qt::darkGray, 1.4, Qt::DashLine));
      ly->setName(QStringLiteral("last year (comparable nights)"));
      plot_->axisRect()->insetLayout()->setInsetAlignment(0, Qt::AlignTop | Qt::AlignLeft);
    }
    plot_->xAxis->setTicker(QSharedPointer<QCPAxisTicker>::create());
    plot_->xAxis->setLabel(QStringLiteral("Days before arrival (arrival at 0)"));
    plot_->yAxis->setLabel(share                ? QStringLiteral("% of final")
                           : compare.nights > 1 ? QStringLiteral("Rooms per night")
                                                : QStringLiteral("Rooms"));
    plot_->xAxis->setRange(-compare.maxDba - 0.5, 0.5);
    if (compare.asOf < compare.last && compare.asOf >= compare.first - compare.maxDba) {
      // Reading date of the last night chosen: to its right this year's curve is unknown.
      auto *mark = new QCPItemStraightLine(plot_);
      const double x = -static_cast<double>(compare.last - compare.asOf);
      mark->point1->setCoords(x, 0);
      mark->point2->setCoords(x, 1);
      mark->setPen(QPen(QColor(0xCC, 0x79, 0xA7), 1, Qt::DotLine));
    }
  } else {
    // Buckets as categories 1 … 9; bars grouped per segment, rate as lines with markers.
    auto ticker = QSharedPointer<QCPAxisTickerText>::create();
    for (std::size_t b = 0; b < cb::kLeadBuckets.size(); ++b)
      ticker->addTick(static_cast<double>(b + 1), QString::fromUtf8(cb::kLeadBuckets[b].label));
    plot_->xAxis->setTicker(ticker);
    plot_->xAxis->setRange(0.4, static_cast<double>(cb::kLeadBuckets.size()) + 0.6);
    plot_->xAxis->setLabel(compare.windowFromLastYear
                               ? QStringLiteral("Days ahead booked (last year's comparable "
                                                "arrivals)")
                               : QStringLiteral("Days ahead booked"));
    const double width = 0.8 / std::max<double>(1.0, static_cast<double>(series.size()));
    for (std::size_t i = 0; i < series.size(); ++i) {
      const SegmentCompareSeries &s = *series[i];
      QVector<double> keys, values;
      for (std::size_t b = 0; b < cb::kLeadBuckets.size(); ++b) {
        const double key = static_cast<double>(b + 1);
        if (kind_ == Window) {
          keys << key - 0.4 + width * (static_cast<double>(i) + 0.5);
          values << s.windowShare[b] * 100.0;
        } else if (s.rateByLead[b]) {
          keys << key;
          values << *s.rateByLead[b];
        }
        if (!values.isEmpty())
          top = std::max(top, values.back());
      }
      if (kind_ == Window) {
        auto *bars = new QCPBars(plot_->xAxis, plot_->yAxis);
        bars->setData(keys, values, true);
        bars->setWidth(width * 0.9);
        bars->setPen(Qt::NoPen);
        bars->setBrush(s.colour);
        bars->setName(s.label);
      } else {
        QCPGraph *g = plot_->addGraph();
        g->setData(keys, values, true);
        g->setPen(QPen(s.colour, 2.0));
        g->setScatterStyle(QCPScatterStyle(QCPScatterStyle::ssDisc, s.colour, s.colour, 6));
        g->setName(s.label);
      }
    }
    plot_->yAxis->setLabel(kind_ == Window ? QStringLiteral("% of the segment's room-nights")
                                           : QStringLiteral("Rate per room-night (%1)")
                                                 .arg(QString::fromStdString(compare.currency)));
  }
  plot_->yAxis->setRange(0, std::max(1.0, top * 1.08));
  plot_->replot();
}

} // namespace cbui
