// The Group offer screen's model layer (no widgets): an offer as the editor holds it (arrival,
// rooms per night, one rate, other revenue and cost per room-night), its checks, and the
// displacement verdict per night from core (cb::displacementFromData, the same call and options
// as `curvebench displace`), laid out as the table the screen shows and exports.
#pragma once

#include "core/displacement.h"
#include "core/finding.h"
#include "ui/workbenchsession.h"

#include <QString>

#include <string>
#include <vector>

class QStandardItemModel;

namespace cbui {

struct GroupOffer {
  std::string name;
  cb::Date arrival;
  std::vector<int> rooms;  ///< rooms of each night from arrival on; the stay is rooms.size() nights
  double rate = 0;         ///< group rate per room-night
  double otherRevenue = 0; ///< per room-night: meals, meeting rooms
  double cost = 0;         ///< per room-night: commission, amenities, complimentary rooms

  int nights() const { return static_cast<int>(rooms.size()); }
  cb::Date departure() const { return arrival + nights(); }
  /// The offer as core takes it: one OfferNight per night, the same rate and extras on each.
  std::vector<cb::OfferNight> offerNights() const;
};

/// Longest stay the editor takes, and how far ahead an offer may start (the forecast behind the
/// check runs from the reading date to the night after the offer).
inline constexpr int kMaxOfferNights = 30;
inline constexpr int kMaxOfferDaysAhead = 730;

/// Empty when `offer` can be checked as of `asOf`; else what is wrong, in the screen's words:
/// no nights, a night with fewer than 1 room, the first night on or before the reading date, a
/// first night more than kMaxOfferDaysAhead days ahead, a negative rate, other revenue or cost.
QString checkGroupOffer(const GroupOffer &offer, cb::Date asOf);

/// The offer the editor starts with: three nights from the first Thursday four weeks or more
/// after the session's reading date, 20 rooms a night, at the transient ADR of the last 365
/// nights (cb::transientAdr) rounded to a whole amount, no other revenue or cost.
GroupOffer startingOffer(const WorkbenchSession &session);

/// Blocks already held on one night (the split forecast's group figures).
struct GroupsHeld {
  int blocked = 0;  ///< rooms blocked (every block, tentative included)
  int pickedUp = 0; ///< block rooms on the books at the reading date
};

struct GroupOfferResult {
  GroupOffer offer;
  cb::Date asOf;
  std::string method;   ///< transient forecast method
  std::string currency; ///< the property's
  cb::Displacement displacement;
  std::vector<GroupsHeld> held; ///< one per displacement night
  bool cancelled = false;
  QString error; ///< not empty: no result (the offer's check, or what went wrong)
  bool ok() const { return error.isEmpty() && !cancelled; }
};

/// Checks the offer, then runs cb::displacementFromData on the session's reservations, the
/// store's blocks (read from the session's store file), closures, denials and events, as of the
/// session's reading date with default cb::OutlookOptions (the CLI's defaults). Slow for a far-out
/// offer (the forecast covers every night up to it): run it off the UI thread. `progress` is
/// the forecast's (done, total); returning false cancels (result.cancelled).
GroupOfferResult evaluateGroupOffer(const WorkbenchSession &session, const GroupOffer &offer,
                                    cb::ProgressFn progress = nullptr, void *context = nullptr);

/// A night's verdict: "Group pays" / "Group does not pay" on an offer night (net > 0
/// or not), "Shoulder: loses" / "Shoulder: no loss" on a shoulder night — `curvebench displace`'s
/// verdicts in the screen's words.
QString nightVerdict(const cb::DisplacementNight &n);
/// The whole offer's verdict, one sentence starting in lower case ("the group brings more …").
QString offerVerdict(const cb::Displacement &d);
/// Totals line: group value, displaced transient value, net (money with currency).
QString offerTotals(const GroupOfferResult &r);
/// "Break-even group rate: EUR 47.33 per room-night …", or a note when there is none.
QString breakEvenText(const GroupOfferResult &r);

enum GroupOfferColumn {
  ColNight,
  ColWeekday,
  ColKind,
  ColCapacity,
  ColOtb,
  ColGroupsHeld,
  ColTransientMean,
  ColTransientSd,
  ColOffered,
  ColDisplaced,
  ColTransientRate,
  ColDisplacedValue,
  ColGroupValue,
  ColNet,
  ColVerdict,
  ColNotes,
  GroupOfferColumnCount
};

/// Fills `table` with one row per night (shoulder nights included, type "shoulder", their rows
/// italic on a grey background; offer nights type "offer"), money with thousands separators and the
/// currency in the headers; each number cell carries its plain value in kCsvValueRole for the
/// CSV/XLSX export. Clears it for a result that is not ok().
void fillGroupOfferTable(QStandardItemModel &table, const GroupOfferResult &r);

} // namespace cbui
