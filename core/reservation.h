// The reservation record and the reference data of a property (brief section 3).
#pragma once

#include "core/date.h"

#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace cb {

enum class ReservationStatus { Booked, Cancelled, NoShow, CheckedOut };

/// Native names used in CSV files and the store: "booked", "cancelled", "no-show", "checked-out".
std::string_view statusName(ReservationStatus s);
std::optional<ReservationStatus> parseStatus(std::string_view name);

/// One room-booking. A row with rooms > 1 counts that many rooms on each night it covers.
/// nights = departure − arrival; 0 nights is a day use: kept, but it occupies no night.
struct Reservation {
  std::string id; ///< unique per property; a newer extract with the same id replaces the row
  ReservationStatus status = ReservationStatus::Booked;
  Date bookedOn;
  std::optional<Date> cancelledOn; ///< set exactly when status == Cancelled
  Date arrival;
  Date departure;
  int rooms = 1;
  std::string roomType;
  std::string segment;
  std::string channel;
  double rate = 0.0;    ///< per room-night, in `currency` (empty = the property's currency)
  std::string currency; ///< ISO 4217 code or empty
  std::string blockId;  ///< group block this booking belongs to, or empty

  int nights() const { return departure - arrival; }
  bool isDayUse() const { return nights() == 0; }
  /// Covers night s (arrival <= s < departure).
  bool covers(Date s) const { return arrival <= s && s < departure; }
  /// On the books for night s as of reading date t (brief section 4: OTB definition).
  bool onBooks(Date s, Date t) const {
    return covers(s) && bookedOn <= t && !(cancelledOn && *cancelledOn <= t);
  }
  bool operator==(const Reservation &) const = default;
};

/// What the total cube and the bounds read of a reservation: its dates, rooms, rate and status,
/// without its id and codes (40 bytes here against a Reservation's 232). A daily import hands the
/// kept cube (core/keptcube.h) a million of these, read from the snapshot's columns, instead of
/// a million reservations. The fields are the Reservation's, under the same names.
struct ReservationFacts {
  Date bookedOn;
  std::optional<Date> cancelledOn;
  Date arrival;
  Date departure;
  int rooms = 1;
  double rate = 0.0;
  ReservationStatus status = ReservationStatus::Booked;
  static ReservationFacts of(const Reservation &r) {
    return {r.bookedOn, r.cancelledOn, r.arrival, r.departure, r.rooms, r.rate, r.status};
  }
  bool isDayUse() const { return departure == arrival; }
};

/// Checks the rules every reservation must satisfy, whatever file it came from.
/// Returns an empty string when valid, else a message naming the field, e.g.
/// "departure 2026-01-01 is before arrival 2026-01-03". `fieldOut` receives the native
/// field name at fault so importers can point at a column.
std::string validateReservation(const Reservation &r, std::string *fieldOut = nullptr);

struct RoomType {
  std::string code;
  std::string name;
  int rooms = 0;
  bool operator==(const RoomType &) const = default;
};

struct Segment {
  std::string code;
  std::string name;
  int yieldRank = 0;  ///< 1 = highest-paying; 0 = not ranked yet
  std::string colour; ///< "#rrggbb" from the colour-blind-safe palette, or empty
  bool operator==(const Segment &) const = default;
};

struct Channel {
  std::string code;
  std::string name;
  bool operator==(const Channel &) const = default;
};

/// Capacity in force from `from` (inclusive) until the next change.
struct CapacityChange {
  Date from;
  int rooms = 0;
  std::string reason;
  bool operator==(const CapacityChange &) const = default;
};

enum class StlyAlignment { Weekday364, CalendarDate };

/// Bands that class a night by unconstrained demand over capacity (brief section 6): below
/// shoulderFrom is low, from shoulderFrom is shoulder, from peakFrom is peak. The defaults (70 %
/// and 90 %) are common practice, no single source.
struct SeasonBands {
  double shoulderFrom = 0.70;
  double peakFrom = 0.90;
  bool operator==(const SeasonBands &) const = default;
};

/// The property's decision settings (Property screen; stored with the property).
struct PropertySettings {
  SeasonBands seasons;
  /// Forecast methods train on unconstrained history (censored nights replaced by their
  /// unconstrained estimate), so sold-out nights do not teach that demand stopped at capacity.
  bool unconstrainHistory = true;
  std::string unconstrainMethod = "em"; ///< "em" (expectation–maximisation) or "pd" (projection)
  /// Cost of walking a guest (relocation, transport, goodwill), in the property's currency;
  /// 0 = not set (overbooking then needs it on the command line).
  double walkCost = 0;
  /// A cancellation made this many days or fewer before arrival counts as late (overbooking).
  int lateCancelDays = 2;
  /// Chance that a tentative group block becomes definite: its expected rooms count with this
  /// weight (core/groupforecast.h). 0.5, an even chance, is a placeholder with no source: the
  /// store cannot measure it (a block keeps only its latest status), so set your own.
  double tentativeProbability = 0.5;
  bool operator==(const PropertySettings &) const = default;
};

struct Property {
  std::string name;
  std::string currency = "EUR";
  int capacity = 0; ///< base capacity; dated changes override from their date on
  std::vector<CapacityChange> capacityChanges;
  StlyAlignment stly = StlyAlignment::Weekday364;
  double selloutMargin = 0.02; ///< a night within this share of capacity counts as sold out
  PropertySettings settings;
  /// Rooms available on night s: the latest change dated on or before s, else `capacity`.
  int capacityOn(Date s) const;
  /// The night last year that night s compares with (brief section 4, STLY): s − 364 days
  /// (same weekday) by default, or the same calendar date (29 February → 28 February).
  Date stlyNight(Date s) const;
};

enum class BlockStatus { Tentative, Definite };

struct GroupBlock {
  std::string id;
  std::string name;
  std::string segment;
  Date arrival;
  Date departure;
  int roomsPerNight = 0;
  Date cutoff;
  BlockStatus status = BlockStatus::Definite;
  bool operator==(const GroupBlock &) const = default;
};

enum class DenialKind { Denial, Regret };

/// A request the hotel turned away (denial) or a guest who declined (regret).
struct Denial {
  Date requestedOn;
  Date arrival;
  Date departure;
  int rooms = 1;
  std::string segment;
  DenialKind kind = DenialKind::Denial;
  bool operator==(const Denial &) const = default;
};

/// Sales of a night were closed (to one segment, or to everyone) from closedOn until reopenedOn
/// (exclusive; open-ended when empty). A closed night's final is censored demand.
struct SalesClosure {
  Date night;
  std::string segment; ///< empty = the whole hotel
  Date closedOn;
  std::optional<Date> reopenedOn;
  bool operator==(const SalesClosure &) const = default;
};

struct EventNote {
  Date from;
  Date to; ///< inclusive
  std::string label;
  bool operator==(const EventNote &) const = default;
};

} // namespace cb
