// Year Map's calendar view: see yearmapview.h.
#include "ui/yearmapview.h"

#include "ui/yearmapmodel.h"

#include <QEvent>
#include <QHelpEvent>
#include <QKeyEvent>
#include <QLocale>
#include <QMouseEvent>
#include <QPageSize>
#include <QPainter>
#include <QPdfWriter>
#include <QToolTip>

#include <algorithm>

namespace cbui {
namespace {

constexpr int kTitle = 24, kHeader = 16, kLegend = 30, kLeft = 44, kRight = 6;

QDate toQDate(cb::Date d) {
  return QDate(d.year(), static_cast<int>(d.month()), static_cast<int>(d.day()));
}

} // namespace

YearMapView::YearMapView(QWidget *parent) : QWidget(parent) {
  setMouseTracking(true);
  setFocusPolicy(Qt::StrongFocus);
  setAttribute(Qt::WA_OpaquePaintEvent);
}

void YearMapView::setMap(const YearMapData *map, int colouring, int segment, const QString &title) {
  data_ = map;
  colouring_ = colouring;
  segment_ = segment;
  title_ = title;
  if (!map || focus_.year() != map->year)
    focus_ = QDate();
  update();
}

void YearMapView::setFocusedNight(const QDate &night) {
  if (!data_ || night.year() != data_->year)
    return;
  focus_ = night;
  update();
}

QRect YearMapView::cellIn(const QRect &area, int month, int day) const {
  const int w = (area.width() - kLeft - kRight) / 31;
  const int h = (area.height() - kTitle - kHeader - kLegend) / 12;
  return QRect(area.left() + kLeft + (day - 1) * w, area.top() + kTitle + kHeader + (month - 1) * h,
               w, h);
}

QRect YearMapView::cellRect(const QDate &night) const {
  if (!data_ || night.year() != data_->year)
    return {};
  return cellIn(rect(), night.month(), night.day());
}

std::optional<QDate> YearMapView::nightAt(const QPoint &pos) const {
  if (!data_)
    return std::nullopt;
  for (int m = 1; m <= 12; ++m)
    for (int d = 1; d <= 31; ++d)
      if (QDate date(data_->year, m, d); date.isValid() && cellIn(rect(), m, d).contains(pos))
        return date;
  return std::nullopt;
}

void YearMapView::paintEvent(QPaintEvent *) {
  QPainter p(this);
  p.fillRect(rect(), palette().window());
  paintMap(p, rect());
  // The keyboard's night: a thick black-and-white dashed outline over the cell's edge, visible on
  // every cell colour and unlike the reading date's solid one; on screen only, not in exports.
  if (hasFocus() && focus_.isValid()) {
    const QRect c = cellRect(focus_).adjusted(0, 0, -1, -1);
    p.setRenderHint(QPainter::Antialiasing, false);
    p.setBrush(Qt::NoBrush);
    p.setPen(QPen(Qt::white, 4));
    p.drawRect(c);
    p.setPen(QPen(Qt::black, 4, Qt::DashLine));
    p.drawRect(c);
  }
}

void YearMapView::paintMap(QPainter &p, const QRect &area) const {
  p.setRenderHint(QPainter::Antialiasing, false);
  QFont base = font();
  QFont bold = base;
  bold.setBold(true);
  QFont tiny = base;
  tiny.setPointSizeF(base.pointSizeF() * 0.72);
  p.setPen(Qt::black);
  p.setFont(bold);
  p.drawText(QRect(area.left() + 4, area.top(), area.width() - 8, kTitle),
             Qt::AlignLeft | Qt::AlignVCenter, title_);
  if (!data_)
    return;
  const auto colouring = static_cast<YearMapColouring>(colouring_);
  const auto segment = static_cast<std::size_t>(std::max(0, segment_));

  p.setFont(tiny);
  p.setPen(QColor(0x55, 0x55, 0x55));
  for (int d = 1; d <= 31; ++d) {
    QRect c = cellIn(area, 1, d);
    p.drawText(QRect(c.left(), area.top() + kTitle, c.width(), kHeader), Qt::AlignCenter,
               QString::number(d));
  }
  const QDate asOf = toQDate(data_->asOf);
  const QDate jan1(data_->year, 1, 1);
  QFont cellFont = base;
  cellFont.setBold(true);
  for (int m = 1; m <= 12; ++m) {
    QRect first = cellIn(area, m, 1);
    p.setFont(base);
    p.setPen(Qt::black);
    p.drawText(QRect(area.left() + 2, first.top(), kLeft - 6, first.height()),
               Qt::AlignRight | Qt::AlignVCenter, QLocale().monthName(m, QLocale::ShortFormat));
    for (int d = 1; d <= 31; ++d) {
      const QDate date(data_->year, m, d);
      if (!date.isValid())
        continue;
      const QRect c = cellIn(area, m, d).adjusted(1, 1, -1, -1);
      const auto i = static_cast<std::size_t>(jan1.daysTo(date));
      const YearMapCell cell = yearMapCell(*data_, i, colouring, segment);
      p.fillRect(c, cell.fill);
      if (!data_->nights[i].past && cell.band >= 0) { // forecast: hatched in the ink colour
        QColor hatch = cell.ink;
        hatch.setAlpha(70);
        p.fillRect(c, QBrush(hatch, Qt::BDiagPattern));
      }
      const bool weekend = date.dayOfWeek() >= 6;
      p.setFont(tiny);
      p.setPen(cell.ink);
      p.drawText(c.adjusted(2, 0, 0, 0), Qt::AlignLeft | Qt::AlignTop,
                 QLocale().dayName(date.dayOfWeek(), QLocale::ShortFormat).left(2));
      if (weekend) { // a bar under Saturdays and Sundays
        p.fillRect(QRect(c.left(), c.bottom() - 2, c.width(), 3), QColor(0x33, 0x33, 0x33));
      }
      p.setFont(cellFont);
      p.drawText(c.adjusted(0, 4, 0, 0), Qt::AlignCenter, cell.text);
      if (date == asOf) {
        p.setPen(QPen(Qt::black, 3));
        p.drawRect(c.adjusted(1, 1, -1, -1));
      }
    }
  }

  // Legend: the bands, then the marks.
  const std::vector<YearMapLegendEntry> legend = yearMapLegend(*data_, colouring);
  int x = area.left() + kLeft;
  const int y = area.bottom() - kLegend + 6;
  const QFontMetrics fm(base);
  p.setFont(base);
  for (const YearMapLegendEntry &e : legend) {
    const QRect sw(x, y, 22, 18);
    p.fillRect(sw, e.fill);
    p.setPen(QColor(0x88, 0x88, 0x88));
    p.drawRect(sw.adjusted(0, 0, -1, -1));
    p.setPen(e.ink);
    p.drawText(sw, Qt::AlignCenter, e.text);
    p.setPen(Qt::black);
    p.drawText(QPoint(x + 26, y + 14), e.label);
    x += 26 + fm.horizontalAdvance(e.label) + 14;
  }
  QRect hatch(x, y, 22, 18);
  p.fillRect(hatch, QColor(0xEE, 0xEE, 0xEE));
  p.fillRect(hatch, QBrush(QColor(0, 0, 0, 70), Qt::BDiagPattern));
  p.setPen(Qt::black);
  const QString marks = QStringLiteral("forecast (after the reading date)   ▭ thick outline: "
                                       "reading date   ▁ bar: weekend   grey: no figure");
  p.drawText(QPoint(x + 26, y + 14), marks);
}

void YearMapView::mouseReleaseEvent(QMouseEvent *event) {
  if (event->button() == Qt::LeftButton)
    if (auto night = nightAt(event->position().toPoint())) {
      setFocusedNight(*night);
      emit nightActivated(*night);
    }
  QWidget::mouseReleaseEvent(event);
}

void YearMapView::keyPressEvent(QKeyEvent *event) {
  if (!data_) {
    QWidget::keyPressEvent(event);
    return;
  }
  const int year = data_->year;
  if (!focus_.isValid()) {
    // The first key puts the keyboard on the reading date when it is in this year, else on 1 Jan.
    const QDate asOf = toQDate(data_->asOf);
    switch (event->key()) {
    case Qt::Key_Left:
    case Qt::Key_Right:
    case Qt::Key_Up:
    case Qt::Key_Down:
    case Qt::Key_Home:
    case Qt::Key_End: setFocusedNight(asOf.year() == year ? asOf : QDate(year, 1, 1)); return;
    default: break;
    }
  }
  const QDate f = focus_;
  const bool ctrl = event->modifiers().testFlag(Qt::ControlModifier);
  auto sameDayIn = [&](int month) {
    const QDate first(year, month, 1);
    return QDate(year, month, std::min(f.day(), first.daysInMonth()));
  };
  QDate to;
  switch (event->key()) {
  case Qt::Key_Left: to = f.addDays(-1); break;
  case Qt::Key_Right: to = f.addDays(1); break;
  case Qt::Key_Up: to = f.month() > 1 ? sameDayIn(f.month() - 1) : f; break;
  case Qt::Key_Down: to = f.month() < 12 ? sameDayIn(f.month() + 1) : f; break;
  case Qt::Key_Home: to = ctrl ? QDate(year, 1, 1) : QDate(year, f.month(), 1); break;
  case Qt::Key_End:
    to = ctrl ? QDate(year, 12, 31) : QDate(year, f.month(), f.daysInMonth());
    break;
  case Qt::Key_Return:
  case Qt::Key_Enter:
    if (f.isValid())
      emit nightActivated(f);
    return;
  default: QWidget::keyPressEvent(event); return;
  }
  if (to.year() == year) // the map's ends: stay on 1 Jan / 31 Dec
    setFocusedNight(to);
}

void YearMapView::focusInEvent(QFocusEvent *event) {
  QWidget::focusInEvent(event);
  update();
}

void YearMapView::focusOutEvent(QFocusEvent *event) {
  QWidget::focusOutEvent(event);
  update();
}

bool YearMapView::event(QEvent *event) {
  if (event->type() == QEvent::ToolTip && data_) {
    auto *help = static_cast<QHelpEvent *>(event);
    if (auto night = nightAt(help->pos())) {
      const auto i = static_cast<std::size_t>(QDate(data_->year, 1, 1).daysTo(*night));
      const bool seg = static_cast<YearMapColouring>(colouring_) == YearMapColouring::SegmentShare;
      QToolTip::showText(
          help->globalPos(),
          yearMapTip(*data_, i,
                     seg ? std::optional<std::size_t>(static_cast<std::size_t>(segment_))
                         : std::nullopt),
          this);
    } else {
      QToolTip::hideText();
    }
    return true;
  }
  return QWidget::event(event);
}

bool YearMapView::exportTo(const QString &file) {
  if (file.endsWith(QStringLiteral(".pdf"), Qt::CaseInsensitive)) {
    QPdfWriter pdf(file);
    pdf.setPageSize(QPageSize(QPageSize::A4));
    pdf.setPageOrientation(QPageLayout::Landscape);
    pdf.setResolution(96);
    QPainter p;
    if (!p.begin(&pdf))
      return false;
    const QRect page(0, 0, pdf.width(), pdf.height());
    p.fillRect(page, Qt::white);
    paintMap(p, page);
    return p.end();
  }
  QImage image(std::max(width(), 1200), std::max(height(), 560), QImage::Format_ARGB32);
  image.fill(Qt::white);
  QPainter p(&image);
  paintMap(p, image.rect());
  p.end();
  return image.save(file);
}

} // namespace cbui
