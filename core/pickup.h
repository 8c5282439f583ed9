// Pickup: how the rooms on the books for a night changed between two reading dates, net and
// split into gross bookings and cancellations (brief section 4).
#pragma once

#include "core/curvecube.h"
#include "core/reservation.h"

#include <optional>
#include <string>
#include <vector>

namespace cb {

/// Rooms picked up by one night over a window of reading dates (from, to].
/// net = OTB(s, to) − OTB(s, from) = gross − cancelled (always; a booking made and cancelled
/// inside the window counts in both gross and cancelled).
struct PickupSplit {
  int net = 0;
  int gross = 0;     ///< rooms of bookings made in (from, to] covering the night
  int cancelled = 0; ///< rooms of bookings cancelled in (from, to] covering the night
  PickupSplit &operator+=(const PickupSplit &o) {
    net += o.net;
    gross += o.gross;
    cancelled += o.cancelled;
    return *this;
  }
  PickupSplit &operator-=(const PickupSplit &o) {
    net -= o.net;
    gross -= o.gross;
    cancelled -= o.cancelled;
    return *this;
  }
  bool operator==(const PickupSplit &) const = default;
};

/// Reading dates (from, to]: `from` is the earlier reading, `to` the later one.
struct PickupWindow {
  Date from;
  Date to;
  /// The last `days` days up to `asOf`: (asOf − days, asOf].
  static PickupWindow lastDays(Date asOf, int days) { return {asOf - days, asOf}; }
  bool operator==(const PickupWindow &) const = default;
};

/// Pickup of night `s` from `from` to `to` straight from the reservations, optionally for one
/// series (`code` of the segment / channel / room type chosen by `by`; ignored for Total).
/// Day-use bookings never count. Throws std::invalid_argument unless from < to.
PickupSplit pickupOf(const std::vector<Reservation> &reservations, Date night, PickupWindow window,
                     SeriesBy by = SeriesBy::Total, const std::string &code = {});

struct PickupOptions {
  Date asOf; ///< reading date t; the summary covers nights s > t
  /// Windows to summarise, each with to ≤ asOf. Default: the last 1, 7 and 15 days.
  std::vector<PickupWindow> windows;
  SeriesBy by = SeriesBy::Total;
  /// Last night summarised; nullopt = the last night covered by a booking made on or before asOf.
  std::optional<Date> lastNight;
};

/// Pickup of every future night (asOf + 1 … lastNight) over several windows, for the total and
/// each series, built in one pass over the reservations (difference arrays over the nights).
class PickupSummary {
public:
  /// Throws AsOfError when options.asOf is after the newest booking or cancellation, and
  /// std::invalid_argument when a window is empty (from ≥ to) or ends after asOf.
  static PickupSummary build(const std::vector<Reservation> &reservations,
                             const PickupOptions &options);

  Date asOf() const { return asOf_; }
  Date firstNight() const { return asOf_ + 1; }
  Date lastNight() const { return asOf_ + nights_; }
  int nights() const { return nights_; }
  const std::vector<PickupWindow> &windows() const { return windows_; }
  /// "ALL" first, then the codes of the split among rows booked on or before asOf, sorted
  /// ("(none)" for an empty code): the same list as CurveCube::series().
  const std::vector<std::string> &series() const { return series_; }
  std::optional<std::size_t> seriesIndex(const std::string &name) const;

  /// Pickup of one night; throws std::out_of_range outside firstNight() … lastNight().
  PickupSplit at(std::size_t series, Date night, std::size_t window) const;
  /// Sum over every night of the summary.
  PickupSplit total(std::size_t series, std::size_t window) const;

private:
  std::size_t index(std::size_t series, std::size_t window, int nightOffset) const;
  Date asOf_;
  int nights_ = 0;
  std::vector<PickupWindow> windows_;
  std::vector<std::string> series_;
  std::vector<PickupSplit> cells_; ///< [series][window][night]
};

} // namespace cb
