// Year Map's model layer (brief section 7): every night of one calendar year with its figure —
// actual rooms for nights up to the reading date, the forecast (cb::computeOutlook, default method)
// after it — for the hotel and each segment, and how a night is coloured: by season class (the
// property's bands), by demand over capacity, or, for a segment, by its share of the hotel's rooms.
// Widget-free, so it is tested headless.
#pragma once

#include "core/date.h"
#include "core/reservation.h"
#include "core/seasons.h"

#include <QColor>
#include <QString>

class QStandardItemModel;

#include <memory>
#include <optional>
#include <string>
#include <vector>

namespace cbui {

class WorkbenchSession;

struct YearMapNight {
  cb::Date night;
  int capacity = 0;
  bool past = false; ///< on or before the reading date: the figures are actuals
  /// Hotel rooms: actual (finals less no-shows) for a past night, the unconstrained forecast for
  /// a future one; nullopt before the data starts or beyond the forecast.
  std::optional<double> rooms;
  std::optional<int> final;              ///< past nights
  std::optional<int> otb;                ///< future nights: on the books at the reading date
  std::optional<double> lo, hi;          ///< future nights: the forecast's 80 % band
  std::optional<cb::SeasonClass> season; ///< rooms / capacity with the property's bands
  /// Rooms per segment (same order as YearMapData::segments): actuals, or the segment forecast.
  std::vector<std::optional<double>> segmentRooms;
  std::string event;
};

struct YearMapData {
  int year = 0;
  cb::Date asOf;
  cb::SeasonBands bands;
  std::string method; ///< the forecast method of the future nights
  std::vector<std::string> segments, segmentLabels;
  std::vector<YearMapNight> nights; ///< 1 January … 31 December, every night
};

/// Computes the map of `year` as of the session's reading date: a curve cube by segment for the
/// past nights; for the future ones cb::computeOutlook (default method, as the Horizon) for the
/// hotel and a forecast run by segment with the same method and history. Slow (forecasts up to
/// 365 nights): call off the UI thread. Throws what core throws.
YearMapData computeYearMap(const WorkbenchSession &session, int year);

enum class YearMapColouring { Season, Demand, SegmentShare };

/// How one night is drawn: its band (index into the legend; -1 = no figure), the short text in
/// the cell (season letter or a percentage, so classes read without colour) and the colours.
struct YearMapCell {
  int band = -1;
  QString text;
  QColor fill, ink;
};
struct YearMapLegendEntry {
  QString label;
  QString text; ///< what such a cell shows ("P", "%")
  QColor fill, ink;
};

/// `segment` = index into data.segments for SegmentShare (ignored otherwise). Season: L / S / P on
/// Okabe–Ito sky blue / yellow / vermillion. Demand (rooms / capacity, bands 50 / 70 / 90 / 100 %,
/// common practice, no source) and segment share (segment rooms / hotel rooms, bands 10 / 25 / 40
/// / 60 %, our choice): five steps of the ColorBrewer "Blues" sequential scheme (Brewer 2003,
/// colour-blind safe), the percentage written in the cell.
YearMapCell yearMapCell(const YearMapData &data, std::size_t night, YearMapColouring colouring,
                        std::size_t segment = 0);
std::vector<YearMapLegendEntry> yearMapLegend(const YearMapData &data, YearMapColouring colouring);
/// The share (0 … 1) that SegmentShare colours: segment rooms / hotel rooms; nullopt without both.
std::optional<double> segmentShare(const YearMapNight &n, std::size_t segment);
/// The hover text of a night: date, actual or forecast, capacity, demand / capacity, season, and
/// the segment's rooms and share when `segment` is given.
QString yearMapTip(const YearMapData &data, std::size_t night, std::optional<std::size_t> segment);
/// Every night of the map as a table: night, weekday, past, rooms (actual or forecast), final,
/// OTB, band, capacity, demand / capacity, season, event, then rooms per segment; each number's
/// plain text in kCsvValueRole, so the CSV and XLSX exports (tableexport.h) carry numbers.
std::unique_ptr<QStandardItemModel> yearMapTable(const YearMapData &data);
/// yearMapTable as CSV text (one header line).
QString yearMapCsv(const YearMapData &data);

} // namespace cbui
