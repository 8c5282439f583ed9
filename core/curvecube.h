// The curve cube: OTB(s, s − d) for every stay night s in a range, every days-before-arrival
// d = 0 … D and every series (the total, or one per segment / channel / room type), in rooms and
// revenue — built in one pass over the reservations (brief section 4).
#pragma once

#include "core/reservation.h"

#include <cstdint>
#include <memory_resource>
#include <optional>
#include <span>
#include <stdexcept>
#include <string>
#include <string_view>
#include <vector>

namespace cb {

enum class SeriesBy { Total, Segment, Channel, RoomType };

/// "total", "segment", "channel", "room-type" (CLI spelling).
std::string_view seriesByName(SeriesBy by);
std::optional<SeriesBy> parseSeriesBy(std::string_view name);

struct CubeOptions {
  Date firstNight;
  Date lastNight;   ///< inclusive
  int maxDba = 365; ///< D: the cell at d = D holds everything booked D or more days ahead
  SeriesBy by = SeriesBy::Total;
  /// Reading date T: the data as it stood at the end of T. Cells whose reading date s − d is
  /// after T are unknown; finals and actuals are known only for nights s ≤ T. nullopt = the
  /// newest booking or cancellation date in the reservations.
  std::optional<Date> asOf;
  /// newestActivity(reservations) when the caller knows it (saves a pass over them); it must be
  /// that of the reservations given.
  std::optional<Date> newest = std::nullopt;
};

/// Thrown when a reading date is after the newest activity in the data, or options are invalid.
class AsOfError : public std::invalid_argument {
public:
  using std::invalid_argument::invalid_argument;
};

/// The newest booked_on or cancelled_on among the reservations (the latest valid reading date).
std::optional<Date> newestActivity(const std::vector<Reservation> &reservations);

/// What several steps need to know of the reservations as a whole, found in one pass (a pass
/// over a million reservations is tens of milliseconds: each is a few cache lines apart).
struct ReservationBounds {
  std::optional<Date> newest;       ///< newestActivity()
  std::optional<Date> firstArrival; ///< the earliest arrival of any reservation
  std::optional<Date> firstStay;    ///< the earliest arrival of one that stays a night
  std::optional<Date> lastStay;     ///< the last night any reservation stays (departure − 1)
};
ReservationBounds boundsOf(const std::vector<Reservation> &reservations);

ReservationBounds boundsOf(std::span<const ReservationFacts> rows);

class CurveCube {
public:
  /// Builds the cube. Throws AsOfError when options.asOf is after newestActivity(reservations)
  /// ("reading date 2026-11-05 is after the newest booking or cancellation in the data
  /// (2026-10-31)"), when there are no reservations at all, the night range is empty, maxDba < 0,
  /// or the cube would exceed 250 million cells. Day uses never count; rows booked after the
  /// reading date are ignored. Example:
  /// `auto cube = CurveCube::build(rows, {first, last, 90, SeriesBy::Segment, std::nullopt});`
  /// `cube.otbRooms(*cube.seriesIndex("CORP"), night, 14)` = corporate rooms 14 days out.
  static CurveCube build(const std::vector<Reservation> &reservations, const CubeOptions &options);
  /// The same cube from the facts of the same reservations, for the total only (options.by must
  /// be SeriesBy::Total, else std::invalid_argument): a split needs the codes.
  static CurveCube buildTotal(std::span<const ReservationFacts> rows, const CubeOptions &options);

  /// What a caller knows of the reservations outside this cube's nights. Empty: build() would
  /// give 0 in every cell outside them, because no reservation stays a night before
  /// firstNight(), and none after lastNight() unless that night is after asOf() + maxDba() (so
  /// unknown at every lead this cube has). A cube over every night stayed is such a cube.
  enum class Outside { Unknown, Empty };
  /// True when narrowed(options, outside) gives the cube build() would give for `options` from
  /// the reservations this cube was built from: the same series kind; a reading date
  /// (options.asOf, which must be set) no later than this cube's; leads 0 … D with D no more than
  /// this cube's; and nights within this cube's (any nights when `outside` is Empty).
  bool canNarrowTo(const CubeOptions &options, Outside outside = Outside::Unknown) const;
  /// The options this cube was built with (its nights, leads, series kind and reading date).
  CubeOptions options() const { return {first_, last_, maxDba_, by_, asOf_}; }
  /// The cube build(reservations, options) gives (requires canNarrowTo(options, outside), else
  /// std::invalid_argument), made from this cube's cells instead of the reservations: a cell read
  /// on or before the earlier reading date counts the same rows in both cubes (a row booked or
  /// cancelled later reaches only cells read later), the cells read after it become unknown (0),
  /// a split keeps the series booked by then, and a cell at lead d is OTB(s, s − d) whatever the
  /// longest lead (the last lead holds everything booked that far ahead or more, which is that
  /// same figure). A screen that moves the reading date back keeps one cube as of the newest date
  /// and narrows it: a copy of the cells instead of a pass over every reservation; the command
  /// line narrows the cube kept beside the store (core/keptcube.h).
  CurveCube narrowed(const CubeOptions &options, Outside outside = Outside::Unknown) const;

  Date firstNight() const { return first_; }
  Date lastNight() const { return last_; }
  int nights() const { return nights_; }
  int maxDba() const { return maxDba_; }
  Date asOf() const { return asOf_; }
  SeriesBy by() const { return by_; }
  /// Series names: {"ALL"} for the total, else the codes sorted (empty code shown as "(none)").
  /// Series 0 is always "ALL" (the total) when by != Total too, followed by the split.
  const std::vector<std::string> &series() const { return series_; }
  std::optional<std::size_t> seriesIndex(const std::string &name) const;

  /// True when the cell's reading date s − d is on or before asOf().
  bool known(Date night, int dba) const { return night - dba <= asOf_; }
  /// OTB(s, s − d) in rooms; requires series < series().size(), firstNight ≤ s ≤ lastNight and
  /// 0 ≤ d ≤ maxDba (else std::out_of_range). Unknown cells (see known()) read 0.
  int otbRooms(std::size_t series, Date night, int dba) const {
    return rooms_[cell(series, night, dba)];
  }
  /// Revenue on the books (rate × rooms), same cells; exact to 1e-6 of the currency unit.
  double otbRevenue(std::size_t series, Date night, int dba) const;
  /// The same revenue as it is summed: in millionths of the currency unit (exact).
  std::int64_t otbRevenueMicros(std::size_t series, Date night, int dba) const {
    return revenue_[cell(series, night, dba)];
  }
  /// Final(s) = OTB(s, s); nullopt when s is after asOf().
  std::optional<int> final(std::size_t series, Date night) const {
    const std::size_t k = cell(series, night, 0);
    if (night > asOf_)
      return std::nullopt;
    return rooms_[k];
  }
  /// Actual(s) = Final(s) less no-show rooms; nullopt when s is after asOf().
  std::optional<int> actual(std::size_t series, Date night) const;

private:
  // Inline: the forecast methods and the unconstraining read cells in their innermost loops.
  std::size_t cell(std::size_t series, Date night, int dba) const {
    if (series >= series_.size() || night < first_ || night > last_ || dba < 0 || dba > maxDba_)
      outOfRange(series, night, dba);
    return (series * static_cast<std::size_t>(nights_) + static_cast<std::size_t>(night - first_)) *
               (static_cast<std::size_t>(maxDba_) + 1) +
           static_cast<std::size_t>(dba);
  }
  [[noreturn]] void outOfRange(std::size_t series, Date night, int dba) const;
  /// build() and buildTotal(), over either kind of row (defined and used in curvecube.cpp only).
  template <class Rows> static CurveCube buildFrom(const Rows &rows, const CubeOptions &options);
  Date first_, last_, asOf_;
  int nights_ = 0, maxDba_ = 0;
  SeriesBy by_ = SeriesBy::Total;
  std::vector<std::string> series_;
  /// Per series, the earliest booked_on among its rows (for narrowed(); unused for "ALL").
  std::vector<Date> firstBooked_;
  /// A no-show row booked after a night it covers (invalid data, but build() takes it): its
  /// no-show rooms count for that night only from its booking date on, which the cells do not
  /// record, so such a cube is not narrowed.
  bool lateNoShow_ = false;
  /// Where the large arrays live (see curvecube.cpp: large blocks on huge pages).
  static std::pmr::memory_resource *bigBlocks();
  friend class KeptCubeCodec; // core/keptcube.cpp: the cube's cells to a file and back
  std::pmr::vector<std::int32_t> rooms_{bigBlocks()};   ///< [series][night][dba]
  std::pmr::vector<std::int64_t> revenue_{bigBlocks()}; ///< same layout, in millionths
  std::vector<std::int32_t> noShow_;                    ///< [series][night] no-show rooms
};

} // namespace cb
