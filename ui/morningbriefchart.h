// The Horizon chart (ui/horizonchart.h) drawn into any painter — the morning brief's PDF — at
// print resolution, with two-line night labels so fourteen nights fit a page's width.
#pragma once

class QPainter;
class QRectF;

namespace cbui {
struct HorizonData;

/// Draws the chart of `data` (OTB bars, forecast and its band, capacity) into `rect`.
void paintHorizonChart(QPainter &painter, const QRectF &rect, const HorizonData &data);

} // namespace cbui
