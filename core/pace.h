// Pace: a night's rooms on the books now against the same lead last year (brief section 4, STLY).
#pragma once

#include "core/curvecube.h"
#include "core/holidaymap.h"
#include "core/reservation.h"

#include <optional>
#include <string>
#include <vector>

namespace cb {

/// Pace of one night and series as of reading date t, at lead h = s − t.
struct PaceCell {
  Date night;
  int dba = 0;         ///< h = night − asOf
  int otb = 0;         ///< OTB(s, t)
  Date stlyNight;      ///< s': the holiday map's pair, else Property::stlyNight(s)
  bool paired = false; ///< true when s' comes from the holiday map
  /// OTB(s', s' − h); nullopt when that reading date is after t (a pair to a recent night).
  std::optional<int> stlyOtb;
  std::optional<int> diffRooms; ///< otb − stlyOtb
  /// 100 × (otb − stlyOtb) / stlyOtb. Undefined, so nullopt, when stlyOtb is 0 (or unknown):
  /// any rooms against none is no percentage at all.
  std::optional<double> diffPct;
  bool operator==(const PaceCell &) const = default;
};

struct PaceOptions {
  Date asOf;       ///< reading date t
  Date firstNight; ///< nights compared, firstNight … lastNight, each on or after asOf
  Date lastNight;
  SeriesBy by = SeriesBy::Total;
};

/// Pace of a range of nights for the total and each series, read from one curve cube that holds
/// both this year's nights and the nights they compare with.
class Pace {
public:
  /// Builds the cube it needs (reference nights … lastNight, leads 0 … lastNight − asOf).
  /// Throws AsOfError when asOf is after the newest booking or cancellation, and
  /// std::invalid_argument when the range is empty or starts before asOf.
  static Pace build(const std::vector<Reservation> &reservations, const Property &property,
                    const HolidayMap &holidays, const PaceOptions &options);
  /// Reads from a cube built by the caller; the pace is as of cube.asOf(). Throws
  /// std::out_of_range when the cube lacks a night or lead needed.
  static Pace fromCube(const CurveCube &cube, const Property &property, const HolidayMap &holidays,
                       Date firstNight, Date lastNight);

  /// The cube's night range needed for `options` (earliest reference night … lastNight).
  static CubeOptions cubeOptionsFor(const Property &property, const HolidayMap &holidays,
                                    const PaceOptions &options);

  Date asOf() const { return asOf_; }
  Date firstNight() const { return first_; }
  Date lastNight() const { return first_ + nights_ - 1; }
  int nights() const { return nights_; }
  /// The cube's series: "ALL" first, then the split.
  const std::vector<std::string> &series() const { return series_; }
  /// Throws std::out_of_range outside the range.
  const PaceCell &at(std::size_t series, Date night) const;

private:
  Date asOf_, first_;
  int nights_ = 0;
  std::vector<std::string> series_;
  std::vector<PaceCell> cells_; ///< [series][night]
};

} // namespace cb
