// Pickup (advanced-booking) forecast methods: pickup-add, pickup-adv, pickup-mult, pace-extrap
// (brief section 5). They read only a ForecastContext, so nothing dated after the reading date t
// can reach them. Notation: s the night forecast, h = s − t the lead, OTB(s, x) the rooms on the
// books for s at the end of day x, r the reference nights (core/referencenights.h).
//
// - pickup-add: F = OTB(s,t) + mean_r [Final(r) − OTB(r, r − h)] over references r ≤ t.
// - pickup-adv: F = OTB(s,t) + Σ_{j=0}^{h−1} mean_{r ∈ R_j} [OTB(r, r − j) − OTB(r, r − j − 1)],
//   where R_j are the references chosen among the nights r ≤ t + j (r − j ≤ t: the increment
//   from j + 1 to j days before arrival is already observed). With recent references R_j holds
//   the N newest same-weekday nights up to t + j, so every increment j ≥ 1 may come from nights
//   that have not arrived by t (at weekly references, once h ≥ 8); when every R_j is the same
//   set of arrived nights the chain telescopes to pickup-add.
// - pickup-mult: F = OTB(s,t) × Σ_r Final(r) / Σ_r OTB(r, r − h) (references as pickup-add);
//   pickup-add when Σ_r OTB(r, r − h) = 0.
// - pace-extrap: F = OTB(s,t) + h × (OTB(s,t) − OTB(s, t − w)) / w, w = options.paceWindow.
//
// Every forecast is max(0, F). It is nullopt when a reference set is empty or OTB(s,t) is not in
// the cube (s outside its nights, or h > maxDba: the cube's earliest reading of s is s − maxDba,
// after t). Leads in the reference terms are clamped to maxDba; for pace-extrap, when
// t − w < s − maxDba the earlier reading is clamped to s − maxDba (w shrinks to maxDba − h, and
// F = OTB(s,t) when that is 0). For a night already arrived (s ≤ t) every method returns Final(s).
#pragma once

#include "core/forecastmethod.h"

namespace cb {

/// The pickup method called `name`, or nullptr when the name is not one of them. Throws
/// MethodError for invalid options (references < 1, seasonalWeeks outside 0 … 26,
/// paceWindow < 1).
std::unique_ptr<ForecastMethod> makePickupMethod(std::string_view name,
                                                 const MethodOptions &options);

} // namespace cb
