// Segment Compare's model layer (brief section 7): the booking curves of every segment for one
// night or a period of nights (average per night), in rooms and in share of final, by days before
// arrival, with last year's comparable nights (the property's STLY alignment and holiday pairs);
// each segment's booking window and average rate by lead bucket; and a this-year-vs-last-year
// table. Everything comes from core (curve cube by segment, booking window); no widgets, so it is
// tested headless.
#pragma once

#include "core/bookingwindow.h"
#include "core/date.h"

#include <QAbstractTableModel>
#include <QColor>
#include <QString>

#include <array>
#include <optional>
#include <string>
#include <vector>

// No Q_OBJECT here: the table model adds no signals or slots, and moc of Qt 6.4 need not read it.
namespace cbui {

class WorkbenchSession;

/// One segment (or the hotel, code "ALL") over the chosen nights.
struct SegmentCompareSeries {
  std::string code;
  QString label; ///< "Corporate negotiated (CORP)"
  QColor colour; ///< the segment's own colour, else Okabe–Ito by position
  /// Curves by days before arrival, index d = 0 … maxDba. Rooms: mean over the nights, where
  /// every night's cell is known at the reading date (so one curve never mixes two sets of
  /// nights); nullopt otherwise. Share: Σ OTB(s, s − d) / Σ Final(s)
  /// over the nights whose final is known (and Σ Final > 0); nullopt otherwise.
  std::vector<std::optional<double>> rooms, share;
  std::vector<std::optional<double>> lastYearRooms, lastYearShare; ///< same, last year's nights
  /// Booking window of the arrivals used (see SegmentCompareData::windowFromLastYear): share of
  /// the segment's room-nights and average rate per lead bucket (kLeadBuckets).
  std::array<double, cb::kLeadBuckets.size()> windowShare{};
  std::array<std::optional<double>, cb::kLeadBuckets.size()> rateByLead{};
  std::int64_t windowRoomNights = 0;
  /// The table: average rooms per night on the books now, at the same lead last year, and finals.
  double otbNow = 0;
  std::optional<double> stlyOtb;  ///< nullopt before the data starts
  std::optional<double> finalNow; ///< when every chosen night is on or before the reading date
  std::optional<double> lastYearFinal;
};

struct SegmentCompareData {
  cb::Date asOf, first, last; ///< reading date, nights first … last (inclusive)
  int maxDba = 90;
  int nights = 0;
  std::vector<cb::Date> lastYearNights; ///< the comparable night of each chosen night
  /// True when some chosen night is after the reading date: the booking window and rates are then
  /// those of last year's comparable arrivals (this period's short-lead bookings have not come
  /// yet).
  bool windowFromLastYear = false;
  std::string currency;
  std::vector<SegmentCompareSeries> series; ///< "ALL" (the hotel) first, then each segment
};

/// Computes Segment Compare for nights first … last as of the session's reading date. Throws
/// std::invalid_argument for first > last, a period over 92 nights or maxDba outside 1 … 365, and
/// what core throws. Thread-safe for a session not changed meanwhile.
SegmentCompareData computeSegmentCompare(const WorkbenchSession &session, cb::Date first,
                                         cb::Date last, int maxDba);

/// The this-year-vs-last-year table, one row per series (hotel first).
class SegmentCompareTable : public QAbstractTableModel {
public:
  enum Column { Segment, OtbNow, Stly, VsStly, FinalNow, FinalLastYear, ShareOfHotel, ColumnCount };
  explicit SegmentCompareTable(QObject *parent = nullptr);
  void setData(const SegmentCompareData &data);
  int rowCount(const QModelIndex &parent = {}) const override;
  int columnCount(const QModelIndex &parent = {}) const override;
  QVariant data(const QModelIndex &index, int role = Qt::DisplayRole) const override;
  QVariant headerData(int section, Qt::Orientation orientation,
                      int role = Qt::DisplayRole) const override;

private:
  std::vector<SegmentCompareSeries> rows_;
  int nights_ = 0;
};

} // namespace cbui
