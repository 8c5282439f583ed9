// Comparable nights: the reference nights a night is judged against, and the band their curves
// draw (brief section 7, Date Study).
#pragma once

#include "core/curvecube.h"
#include "core/holidaymap.h"
#include "core/nightindex.h"
#include "core/reservation.h"

#include <optional>
#include <string>
#include <vector>

namespace cb {

struct ComparableOptions {
  int weeks = 4;              ///< N: reference nights within ±N weeks
  bool excludeEvents = false; ///< leave out reference nights covered by an event
  double lowProbability = 0.1;
  double highProbability = 0.9;
  int maxDba = 365; ///< the band covers leads 0 … maxDba
};

/// The band of the reference curves at one lead: type-7 quantiles (core/quantile.h) across the
/// reference nights, in rooms and in % of each reference's final.
struct BandPoint {
  int dba = 0;
  int count = 0; ///< references in the rooms band
  std::optional<double> low, median, high;
  int countPct = 0; ///< references in the % band: those with a final above 0
  std::optional<double> lowPct, medianPct, highPct;
};

/// Reference nights of one night as of a reading date, and their curve band.
///
/// Selection: nights with the same weekday as `night` (a) this year, within ±N weeks of it, and
/// (b) last year, within ±N weeks of its STLY night — the holiday map's pair, else
/// Property::stlyNight, moved to the nearest night with the same weekday when the alignment is by
/// calendar date. Only nights on or before the reading date count (their finals are known, so
/// their curves are complete at every lead), never `night` itself, and, when asked, no night
/// covered by an event.
class ComparableNights {
public:
  /// The reference nights, sorted.
  static std::vector<Date> select(Date night, Date asOf, const Property &property,
                                  const HolidayMap &holidays, const std::vector<EventNote> &events,
                                  const ComparableOptions &options);
  /// Band of `series` from a cube holding the references at leads 0 … options.maxDba, as of
  /// cube.asOf(). Throws std::out_of_range when it does not.
  static ComparableNights fromCube(const CurveCube &cube, std::size_t series, Date night,
                                   const Property &property, const HolidayMap &holidays,
                                   const std::vector<EventNote> &events,
                                   const ComparableOptions &options);
  /// Builds the cube it needs. `series` is a name of the split chosen by `by` ("ALL" = total);
  /// a series with no booking known at the reading date has 0 rooms on every reference night
  /// (band 0, % band empty). Throws AsOfError when asOf is after
  /// the newest booking or cancellation; std::invalid_argument for weeks < 0, maxDba < 0 or
  /// probabilities outside [0, 1].
  static ComparableNights build(const std::vector<Reservation> &reservations, Date night, Date asOf,
                                const Property &property, const HolidayMap &holidays,
                                const std::vector<EventNote> &events,
                                const ComparableOptions &options, SeriesBy by = SeriesBy::Total,
                                const std::string &series = "ALL");

  /// The same result as build(), read from the reservations covering each reference night (a
  /// NightIndex over `reservations`) instead of a cube of every reservation: a few thousand rows
  /// instead of a million, for a screen that moves from night to night. `newest` is
  /// newestActivity(reservations) (a session knows it). Throws as build().
  static ComparableNights build(const std::vector<Reservation> &reservations,
                                const NightIndex &index, std::optional<Date> newest, Date night,
                                Date asOf, const Property &property, const HolidayMap &holidays,
                                const std::vector<EventNote> &events,
                                const ComparableOptions &options, SeriesBy by = SeriesBy::Total,
                                const std::string &series = "ALL");

  Date night() const { return night_; }
  const std::vector<Date> &references() const { return references_; }
  /// band()[d] is the band at lead d = 0 … maxDba.
  const std::vector<BandPoint> &band() const { return band_; }

private:
  Date night_;
  std::vector<Date> references_;
  std::vector<BandPoint> band_;
};

} // namespace cb
