// The morning brief PDF (see morningbrief.h): QPdfWriter at 96 dots per inch, so the page is laid
// out in screen pixels (A4 landscape: 1123 × 794) and fonts in points keep their usual size.
#include "ui/morningbrief.h"

#include "core/advice.h"
#include "core/date.h"
#include "core/textformat.h"
#include "ui/horizonmodel.h"
#include "ui/morningbriefchart.h"
#include "ui/workbenchsession.h"

#include <QApplication>
#include <QFileDialog>
#include <QFileInfo>
#include <QFontMetricsF>
#include <QGuiApplication>
#include <QLocale>
#include <QPageLayout>
#include <QPageSize>
#include <QPainter>
#include <QPdfWriter>

#include <algorithm>
#include <cmath>
#include <exception>
#include <iterator>
#include <string>

namespace cbui {
namespace {

QString qs(const std::string &s) { return QString::fromStdString(s); }
QString count(double v) { return qs(cb::formatCount(std::llround(v))); }
QString signedCount(int v) { return v > 0 ? QStringLiteral("+") + count(v) : count(v); }
QString percent(double share) {
  return share > 0 && share < 0.005 ? QStringLiteral("< 1 %") : qs(cb::formatPercent(share, 0));
}
QString shortNight(const QDate &d) { return QLocale().toString(d, QStringLiteral("ddd d MMM")); }
bool hasFlag(const HorizonRow &r, const char *flag) {
  return r.flags.contains(QString::fromUtf8(flag));
}

QFont font(double points, bool bold = false) {
  QFont f = QGuiApplication::font();
  f.setPointSizeF(points);
  f.setBold(bold);
  return f;
}

const QColor kInk(0x22, 0x22, 0x22);
const QColor kMuted(0x55, 0x55, 0x55);
const QColor kRule(0xBB, 0xBB, 0xBB);
const QColor kBehind(0xD5, 0x5E, 0x00); // Okabe–Ito vermillion, as the Horizon table

struct Column {
  const char *title;
  double width;
  Qt::Alignment align;
};

// The table: night and event, then the figures; widths in page pixels (sum ≤ the content width).
const Column kColumns[] = {
    {"Night", 82, Qt::AlignLeft},        {"Event", 140, Qt::AlignLeft},
    {"OTB", 46, Qt::AlignRight},         {"Pickup 1 d", 72, Qt::AlignRight},
    {"Pickup 7 d", 72, Qt::AlignRight},  {"vs STLY", 62, Qt::AlignRight},
    {"Forecast", 66, Qt::AlignRight},    {"Band (80 %)", 80, Qt::AlignRight},
    {"Constrained", 78, Qt::AlignRight}, {"Occupancy", 72, Qt::AlignRight},
    {"ADR", 84, Qt::AlignRight},         {"Sell-out", 62, Qt::AlignRight},
    {"Flags", 0, Qt::AlignLeft}, // the rest of the width
};

QStringList cells(const HorizonRow &r, const QString &currency) {
  auto opt = [](const auto &v, auto f) { return v ? f(*v) : QStringLiteral("–"); };
  return {shortNight(r.night),
          r.event,
          count(r.otb),
          signedCount(r.pickup1),
          signedCount(r.pickup7),
          opt(r.stlyOtb, [&](int v) { return signedCount(r.otb - v); }),
          count(r.forecast),
          r.lo && r.hi ? count(*r.lo) + QStringLiteral("–") + count(*r.hi) : QStringLiteral("–"),
          opt(r.constrained, [](double v) { return count(v); }),
          opt(r.occupancy, [](double v) { return qs(cb::formatPercent(v, 0)); }),
          opt(r.adr, [&](double v) { return qs(cb::formatMoney(v, currency.toStdString())); }),
          opt(r.pSellout, [](double v) { return percent(v); }),
          r.flags.join(QStringLiteral(", "))};
}

// A heading and a paragraph under it; returns the y below the paragraph.
double section(QPainter &p, double x, double y, double w, const QString &title,
               const QString &body) {
  p.setFont(font(9.5, true));
  p.setPen(kInk);
  const QRectF head(x, y, w, QFontMetricsF(p.font()).height());
  p.drawText(head, Qt::AlignLeft | Qt::AlignVCenter, title);
  p.setFont(font(8.5));
  const QRectF room(x, head.bottom() + 2, w, 400);
  const QRectF used = p.boundingRect(room, Qt::TextWordWrap | Qt::AlignLeft, body);
  p.drawText(room, Qt::TextWordWrap | Qt::AlignLeft, body);
  return used.bottom() + 10;
}

} // namespace

BriefHighlights briefHighlights(const HorizonData &data, std::size_t maxItems) {
  BriefHighlights h;
  const auto &rows = data.rows;
  auto largest = [&](int HorizonRow::*field) {
    std::vector<std::size_t> idx;
    for (std::size_t i = 0; i < rows.size(); ++i)
      if (rows[i].*field > 0)
        idx.push_back(i);
    std::stable_sort(idx.begin(), idx.end(),
                     [&](std::size_t a, std::size_t b) { return rows[a].*field > rows[b].*field; });
    if (idx.size() > maxItems)
      idx.resize(maxItems);
    return idx;
  };
  h.pickup1 = largest(&HorizonRow::pickup1);
  h.pickup7 = largest(&HorizonRow::pickup7);
  for (std::size_t i = 0; i < rows.size(); ++i) {
    if ((hasFlag(rows[i], "full") || hasFlag(rows[i], "sell-out likely")) &&
        h.sellouts.size() < maxItems)
      h.sellouts.push_back(i);
    if ((hasFlag(rows[i], "pace up") || hasFlag(rows[i], "pace down")) &&
        h.paceAlerts.size() < maxItems)
      h.paceAlerts.push_back(i);
  }
  return h;
}

bool writeMorningBriefPdf(const HorizonData &data, const QString &propertyName, int capacity,
                          const QString &file, QString *error) {
  auto fail = [&](const QString &why) {
    if (error)
      *error = QStringLiteral("%1: %2").arg(file, why);
    return false;
  };
  QPdfWriter writer(file);
  writer.setResolution(96);
  writer.setPageLayout(
      QPageLayout(QPageSize(QPageSize::A4), QPageLayout::Landscape, QMarginsF(0, 0, 0, 0)));
  writer.setTitle(
      QStringLiteral("Morning brief %1 %2").arg(propertyName, data.asOf.toString(Qt::ISODate)));
  writer.setCreator(QStringLiteral("Curvebench"));
  QPainter p;
  if (!p.begin(&writer))
    return fail(QStringLiteral("cannot write the PDF"));
  p.setRenderHint(QPainter::Antialiasing);
  p.setRenderHint(QPainter::TextAntialiasing);

  const QRect page = writer.pageLayout().paintRectPixels(writer.resolution());
  const double margin = 34;
  const double left = margin, top = margin;
  const double width = page.width() - 2 * margin;
  const auto nights = std::min<std::size_t>(data.rows.size(), kBriefNights);
  HorizonData table = data;
  table.rows.resize(nights);

  // Heading: what, for whom, as of when.
  double y = top;
  p.setPen(kInk);
  p.setFont(font(17, true));
  const QString title =
      QStringLiteral("Morning brief — %1")
          .arg(propertyName.isEmpty() ? QStringLiteral("the property") : propertyName);
  const double titleH = QFontMetricsF(p.font()).height();
  p.drawText(QRectF(left, y, width, titleH), Qt::AlignLeft | Qt::AlignVCenter, title);
  p.setFont(font(10));
  p.setPen(kMuted);
  const QString asOfText =
      QStringLiteral("Reading date %1 (%2)")
          .arg(QLocale().toString(data.asOf, QStringLiteral("dddd d MMMM yyyy")),
               data.asOf.toString(Qt::ISODate));
  p.drawText(QRectF(left, y, width, titleH), Qt::AlignRight | Qt::AlignVCenter, asOfText);
  y += titleH + 2;
  p.setFont(font(9));
  const QString sub =
      QStringLiteral("Next %1 nights · capacity %2 rooms · forecast method %3 · rooms on the books "
                     "(OTB) at the reading date, pickup net of cancellations")
          .arg(nights)
          .arg(count(capacity), data.method.isEmpty() ? QStringLiteral("–") : data.method);
  p.drawText(QRectF(left, y, width, 16), Qt::AlignLeft | Qt::AlignVCenter, sub);
  y += 20;
  p.setPen(QPen(kRule, 1));
  p.drawLine(QPointF(left, y), QPointF(left + width, y));
  y += 8;

  // Chart (left) and lists (right).
  const double chartW = std::round(width * 0.63), chartH = 290;
  paintHorizonChart(p, QRectF(left, y, chartW, chartH), table);
  const double lx = left + chartW + 18, lw = width - chartW - 18;
  const BriefHighlights hl = briefHighlights(data);
  const auto &rows = data.rows;
  auto list = [&](const std::vector<std::size_t> &idx, auto item, const QString &none) {
    QStringList parts;
    for (std::size_t i : idx)
      parts << item(rows[i]);
    return parts.isEmpty() ? none : parts.join(QStringLiteral(" · "));
  };
  const QString ahead = QStringLiteral(" (next %1 nights)").arg(kBriefLookahead);
  double ly = y;
  ly = section(
      p, lx, ly, lw, QStringLiteral("Notable pickups") + ahead,
      QStringLiteral("Last day: ") +
          list(
              hl.pickup1,
              [](const HorizonRow &r) {
                return QStringLiteral("%1 %2").arg(shortNight(r.night), signedCount(r.pickup1));
              },
              QStringLiteral("no night picked up rooms")) +
          QStringLiteral("\nLast 7 days: ") +
          list(
              hl.pickup7,
              [](const HorizonRow &r) {
                return QStringLiteral("%1 %2").arg(shortNight(r.night), signedCount(r.pickup7));
              },
              QStringLiteral("no night picked up rooms")));
  ly = section(p, lx, ly, lw, QStringLiteral("Likely sell-outs") + ahead,
               list(
                   hl.sellouts,
                   [](const HorizonRow &r) {
                     return hasFlag(r, "full")
                                ? QStringLiteral("%1 full").arg(shortNight(r.night))
                                : QStringLiteral("%1 %2").arg(shortNight(r.night),
                                                              percent(r.pSellout.value_or(0)));
                   },
                   QStringLiteral("none: no night is full or likely to sell out")));
  ly = section(p, lx, ly, lw, QStringLiteral("Pace alerts") + ahead,
               list(
                   hl.paceAlerts,
                   [](const HorizonRow &r) {
                     const int stly = r.stlyOtb.value_or(0);
                     return QStringLiteral("%1 %2: %3 vs %4 last year")
                         .arg(shortNight(r.night),
                              hasFlag(r, "pace up") ? QStringLiteral("ahead")
                                                    : QStringLiteral("behind"),
                              count(r.otb), count(stly));
                   },
                   QStringLiteral("none: every night is within the pace band of last year")));
  (void)ly;
  y += chartH + 12;

  // Table of the next nights.
  const double rowH = 20;
  const double pad = 4;
  p.setFont(font(8.5, true));
  p.setPen(kInk);
  // Each column at least as wide as its bold heading; the flags take what is left.
  const QFontMetricsF headFm(p.font());
  double widths[std::size(kColumns)];
  double flagsW = width;
  for (std::size_t c = 0; c + 1 < std::size(kColumns); ++c) {
    widths[c] =
        std::max(kColumns[c].width,
                 headFm.horizontalAdvance(QString::fromUtf8(kColumns[c].title)) + 2 * pad + 2);
    flagsW -= widths[c];
  }
  widths[std::size(kColumns) - 1] = std::max(flagsW, 60.0);
  auto columnWidth = [&](const Column &c) {
    return widths[static_cast<std::size_t>(&c - kColumns)];
  };
  double x = left;
  for (const Column &c : kColumns) {
    p.drawText(QRectF(x + pad, y, columnWidth(c) - 2 * pad, rowH), c.align | Qt::AlignVCenter,
               QString::fromUtf8(c.title));
    x += columnWidth(c);
  }
  y += rowH;
  p.setPen(QPen(kInk, 1));
  p.drawLine(QPointF(left, y), QPointF(left + width, y));
  p.setFont(font(8.5));
  for (std::size_t i = 0; i < nights; ++i) {
    const HorizonRow &r = table.rows[i];
    if (i % 2 == 1)
      p.fillRect(QRectF(left, y, width, rowH), QColor(0xF2, 0xF2, 0xF2));
    const QStringList texts = cells(r, data.currency);
    x = left;
    for (qsizetype c = 0; c < texts.size(); ++c) {
      const Column &col = kColumns[c];
      const double w = columnWidth(col) - 2 * pad;
      const bool behind = (c == 3 && r.pickup1 < 0) || (c == 4 && r.pickup7 < 0) ||
                          (c == 5 && r.stlyOtb && r.otb < *r.stlyOtb);
      p.setPen(behind ? kBehind : kInk);
      p.drawText(QRectF(x + pad, y, w, rowH), col.align | Qt::AlignVCenter,
                 QFontMetricsF(p.font()).elidedText(texts[c], Qt::ElideRight, w));
      x += columnWidth(col);
    }
    y += rowH;
  }
  p.setPen(QPen(kRule, 1));
  p.drawLine(QPointF(left, y), QPointF(left + width, y));
  y += 6;
  p.setFont(font(7.5));
  p.setPen(kMuted);
  p.drawText(
      QRectF(left, y, width, 30), Qt::TextWordWrap | Qt::AlignLeft,
      QStringLiteral("vs STLY: OTB less the rooms on the books for the comparable night last "
                     "year at the same days before arrival. Forecast: unconstrained demand; "
                     "constrained: expected rooms sold given capacity. Sell-out: probability "
                     "that demand reaches capacity. Figures behind last year or lost are in "
                     "orange."));

  // The caution, at the foot of the page.
  p.setFont(font(9, true));
  p.setPen(kInk);
  const QRectF foot(left, page.height() - margin - 22, width, 22);
  p.drawText(foot, Qt::TextWordWrap | Qt::AlignLeft | Qt::AlignVCenter,
             QString::fromUtf8(cb::kAdvisoryCaution.data(),
                               static_cast<qsizetype>(cb::kAdvisoryCaution.size())));
  if (!p.end())
    return fail(QStringLiteral("cannot finish the PDF"));
  if (QFileInfo(file).size() <= 0)
    return fail(QStringLiteral("the PDF was not written"));
  return true;
}

bool renderMorningBrief(WorkbenchSession &session, const QDate &asOf, const QString &file,
                        QString *error) {
  const cb::Date previous = session.readingDate();
  try {
    if (asOf.isValid())
      session.setReadingDate(cb::Date::fromYmd(asOf.year(), static_cast<unsigned>(asOf.month()),
                                               static_cast<unsigned>(asOf.day())));
    const HorizonData data = computeHorizon(session, kBriefLookahead, {});
    session.setReadingDate(previous);
    const int capacity =
        data.rows.empty() ? session.property().capacity : data.rows.front().capacity;
    return writeMorningBriefPdf(data, qs(session.property().name), capacity, file, error);
  } catch (const std::exception &e) {
    session.setReadingDate(previous);
    if (error)
      *error = QString::fromUtf8(e.what());
    return false;
  }
}

QString saveMorningBriefAs(QWidget *parent, WorkbenchSession &session) {
  const cb::Date asOf = session.readingDate();
  QString file =
      QFileDialog::getSaveFileName(parent, QStringLiteral("Save the morning brief"),
                                   QStringLiteral("morning-brief-%1.pdf").arg(qs(asOf.toIso())),
                                   QStringLiteral("PDF document (*.pdf)"));
  if (file.isEmpty())
    return {};
  if (QFileInfo(file).suffix().isEmpty())
    file += QStringLiteral(".pdf");
  QApplication::setOverrideCursor(Qt::WaitCursor);
  QString error;
  const bool ok = renderMorningBrief(session, QDate(), file, &error);
  QApplication::restoreOverrideCursor();
  return ok ? QStringLiteral("Saved the morning brief to %1").arg(file)
            : QStringLiteral("Not saved: %1").arg(error);
}

} // namespace cbui
