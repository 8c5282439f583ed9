// Forecasts split into group and transient (issue 7): group rooms from the blocks (the group
// model's expected rooms), transient demand from the ordinary methods trained on transient
// history only (reservations without a block id), total = group + transient with the transient
// band, and constrained figures on the capacity left after groups.
#pragma once

#include "core/blockrecord.h"
#include "core/groupmodel.h"
#include "core/outlook.h"

#include <optional>
#include <string>
#include <vector>

namespace cb {

struct SplitNight {
  Date night;
  int lead = 0;
  int capacity = 0;
  // Group: from the blocks.
  int groupBlocked = 0; ///< rooms blocked on the night (all blocks, tentative included)
  int groupOtb = 0;     ///< block rooms on the books
  double group = 0;     ///< expected group rooms (GroupModel::expectedRooms)
  // Transient: the outlook of the transient reservations alone.
  int transientOtb = 0;
  double transient = 0;         ///< unconstrained transient demand, mean
  std::optional<double> lo, hi; ///< transient 80 % band
  double transientSd = 0;
  // Total and capacity.
  double total = 0;                       ///< group + transient
  std::optional<double> totalLo, totalHi; ///< group + the transient band
  double capacityLeft = 0;                ///< max(0, capacity − group)
  double transientConstrained = 0;        ///< E[min(D, capacity left)]
  double transientSpill = 0;              ///< E[(D − capacity left)+]
  double pSellout = 0;                    ///< P(D ≥ capacity left)
  double constrainedTotal = 0;            ///< min(group, capacity) + transient constrained
  double transientAdr = 0;                ///< the transient outlook's ADR for the night
};

struct SplitForecast {
  Date asOf;
  std::string method;
  double tentativeProbability = 0;
  std::vector<SplitNight> nights;
};

/// Rows without a block id (transient business).
std::vector<Reservation> transientRows(const std::vector<Reservation> &reservations);

/// The property as transient business saw it: on each past night (up to asOf) the capacity is
/// reduced by the group rooms that stayed, so that unconstraining the transient history treats a
/// night that groups and transient filled together as censored at what groups left. Nights
/// after asOf keep their capacity.
Property transientProperty(const Property &property, const GroupModel &model,
                           const std::vector<Reservation> &reservations, Date asOf);

/// Fills capacityLeft and the constrained figures of `n` from its capacity, group, transient and
/// transientSd (D ~ Normal(transient, transientSd), as the outlook). Capacity left 0: nothing
/// transient sells (constrained 0, spill = transient, pSellout 1).
void fillSplitCapacity(SplitNight &n);

/// The split forecast of nights asOf + 1 … asOf + options.days. The transient part is
/// computeOutlook() on transientRows() and transientProperty() with `options` (its method, band
/// and ADR); the group part
/// is the model's expected rooms with the property's tentative probability. A night the
/// transient outlook leaves out is left out here too. Throws as computeOutlook.
SplitForecast computeSplitForecast(const std::vector<Reservation> &reservations,
                                   const std::vector<BlockRecord> &blocks, const Property &property,
                                   const CensorSources &sources,
                                   const std::vector<EventNote> &events,
                                   const OutlookOptions &options);

/// Expected group rooms at a fixed lead against the group rooms that stayed, over past nights
/// from … to (each night read at night − lead, the wash measured from blocks departed by then,
/// only blocks contracted by then known). A backtest of the group model.
struct GroupBacktest {
  int lead = 0;
  int nights = 0;
  double meanActual = 0, meanExpected = 0;
  double mae = 0;  ///< mean |expected − actual|
  double bias = 0; ///< mean (expected − actual)
  /// Two plain rules for comparison: the whole remaining block until the cutoff (no wash), and
  /// the rooms picked up only.
  double maeWholeBlock = 0, biasWholeBlock = 0;
  double maePickedUp = 0, biasPickedUp = 0;
};
GroupBacktest backtestGroups(const std::vector<Reservation> &reservations,
                             const std::vector<BlockRecord> &blocks, Date from, Date to, int lead,
                             double tentativeProbability);

} // namespace cb
