#include "ui/horizonmodel.h"

#include "ui/csvexport.h"

#include "core/forecastrun.h"
#include "core/holidaymap.h"
#include "core/outlook.h"
#include "core/seasons.h"
#include "core/textformat.h"
#include "ui/workbenchsession.h"

#include <QBrush>
#include <QColor>
#include <QLocale>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <stdexcept>

namespace cbui {
namespace {

QDate toQDate(cb::Date d) {
  return QDate(d.year(), static_cast<int>(d.month()), static_cast<int>(d.day()));
}
QString qs(const std::string &s) { return QString::fromStdString(s); }
QString rooms(double v) { return qs(cb::formatCount(std::llround(v))); }
QString signedRooms(int v) { return v > 0 ? QStringLiteral("+") + rooms(v) : rooms(v); }

// The outlook's own choice (core/outlook.cpp requestFor), repeated for the forecast by segment.
cb::ForecastRequest segmentRequest(const WorkbenchSession &session, const cb::OutlookOptions &o) {
  const cb::Property &p = session.property();
  cb::ForecastRequest r;
  r.asOf = o.asOf;
  r.horizon = o.days;
  r.method = o.method;
  r.by = cb::SeriesBy::Segment;
  r.methodOptions = o.methodOptions;
  r.bounds = o.bounds;
  if (p.settings.unconstrainHistory) {
    auto m = cb::parseUnconstrainMethod(p.settings.unconstrainMethod);
    if (!m)
      throw std::invalid_argument("unknown unconstraining method \"" +
                                  p.settings.unconstrainMethod + "\" in the property's settings");
    cb::UnconstrainOptions u;
    u.method = *m;
    u.seasons = p.settings.seasons;
    r.unconstrain = u;
    r.censoring = &session.censorSources();
  }
  return r;
}

std::string eventsOn(const std::vector<cb::EventNote> &events, cb::Date night) {
  std::string out;
  for (const auto &e : events)
    if (e.from <= night && night <= e.to)
      out += (out.empty() ? "" : "; ") + e.label;
  return out;
}

} // namespace

HorizonData computeHorizon(const WorkbenchSession &session, int days, const std::string &segment,
                           std::shared_ptr<const cb::CurveCube> cube) {
  const cb::Property &property = session.property();
  cb::OutlookOptions o;
  o.asOf = session.readingDate();
  o.days = days;
  o.bounds = session.bounds();
  o.cube = cube;
  HorizonData out;
  out.asOf = toQDate(o.asOf);
  out.segment = qs(segment);
  out.currency = qs(property.currency);

  // OTB, pickup and STLY of each night from its own reservations (the session's night index; at
  // a large property a cube of every reservation took longer than the rest of the figures):
  // OTB(s, t) at t = the reading date, the day before and a week before, and the STLY night's
  // OTB at the same lead — the cells of a curve cube as of the reading date.
  const cb::HolidayMap holidays = cb::HolidayMap::fromEvents(session.events());
  const std::vector<cb::Reservation> &reservations = session.reservations();
  auto otbRooms = [&](cb::Date night, cb::Date reading) {
    int rooms = 0;
    for (std::uint32_t k : session.nightIndex().covering(night)) {
      const cb::Reservation &r = reservations[k];
      if (r.bookedOn <= o.asOf && (segment.empty() || r.segment == segment) &&
          r.onBooks(night, reading))
        rooms += r.rooms;
    }
    return rooms;
  };
  // A segment with no booking up to the reading date has no figures (a cube has no such series).
  const bool known =
      segment.empty() || std::any_of(reservations.begin(), reservations.end(), [&](const auto &r) {
        return r.segment == segment && r.bookedOn <= o.asOf;
      });
  const std::optional<cb::Date> dataStart = session.nightIndex().firstNight();

  auto fillOtb = [&](HorizonRow &row, cb::Date night, int lead) {
    if (!known)
      return;
    const cb::Date reading = night - lead;
    row.otb = otbRooms(night, reading);
    row.pickup1 = row.otb - otbRooms(night, reading - 1);
    row.pickup7 = row.otb - otbRooms(night, reading - 7);
    const cb::Date stly = holidays.referenceNight(property, night);
    if (dataStart && stly >= *dataStart)
      row.stlyOtb = otbRooms(stly, stly - lead);
  };

  if (segment.empty()) {
    const cb::Outlook outlook = cb::computeOutlook(session.reservations(), property,
                                                   session.censorSources(), session.events(), o);
    out.method = qs(outlook.method);
    out.cube = outlook.cube;
    for (const cb::OutlookNight &n : outlook.nights) {
      HorizonRow row;
      row.night = toQDate(n.night);
      row.lead = n.lead;
      row.event = qs(n.event);
      row.capacity = n.capacity;
      fillOtb(row, n.night, n.lead);
      row.otb = n.otb; // the outlook's own figures win (they are the same cells)
      row.stlyOtb = n.stlyOtb;
      row.forecast = n.forecast;
      row.lo = n.lo;
      row.hi = n.hi;
      row.constrained = n.constrained;
      row.occupancy = n.occupancy;
      row.adr = n.adr;
      row.pSellout = n.pSellout;
      row.season = qs(std::string(cb::seasonName(n.season)));
      for (const auto &f : n.flags)
        row.flags << qs(f);
      out.rows.push_back(std::move(row));
    }
    return out;
  }

  cb::ForecastRequest request = segmentRequest(session, o);
  request.series = segment; // this segment's values only, the same as in a run of all of them
  request.keepCube = true;
  request.cube = std::move(cube);
  const cb::ForecastRun run = cb::ForecastRun::compute(session.reservations(), property, request);
  out.method = qs(o.method);
  out.cube = run.cube;
  for (const cb::ForecastValue &v : run.values) {
    if (v.series != segment)
      continue;
    HorizonRow row;
    row.night = toQDate(v.night);
    row.lead = v.lead;
    row.event = qs(eventsOn(session.events(), v.night));
    row.capacity = property.capacityOn(v.night);
    fillOtb(row, v.night, v.lead);
    row.forecast = v.forecast;
    row.lo = v.lo;
    row.hi = v.hi;
    out.rows.push_back(std::move(row));
  }
  return out;
}

HorizonModel::HorizonModel(QObject *parent) : QAbstractTableModel(parent) {}

void HorizonModel::setData(HorizonData data) {
  beginResetModel();
  data_ = std::move(data);
  endResetModel();
}

int HorizonModel::rowCount(const QModelIndex &parent) const {
  return parent.isValid() ? 0 : static_cast<int>(data_.rows.size());
}

int HorizonModel::columnCount(const QModelIndex &parent) const {
  return parent.isValid() ? 0 : ColumnCount;
}

QVariant HorizonModel::display(const HorizonRow &r, int column) const {
  auto opt = [](const auto &v, auto f) { return v ? f(*v) : QString(); };
  switch (column) {
  case Night: {
    QString text = QLocale().toString(r.night, QStringLiteral("ddd d MMM yyyy"));
    return r.event.isEmpty() ? text : text + QStringLiteral("  ★ ") + r.event;
  }
  case Otb: return rooms(r.otb);
  case Pickup1: return signedRooms(r.pickup1);
  case Pickup7: return signedRooms(r.pickup7);
  case Stly: return opt(r.stlyOtb, [](int v) { return rooms(v); });
  case VsStly: return opt(r.stlyOtb, [&](int v) { return signedRooms(r.otb - v); });
  case Forecast: return rooms(r.forecast);
  case Band: return r.lo && r.hi ? rooms(*r.lo) + QStringLiteral("–") + rooms(*r.hi) : QString();
  case Constrained: return opt(r.constrained, [](double v) { return rooms(v); });
  case Occupancy: return opt(r.occupancy, [](double v) { return qs(cb::formatPercent(v, 0)); });
  case Adr:
    return opt(r.adr,
               [&](double v) { return qs(cb::formatMoney(v, data_.currency.toStdString())); });
  case Sellout: // "< 1 %" rather than a "0 %" that reads as impossible
    return opt(r.pSellout, [](double v) {
      return v > 0 && v < 0.005 ? QStringLiteral("< 1 %") : qs(cb::formatPercent(v, 0));
    });
  case Season: return r.season;
  case Flags: return r.flags.join(QStringLiteral(", "));
  default: return {};
  }
}

QVariant HorizonModel::sortValue(const HorizonRow &r, int column) const {
  auto opt = [](const auto &v) { return v ? QVariant(static_cast<double>(*v)) : QVariant(-1e300); };
  switch (column) {
  case Night: return r.night;
  case Otb: return r.otb;
  case Pickup1: return r.pickup1;
  case Pickup7: return r.pickup7;
  case Stly: return opt(r.stlyOtb);
  case VsStly: return r.stlyOtb ? QVariant(r.otb - *r.stlyOtb) : QVariant(-1e300);
  case Forecast: return r.forecast;
  case Band: return r.lo && r.hi ? QVariant(*r.hi - *r.lo) : QVariant(-1e300);
  case Constrained: return opt(r.constrained);
  case Occupancy: return opt(r.occupancy);
  case Adr: return opt(r.adr);
  case Sellout: return opt(r.pSellout);
  case Season: // low < shoulder < peak
    return r.season == QLatin1String("peak") ? 2 : r.season == QLatin1String("shoulder") ? 1 : 0;
  case Flags: return r.flags.join(QStringLiteral(", "));
  default: return {};
  }
}

QVariant HorizonModel::exportValue(const HorizonRow &r, int column) const {
  // Plain numbers for a spreadsheet export (tableToXlsx writes them as numbers; shares as
  // fractions); the other columns export their text.
  auto opt = [](const auto &v, int decimals) {
    return v ? QVariant(QString::number(static_cast<double>(*v), 'f', decimals)) : QVariant();
  };
  switch (column) {
  case Otb: return r.otb;
  case Pickup1: return r.pickup1;
  case Pickup7: return r.pickup7;
  case Stly: return opt(r.stlyOtb, 0);
  case VsStly: return r.stlyOtb ? QVariant(r.otb - *r.stlyOtb) : QVariant();
  case Forecast: return QString::number(r.forecast, 'f', 2);
  case Constrained: return opt(r.constrained, 2);
  case Occupancy: return opt(r.occupancy, 4);
  case Adr: return opt(r.adr, 2);
  case Sellout: return opt(r.pSellout, 4);
  default: return {};
  }
}

QVariant HorizonModel::data(const QModelIndex &index, int role) const {
  if (!index.isValid() || index.row() >= rowCount())
    return {};
  const HorizonRow &r = row(index.row());
  const int c = index.column();
  const bool hotelLevel =
      c == Constrained || c == Occupancy || c == Adr || c == Sellout || c == Season || c == Flags;
  switch (role) {
  case Qt::DisplayRole: return display(r, c);
  case kSortRole: return sortValue(r, c);
  case kCsvValueRole: return exportValue(r, c);
  case kNightRole: return r.night;
  case Qt::TextAlignmentRole:
    return c == Night || c == Season || c == Flags
               ? QVariant((Qt::AlignLeft | Qt::AlignVCenter).toInt())
               : QVariant((Qt::AlignRight | Qt::AlignVCenter).toInt());
  case Qt::ToolTipRole:
    if (!data_.segment.isEmpty() && hotelLevel)
      return QStringLiteral("Hotel-level figure: capacity is shared by every segment, so it is "
                            "shown for Hotel total only.");
    if (c == Night)
      return QStringLiteral("%1 days ahead; capacity %2 rooms%3")
          .arg(r.lead)
          .arg(rooms(r.capacity), r.event.isEmpty() ? QString() : QStringLiteral("\n") + r.event);
    if (c == Stly || c == VsStly)
      return QStringLiteral("Same time last year: the comparable night last year, at the same "
                            "number of days before arrival");
    return {};
  case Qt::ForegroundRole:
    if ((c == VsStly && r.stlyOtb && r.otb < *r.stlyOtb) || (c == Pickup1 && r.pickup1 < 0) ||
        (c == Pickup7 && r.pickup7 < 0))
      return QBrush(QColor(0xD5, 0x5E, 0x00)); // Okabe–Ito vermillion: behind / lost rooms
    return {};
  default: return {};
  }
}

QString HorizonModel::toCsv() const {
  auto quote = [](const QString &t) { return csvField(t); }; // formula injection neutralised
  auto num = [](const auto &v, int decimals) {
    return v ? QString::number(static_cast<double>(*v), 'f', decimals) : QString();
  };
  QString out = QStringLiteral("night,weekday,event,lead,capacity,otb,pickup_1d,pickup_7d,"
                               "stly_otb,otb_vs_stly,forecast,forecast_lo,forecast_hi,"
                               "constrained,occupancy,adr,sellout_probability,season,flags\n");
  for (const HorizonRow &r : data_.rows) {
    const std::optional<double> forecast = r.forecast;
    QStringList cells{r.night.toString(Qt::ISODate),
                      QLocale::c().toString(r.night, QStringLiteral("ddd")),
                      quote(r.event),
                      QString::number(r.lead),
                      QString::number(r.capacity),
                      QString::number(r.otb),
                      QString::number(r.pickup1),
                      QString::number(r.pickup7),
                      num(r.stlyOtb, 0),
                      r.stlyOtb ? QString::number(r.otb - *r.stlyOtb) : QString(),
                      num(forecast, 2),
                      num(r.lo, 2),
                      num(r.hi, 2),
                      num(r.constrained, 2),
                      num(r.occupancy, 4),
                      num(r.adr, 2),
                      num(r.pSellout, 4),
                      r.season,
                      quote(r.flags.join(QStringLiteral("; ")))};
    out += cells.join(QLatin1Char(',')) + QLatin1Char('\n');
  }
  return out;
}

QVariant HorizonModel::headerData(int section, Qt::Orientation orientation, int role) const {
  if (orientation != Qt::Horizontal)
    return {};
  static const char *const names[] = {
      "Night",       "OTB",         "Pickup 1 d", "Pickup 7 d", "STLY OTB", "vs STLY", "Forecast",
      "Band (80 %)", "Constrained", "Occupancy",  "ADR",        "Sell-out", "Season",  "Flags"};
  static const char *const tips[] = {
      "Night of stay, weekday and any event note",
      "Rooms on the books at the reading date",
      "Rooms picked up since the day before (net of cancellations)",
      "Rooms picked up over the last 7 days (net of cancellations)",
      "Rooms on the books for the comparable night last year, same days before arrival",
      "OTB less STLY OTB",
      "Unconstrained demand forecast (rooms), as if capacity were unlimited",
      "80 % band of the forecast, from backtest errors at this lead",
      "Expected rooms sold given capacity: E[min(demand, capacity)]",
      "Constrained forecast / capacity",
      "Forecast average daily rate",
      "Probability that demand reaches capacity",
      "Season class from forecast demand / capacity",
      "Pace far from last year, likely sell-out, weak night, full, minimum stay"};
  if (section < 0 || section >= ColumnCount)
    return {};
  if (role == Qt::DisplayRole)
    return QString::fromUtf8(names[section]);
  if (role == Qt::ToolTipRole)
    return QString::fromUtf8(tips[section]);
  return {};
}

} // namespace cbui
