// The Horizon chart into a painter (see morningbriefchart.h). QCustomPlot draws only through its
// own QCPPainter, so the chart is drawn into an image at four times the page's resolution and
// that image placed on the page.
#include "ui/morningbriefchart.h"

#include "ui/horizonchart.h"
#include "ui/horizonmodel.h"

#include <QImage>
#include <QLocale>
#include <QPainter>
#include <qcustomplot.h>

#include <cmath>

namespace cbui {

void paintHorizonChart(QPainter &painter, const QRectF &rect, const HorizonData &data) {
  const int w = static_cast<int>(std::lround(rect.width()));
  const int h = static_cast<int>(std::lround(rect.height()));
  if (w <= 0 || h <= 0)
    return;
  HorizonChart chart;
  chart.resize(w, h);
  chart.showHorizon(data);
  QCustomPlot *plot = chart.plot();
  // Two-line labels ("Sat" over "7 Nov"): every night of a two-week page stays readable.
  auto ticker = QSharedPointer<QCPAxisTickerText>::create();
  for (std::size_t i = 0; i < data.rows.size(); ++i)
    ticker->addTick(static_cast<double>(i + 1),
                    QLocale().toString(data.rows[i].night, QStringLiteral("ddd\nd MMM")));
  plot->xAxis->setTicker(ticker);
  QFont small = plot->xAxis->tickLabelFont();
  small.setPointSizeF(small.pointSizeF() * 0.85);
  plot->xAxis->setTickLabelFont(small);

  constexpr int kScale = 4;
  QImage image(w * kScale, h * kScale, QImage::Format_ARGB32_Premultiplied);
  image.setDevicePixelRatio(kScale);
  image.fill(Qt::white);
  {
    QCPPainter p(&image);
    p.setRenderHint(QPainter::Antialiasing);
    plot->toPainter(&p, w, h);
  }
  painter.drawImage(rect, image);
}

} // namespace cbui
