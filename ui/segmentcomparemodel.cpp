// Segment Compare's model layer: see segmentcomparemodel.h.
#include "ui/segmentcomparemodel.h"

#include "ui/csvexport.h"
#include "ui/workbenchsession.h"

#include "core/curvecube.h"
#include "core/holidaymap.h"
#include "core/textformat.h"

#include <algorithm>
#include <cmath>
#include <stdexcept>

namespace cbui {
namespace {

QString qs(const std::string &s) { return QString::fromStdString(s); }

// Okabe & Ito (2008), for segments without a colour of their own (black for the hotel).
const QColor kOkabeIto[] = {QColor(0x00, 0x72, 0xB2), QColor(0xE6, 0x9F, 0x00),
                            QColor(0x00, 0x9E, 0x73), QColor(0xCC, 0x79, 0xA7),
                            QColor(0x56, 0xB4, 0xE9), QColor(0xD5, 0x5E, 0x00),
                            QColor(0xF0, 0xE4, 0x42)};

// Mean over nights of OTB(s, s − d) where every night's cell is known, and Σ OTB / Σ Final over
// nights with a final.
void fillCurves(const cb::CurveCube &cube, std::size_t si, const std::vector<cb::Date> &nights,
                int maxDba, std::vector<std::optional<double>> &rooms,
                std::vector<std::optional<double>> &share) {
  rooms.assign(static_cast<std::size_t>(maxDba) + 1, std::nullopt);
  share.assign(static_cast<std::size_t>(maxDba) + 1, std::nullopt);
  long finals = 0;
  std::vector<cb::Date> withFinal;
  for (cb::Date s : nights)
    if (auto f = cube.final(si, s)) {
      finals += *f;
      withFinal.push_back(s);
    }
  for (int d = 0; d <= maxDba; ++d) {
    long sum = 0;
    int n = 0;
    for (cb::Date s : nights)
      if (cube.known(s, d)) {
        sum += cube.otbRooms(si, s, d);
        ++n;
      }
    const auto i = static_cast<std::size_t>(d);
    if (n == static_cast<int>(nights.size())) // every night known: one set of nights per lead
      rooms[i] = static_cast<double>(sum) / n;
    if (finals > 0) {
      long onBooks = 0;
      for (cb::Date s : withFinal)
        onBooks += cube.otbRooms(si, s, d);
      share[i] = static_cast<double>(onBooks) / static_cast<double>(finals);
    }
  }
}

} // namespace

SegmentCompareData computeSegmentCompare(const WorkbenchSession &session, cb::Date first,
                                         cb::Date last, int maxDba) {
  if (first > last)
    throw std::invalid_argument("the first night " + first.toIso() + " is after the last " +
                                last.toIso());
  if (last - first >= 92)
    throw std::invalid_argument("choose at most 92 nights");
  if (maxDba < 1 || maxDba > 365)
    throw std::invalid_argument("days before arrival must be 1 … 365");
  const cb::Property &property = session.property();
  SegmentCompareData out;
  out.asOf = session.readingDate();
  out.first = first;
  out.last = last;
  out.maxDba = maxDba;
  out.nights = last - first + 1;
  out.currency = property.currency;

  const cb::HolidayMap holidays = cb::HolidayMap::fromEvents(session.events());
  std::vector<cb::Date> nights;
  cb::CubeOptions co;
  co.firstNight = first;
  co.lastNight = last;
  for (cb::Date s = first; s <= last; ++s) {
    nights.push_back(s);
    out.lastYearNights.push_back(holidays.referenceNight(property, s));
    co.firstNight = std::min(co.firstNight, out.lastYearNights.back());
  }
  co.maxDba = maxDba;
  co.by = cb::SeriesBy::Segment;
  co.asOf = out.asOf;
  const cb::CurveCube cube = cb::CurveCube::build(session.reservations(), co);

  // Booking window: this period's arrivals when it is over, else last year's comparable ones.
  out.windowFromLastYear = last > out.asOf;
  cb::BookingWindowOptions bw;
  bw.asOf = out.asOf;
  bw.firstArrival = out.windowFromLastYear
                        ? *std::min_element(out.lastYearNights.begin(), out.lastYearNights.end())
                        : first;
  bw.lastArrival = out.windowFromLastYear
                       ? *std::max_element(out.lastYearNights.begin(), out.lastYearNights.end())
                       : last;
  bw.by = cb::SeriesBy::Segment;
  const std::vector<cb::BookingWindowStats> window = cb::bookingWindow(session.reservations(), bw);

  std::optional<cb::Date> dataStart;
  for (const auto &r : session.reservations())
    if (!r.isDayUse() && (!dataStart || r.arrival < *dataStart))
      dataStart = r.arrival;

  for (std::size_t si = 0; si < cube.series().size(); ++si) {
    SegmentCompareSeries s;
    s.code = cube.series()[si];
    if (si == 0) {
      s.label = QStringLiteral("Hotel total");
      s.colour = QColor(0x33, 0x33, 0x33);
    } else {
      s.label = qs(s.code);
      s.colour = kOkabeIto[(si - 1) % std::size(kOkabeIto)];
      for (const cb::Segment &seg : session.segments())
        if (seg.code == s.code) {
          if (!seg.name.empty())
            s.label = QStringLiteral("%1 (%2)").arg(qs(seg.name), qs(seg.code));
          if (QColor c(qs(seg.colour)); !seg.colour.empty() && c.isValid())
            s.colour = c;
        }
    }
    fillCurves(cube, si, nights, maxDba, s.rooms, s.share);
    fillCurves(cube, si, out.lastYearNights, maxDba, s.lastYearRooms, s.lastYearShare);

    // The table: OTB now (lead of each night at the reading date, 0 for past nights) and the
    // comparable night's OTB at the same lead; averages per night.
    long now = 0, stly = 0, finalsNow = 0, finalsLy = 0;
    bool stlyKnown = true, allFinal = true, lyFinal = true;
    for (std::size_t i = 0; i < nights.size(); ++i) {
      const int lead = std::clamp(nights[i] - out.asOf, 0, maxDba);
      now += cube.otbRooms(si, nights[i], lead);
      const cb::Date ly = out.lastYearNights[i];
      if (dataStart && ly >= *dataStart)
        stly += cube.otbRooms(si, ly, lead);
      else
        stlyKnown = false;
      if (auto f = cube.final(si, nights[i]))
        finalsNow += *f;
      else
        allFinal = false;
      if (auto f = cube.final(si, ly); f && dataStart && ly >= *dataStart)
        finalsLy += *f;
      else
        lyFinal = false;
    }
    const double n = static_cast<double>(nights.size());
    s.otbNow = static_cast<double>(now) / n;
    if (stlyKnown)
      s.stlyOtb = static_cast<double>(stly) / n;
    if (allFinal)
      s.finalNow = static_cast<double>(finalsNow) / n;
    if (lyFinal)
      s.lastYearFinal = static_cast<double>(finalsLy) / n;

    for (const cb::BookingWindowStats &w : window)
      if (w.series == s.code) {
        s.windowRoomNights = w.roomNights;
        for (std::size_t b = 0; b < cb::kLeadBuckets.size(); ++b) {
          s.windowShare[b] = w.roomNights > 0 ? static_cast<double>(w.histogram[b]) /
                                                    static_cast<double>(w.roomNights)
                                              : 0.0;
          s.rateByLead[b] = w.averageRate[b];
        }
      }
    out.series.push_back(std::move(s));
  }
  return out;
}

SegmentCompareTable::SegmentCompareTable(QObject *parent) : QAbstractTableModel(parent) {}

void SegmentCompareTable::setData(const SegmentCompareData &data) {
  beginResetModel();
  rows_ = data.series;
  nights_ = data.nights;
  endResetModel();
}

int SegmentCompareTable::rowCount(const QModelIndex &parent) const {
  return parent.isValid() ? 0 : static_cast<int>(rows_.size());
}
int SegmentCompareTable::columnCount(const QModelIndex &parent) const {
  return parent.isValid() ? 0 : ColumnCount;
}

QVariant SegmentCompareTable::data(const QModelIndex &index, int role) const {
  if (!index.isValid() || index.row() >= rowCount())
    return {};
  const SegmentCompareSeries &r = rows_[static_cast<std::size_t>(index.row())];
  const double hotel = rows_.front().otbNow;
  std::optional<double> v;
  switch (index.column()) {
  case OtbNow: v = r.otbNow; break;
  case Stly: v = r.stlyOtb; break;
  case VsStly:
    if (r.stlyOtb)
      v = r.otbNow - *r.stlyOtb;
    break;
  case FinalNow: v = r.finalNow; break;
  case FinalLastYear: v = r.lastYearFinal; break;
  case ShareOfHotel:
    if (hotel > 0)
      v = r.otbNow / hotel;
    break;
  default: break;
  }
  const int decimals = nights_ > 1 ? 1 : 0; // averages over a period carry one decimal
  switch (role) {
  case Qt::DisplayRole:
    if (index.column() == Segment)
      return r.label;
    if (!v)
      return QString();
    if (index.column() == ShareOfHotel)
      return qs(cb::formatPercent(*v, 0));
    return (index.column() == VsStly && *v > 0 ? QStringLiteral("+") : QString()) +
           QString::number(*v, 'f', decimals);
  case kCsvValueRole:
    if (index.column() == Segment)
      return qs(r.code);
    return v ? QVariant(*v) : QVariant(QString());
  case Qt::ToolTipRole: return index.column() == Segment ? QVariant(r.label) : QVariant();
  case Qt::DecorationRole: return index.column() == Segment ? QVariant(r.colour) : QVariant();
  case Qt::TextAlignmentRole:
    return index.column() == Segment ? QVariant((Qt::AlignLeft | Qt::AlignVCenter).toInt())
                                     : QVariant((Qt::AlignRight | Qt::AlignVCenter).toInt());
  default: return {};
  }
}

QVariant SegmentCompareTable::headerData(int section, Qt::Orientation orientation, int role) const {
  if (orientation != Qt::Horizontal || section < 0 || section >= ColumnCount)
    return {};
  // Short names so the table fits beside the chart at 1366 px; the tooltips say the rest.
  static const char *const names[] = {"Segment", "OTB",      "STLY OTB", "vs STLY",
                                      "Final",   "LY final", "Share"};
  static const char *const tips[] = {
      "Segment (hotel total first)",
      "Rooms on the books per night at the reading date (average over the nights chosen)",
      "Rooms on the books for last year's comparable nights at the same days before arrival",
      "OTB now less STLY OTB",
      "Final rooms per night (only when every night chosen is past)",
      "Final rooms per night of last year's comparable nights",
      "The segment's share of the hotel's rooms on the books now"};
  if (role == Qt::DisplayRole)
    return QString::fromUtf8(names[section]);
  if (role == Qt::ToolTipRole)
    return QString::fromUtf8(tips[section]);
  return {};
}

} // namespace cbui
