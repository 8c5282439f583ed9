// Year Map's model layer: see yearmapmodel.h.
#include "ui/yearmapmodel.h"

#include "ui/csvexport.h"
#include "ui/workbenchsession.h"

#include "core/curvecube.h"
#include "core/forecastrun.h"
#include "core/outlook.h"
#include "core/propertysettings.h"
#include "core/textformat.h"

#include <QDate>
#include <QLocale>
#include <QStandardItemModel>

#include <algorithm>
#include <array>
#include <cmath>
#include <map>

namespace cbui {
namespace {

QString qs(const std::string &s) { return QString::fromStdString(s); }

// ColorBrewer "Blues", 5 classes (Brewer 2003): light to dark, readable in grey and by the
// common forms of colour blindness.
const std::array<QColor, 5> kBlues = {QColor(0xEF, 0xF3, 0xFF), QColor(0xBD, 0xD7, 0xE7),
                                      QColor(0x6B, 0xAE, 0xD6), QColor(0x31, 0x82, 0xBD),
                                      QColor(0x08, 0x51, 0x9C)};
constexpr std::array<double, 4> kDemandBands = {0.5, 0.7, 0.9, 1.0}; // common practice, no source
constexpr std::array<double, 4> kShareBands = {0.10, 0.25, 0.40, 0.60}; // our choice

// Okabe & Ito (2008): low sky blue, shoulder yellow, peak vermillion.
QColor seasonColour(cb::SeasonClass c) {
  switch (c) {
  case cb::SeasonClass::Low: return QColor(0x56, 0xB4, 0xE9);
  case cb::SeasonClass::Shoulder: return QColor(0xF0, 0xE4, 0x42);
  case cb::SeasonClass::Peak: return QColor(0xD5, 0x5E, 0x00);
  }
  return {};
}
QString seasonLetter(cb::SeasonClass c) {
  return c == cb::SeasonClass::Peak       ? QStringLiteral("P")
         : c == cb::SeasonClass::Shoulder ? QStringLiteral("S")
                                          : QStringLiteral("L");
}

int bandOf(double v, const std::array<double, 4> &bands) {
  int b = 0;
  while (b < 4 && v >= bands[static_cast<std::size_t>(b)] - 1e-12)
    ++b;
  return b;
}

QString pct(double v) { return QString::number(std::lround(v * 100.0)); }

QString rangeLabels(const std::array<double, 4> &bands, int b) {
  if (b == 0)
    return QStringLiteral("under %1 %").arg(pct(bands[0]));
  if (b == 4)
    return QStringLiteral("%1 % or more").arg(pct(bands[3]));
  return QStringLiteral("%1–%2 %").arg(pct(bands[static_cast<std::size_t>(b - 1)]),
                                       pct(bands[static_cast<std::size_t>(b)]));
}

} // namespace

YearMapData computeYearMap(const WorkbenchSession &session, int year) {
  const cb::Property &property = session.property();
  YearMapData out;
  out.year = year;
  out.asOf = session.readingDate();
  out.bands = property.settings.seasons;
  const cb::Date jan1 = cb::Date::fromYmd(year, 1, 1), dec31 = cb::Date::fromYmd(year, 12, 31);

  std::optional<cb::Date> dataStart;
  for (const auto &r : session.reservations())
    if (!r.isDayUse() && (!dataStart || r.arrival < *dataStart))
      dataStart = r.arrival;

  // Finals and actuals of every night (future cells read unknown), by segment.
  cb::CubeOptions co;
  co.firstNight = jan1;
  co.lastNight = dec31;
  co.maxDba = 0;
  co.by = cb::SeriesBy::Segment;
  co.asOf = out.asOf;
  const cb::CurveCube cube = cb::CurveCube::build(session.reservations(), co);
  for (std::size_t i = 1; i < cube.series().size(); ++i) {
    out.segments.push_back(cube.series()[i]);
    QString label = qs(cube.series()[i]);
    for (const cb::Segment &s : session.segments())
      if (s.code == cube.series()[i] && !s.name.empty())
        label = QStringLiteral("%1 (%2)").arg(qs(s.name), qs(s.code));
    out.segmentLabels.push_back(label.toStdString());
  }

  for (cb::Date s = jan1; s <= dec31; ++s) {
    YearMapNight n;
    n.night = s;
    n.capacity = property.capacityOn(s);
    n.past = s <= out.asOf;
    n.segmentRooms.assign(out.segments.size(), std::nullopt);
    for (const auto &e : session.events())
      if (e.from <= s && s <= e.to)
        n.event += (n.event.empty() ? "" : "; ") + e.label;
    if (n.past && dataStart && s >= *dataStart) {
      n.final = cube.final(0, s);
      if (auto a = cube.actual(0, s))
        n.rooms = *a;
      for (std::size_t i = 0; i < out.segments.size(); ++i)
        if (auto a = cube.actual(i + 1, s))
          n.segmentRooms[i] = *a;
    }
    out.nights.push_back(std::move(n));
  }

  // Future nights of the year: the outlook (hotel) and a forecast run by segment, both with the
  // outlook's default method and the property's history setting (as the Horizon).
  const int days = std::min(365, dec31 - out.asOf);
  if (days >= 1) {
    cb::OutlookOptions o;
    o.asOf = out.asOf;
    o.days = days;
    const cb::Outlook outlook = cb::computeOutlook(session.reservations(), property,
                                                   session.censorSources(), session.events(), o);
    out.method = outlook.method;
    for (const cb::OutlookNight &on : outlook.nights) {
      if (on.night < jan1 || on.night > dec31)
        continue;
      YearMapNight &n = out.nights[static_cast<std::size_t>(on.night - jan1)];
      n.rooms = on.forecast;
      n.otb = on.otb;
      n.lo = on.lo;
      n.hi = on.hi;
    }
    cb::ForecastRequest r;
    r.asOf = out.asOf;
    r.horizon = days;
    r.method = o.method;
    r.by = cb::SeriesBy::Segment;
    r.methodOptions = o.methodOptions;
    r.unconstrain = cb::historyOptions(property);
    if (r.unconstrain)
      r.censoring = &session.censorSources();
    const cb::ForecastRun run = cb::ForecastRun::compute(session.reservations(), property, r);
    std::map<std::string, std::size_t> index;
    for (std::size_t i = 0; i < out.segments.size(); ++i)
      index[out.segments[i]] = i;
    for (const cb::ForecastValue &v : run.values) {
      auto it = index.find(v.series);
      if (it == index.end() || v.night < jan1 || v.night > dec31)
        continue;
      out.nights[static_cast<std::size_t>(v.night - jan1)].segmentRooms[it->second] = v.forecast;
    }
  }
  for (YearMapNight &n : out.nights)
    if (n.rooms)
      n.season = cb::classifySeason(*n.rooms, n.capacity, out.bands);
  return out;
}

std::optional<double> segmentShare(const YearMapNight &n, std::size_t segment) {
  if (segment >= n.segmentRooms.size() || !n.segmentRooms[segment] || !n.rooms || *n.rooms <= 0)
    return std::nullopt;
  return *n.segmentRooms[segment] / *n.rooms;
}

YearMapCell yearMapCell(const YearMapData &data, std::size_t night, YearMapColouring colouring,
                        std::size_t segment) {
  const YearMapNight &n = data.nights.at(night);
  YearMapCell c;
  c.fill = QColor(0xE0, 0xE0, 0xE0); // no figure: light grey, no text
  c.ink = QColor(0x55, 0x55, 0x55);
  std::optional<double> value;
  switch (colouring) {
  case YearMapColouring::Season:
    if (n.season) {
      c.band = static_cast<int>(*n.season);
      c.text = seasonLetter(*n.season);
      c.fill = seasonColour(*n.season);
      c.ink = *n.season == cb::SeasonClass::Peak ? Qt::white : Qt::black;
    }
    return c;
  case YearMapColouring::Demand:
    if (n.rooms && n.capacity > 0)
      value = *n.rooms / n.capacity;
    break;
  case YearMapColouring::SegmentShare: value = segmentShare(n, segment); break;
  }
  if (!value)
    return c;
  c.band = bandOf(*value, colouring == YearMapColouring::Demand ? kDemandBands : kShareBands);
  c.fill = kBlues[static_cast<std::size_t>(c.band)];
  c.ink = c.band >= 3 ? Qt::white : Qt::black;
  c.text = pct(*value);
  return c;
}

std::vector<YearMapLegendEntry> yearMapLegend(const YearMapData &data, YearMapColouring colouring) {
  std::vector<YearMapLegendEntry> out;
  if (colouring == YearMapColouring::Season) {
    const QString shoulder = pct(data.bands.shoulderFrom), peak = pct(data.bands.peakFrom);
    const std::pair<cb::SeasonClass, QString> classes[] = {
        {cb::SeasonClass::Low, QStringLiteral("Low: under %1 % of capacity").arg(shoulder)},
        {cb::SeasonClass::Shoulder, QStringLiteral("Shoulder: %1–%2 %").arg(shoulder, peak)},
        {cb::SeasonClass::Peak, QStringLiteral("Peak: %1 % or more").arg(peak)}};
    for (const auto &[c, label] : classes)
      out.push_back({label, seasonLetter(c), seasonColour(c),
                     c == cb::SeasonClass::Peak ? QColor(Qt::white) : QColor(Qt::black)});
    return out;
  }
  const auto &bands = colouring == YearMapColouring::Demand ? kDemandBands : kShareBands;
  for (int b = 0; b < 5; ++b)
    out.push_back({rangeLabels(bands, b), QStringLiteral("%"), kBlues[static_cast<std::size_t>(b)],
                   b >= 3 ? QColor(Qt::white) : QColor(Qt::black)});
  return out;
}

QString yearMapTip(const YearMapData &data, std::size_t night, std::optional<std::size_t> segment) {
  const YearMapNight &n = data.nights.at(night);
  const QDate date(n.night.year(), static_cast<int>(n.night.month()),
                   static_cast<int>(n.night.day()));
  QStringList lines;
  lines << QLocale().toString(date, QStringLiteral("dddd d MMMM yyyy")) +
               (n.event.empty() ? QString() : QStringLiteral(" — ") + qs(n.event));
  auto rooms = [](double v) { return qs(cb::formatCount(std::llround(v))); };
  if (!n.rooms) {
    lines << (n.past ? QStringLiteral("No data for this night")
                     : QStringLiteral("Beyond the forecast"));
  } else if (n.past) {
    lines << QStringLiteral("Actual: %1 rooms (final %2)")
                 .arg(rooms(*n.rooms), n.final ? rooms(*n.final) : QStringLiteral("–"));
  } else {
    QString band = n.lo && n.hi
                       ? QStringLiteral(", 80 % band %1–%2").arg(rooms(*n.lo), rooms(*n.hi))
                       : QString();
    lines << QStringLiteral("Forecast: %1 rooms%2 · on the books %3")
                 .arg(rooms(*n.rooms), band, n.otb ? rooms(*n.otb) : QStringLiteral("–"));
  }
  lines << QStringLiteral("Capacity: %1 rooms").arg(rooms(n.capacity));
  if (n.rooms && n.capacity > 0)
    lines << QStringLiteral("Demand / capacity: %1 · season %2")
                 .arg(qs(cb::formatPercent(*n.rooms / n.capacity, 0)),
                      n.season ? qs(std::string(cb::seasonName(*n.season))) : QString());
  if (segment && *segment < data.segments.size()) {
    const auto &r = n.segmentRooms[*segment];
    const auto share = segmentShare(n, *segment);
    lines << QStringLiteral("%1: %2 rooms%3")
                 .arg(
                     qs(data.segmentLabels[*segment]), r ? rooms(*r) : QStringLiteral("–"),
                     share
                         ? QStringLiteral(", %1 of the hotel").arg(qs(cb::formatPercent(*share, 0)))
                         : QString());
  }
  lines << (n.past ? QStringLiteral("(actuals: the night is past)")
                   : QStringLiteral("(forecast as of %1, method %2)")
                         .arg(qs(data.asOf.toIso()), qs(data.method)));
  lines << QStringLiteral("Click to open it in Date Study");
  return lines.join(QLatin1Char('\n'));
}

std::unique_ptr<QStandardItemModel> yearMapTable(const YearMapData &data) {
  auto num = [](const auto &v, int decimals) {
    return v ? QString::number(static_cast<double>(*v), 'f', decimals) : QString();
  };
  QStringList head{QStringLiteral("night"),       QStringLiteral("weekday"),
                   QStringLiteral("past"),        QStringLiteral("rooms"),
                   QStringLiteral("final"),       QStringLiteral("otb"),
                   QStringLiteral("forecast_lo"), QStringLiteral("forecast_hi"),
                   QStringLiteral("capacity"),    QStringLiteral("demand_over_capacity"),
                   QStringLiteral("season"),      QStringLiteral("event")};
  const qsizetype numbersFrom = 2, numbersTo = 9; // past … demand_over_capacity
  for (const auto &s : data.segments)
    head << QStringLiteral("rooms_") + qs(s);
  auto table = std::make_unique<QStandardItemModel>(static_cast<int>(data.nights.size()),
                                                    static_cast<int>(head.size()));
  table->setHorizontalHeaderLabels(head);
  int row = 0;
  for (const YearMapNight &n : data.nights) {
    const QString ratio =
        n.rooms && n.capacity > 0 ? QString::number(*n.rooms / n.capacity, 'f', 4) : QString();
    QStringList cells{
        qs(n.night.toIso()),
        QLocale::c().dayName(static_cast<int>(n.night.isoWeekday()), QLocale::ShortFormat),
        n.past ? QStringLiteral("1") : QStringLiteral("0"),
        num(n.rooms, 2),
        num(n.final, 0),
        num(n.otb, 0),
        num(n.lo, 2),
        num(n.hi, 2),
        QString::number(n.capacity),
        ratio,
        n.season ? qs(std::string(cb::seasonName(*n.season))) : QString(),
        qs(n.event)};
    for (const auto &r : n.segmentRooms)
      cells << num(r, 2);
    for (qsizetype c = 0; c < cells.size(); ++c) {
      auto *item = new QStandardItem(cells[c]);
      // Numbers (and blanks) export as numbers; night, weekday, season and event as text.
      if ((c >= numbersFrom && c <= numbersTo) || c >= 12)
        item->setData(cells[c], kCsvValueRole);
      table->setItem(row, static_cast<int>(c), item);
    }
    ++row;
  }
  return table;
}

QString yearMapCsv(const YearMapData &data) { return tableToCsv(*yearMapTable(data)); }

} // namespace cbui
