// The Horizon's ui-side model: the figures of the next N nights (computed from core, off the UI
// thread, by computeHorizon) and a table model over them that sorts by the real values
// (kSortRole), testable without widgets.
#pragma once

#include "core/curvecube.h"

#include <QAbstractTableModel>
#include <QDate>
#include <QString>
#include <QStringList>

#include <memory>
#include <optional>
#include <string>
#include <vector>

// No Q_OBJECT here: the model adds no signals or slots, and moc of Qt 6.4 need not read it.
namespace cbui {

class WorkbenchSession;

/// One night of the Horizon. For a segment, the hotel-level figures (constrained, occupancy,
/// ADR, sell-out probability, season, flags) are left empty: capacity is shared by every segment.
struct HorizonRow {
  QDate night;
  int lead = 0;
  QString event;
  int capacity = 0;
  int otb = 0;
  int pickup1 = 0, pickup7 = 0; ///< OTB(s, t) − OTB(s, t − 1) and − OTB(s, t − 7)
  std::optional<int> stlyOtb;
  double forecast = 0;
  std::optional<double> lo, hi;
  std::optional<double> constrained, occupancy, adr, pSellout;
  QString season;
  QStringList flags;
};

struct HorizonData {
  QDate asOf;
  QString segment; ///< empty = all segments (the hotel)
  QString method;
  QString currency;
  std::vector<HorizonRow> rows;
  /// The curve cube the forecast read (by segment for a segment, else total): given back to
  /// computeHorizon for the same session data and reading date, the next segment (or the hotel
  /// again) skips building it.
  std::shared_ptr<const cb::CurveCube> cube;
};

/// The next `days` nights as of the session's reading date: cb::computeOutlook for the hotel;
/// for a segment its OTB, pickup and STLY from a curve cube by segment and its forecast from a
/// forecast run by segment (same method and history as the outlook). Thread-safe for a session
/// not being changed meanwhile. `cube`: HorizonData::cube of an earlier call over the same
/// reservations (used when it fits this call, else ignored). Throws what core throws.
HorizonData computeHorizon(const WorkbenchSession &session, int days, const std::string &segment,
                           std::shared_ptr<const cb::CurveCube> cube = {});

class HorizonModel : public QAbstractTableModel {
public:
  enum Column {
    Night,
    Otb,
    Pickup1,
    Pickup7,
    Stly,
    VsStly,
    Forecast,
    Band,
    Constrained,
    Occupancy,
    Adr,
    Sellout,
    Season,
    Flags,
    ColumnCount
  };
  /// The role that gives the real value to sort by (numbers, dates; empty cells sort first).
  static constexpr int kSortRole = Qt::UserRole;
  /// The night of a row (any column), as QDate.
  static constexpr int kNightRole = Qt::UserRole + 1;

  explicit HorizonModel(QObject *parent = nullptr);
  void setData(HorizonData data);
  const HorizonData &horizon() const { return data_; }
  const HorizonRow &row(int r) const { return data_.rows[static_cast<std::size_t>(r)]; }
  /// The rows as CSV for a spreadsheet: plain numbers (no separators, shares as fractions),
  /// ISO dates, empty cells for figures not available; one header line.
  QString toCsv() const;

  int rowCount(const QModelIndex &parent = {}) const override;
  int columnCount(const QModelIndex &parent = {}) const override;
  QVariant data(const QModelIndex &index, int role = Qt::DisplayRole) const override;
  QVariant headerData(int section, Qt::Orientation orientation,
                      int role = Qt::DisplayRole) const override;

private:
  QVariant display(const HorizonRow &r, int column) const;
  QVariant sortValue(const HorizonRow &r, int column) const;
  QVariant exportValue(const HorizonRow &r, int column) const;
  HorizonData data_;
};

} // namespace cbui
