// The outlook (brief section 6): for each future night, unconstrained demand (forecast and its
// spread from the backtest errors at that lead) against capacity — constrained rooms E[min(D, C)],
// spill E[(D − C)+], sell-out probability P(D ≥ C), occupancy, ADR and RevPAR forecasts, season
// class and flags — plus minimum-stay hints and per-segment protection for one night.
#pragma once

#include "core/curvecube.h"
#include "core/finding.h"
#include "core/forecastmethod.h"
#include "core/protection.h"
#include "core/seasons.h"
#include "core/unconstrain.h"

#include <memory>
#include <optional>
#include <string>
#include <vector>

namespace cb {

struct OutlookOptions {
  Date asOf;
  int days = 90;
  /// A method of methodNames() or "auto". The default is chosen for speed and accuracy on the
  /// sample and the open dataset (see outlook.cpp); "auto" backtests every method (slow).
  std::string method = "pickup-adv";
  MethodOptions methodOptions;
  /// Forecast from unconstrained history (default: the property's setting).
  std::optional<bool> unconstrained;
  double likelySellout = 0.5; ///< flag "sell-out likely" when P(D ≥ C) ≥ this
  double weakOccupancy = 0.5; ///< flag "weak" when constrained occupancy < this
  double paceAlert = 0.20;    ///< flag "pace" when |OTB − STLY OTB| / max(STLY OTB, 1) > this
  double minStayPeak = 0.7;   ///< a night with P(D ≥ C) ≥ this is a minimum-stay candidate …
  double minStayWeak = 0.75;  ///< … when a neighbour's constrained occupancy is below this
  int rateWindowDays = 28;    ///< nights whose pickup rates give the expected pickup rate
  /// boundsOf(reservations) when the caller knows them (saves passes over the reservations);
  /// they must be those of the reservations given.
  std::optional<ReservationBounds> bounds;
  /// Outlook::cube of an earlier outlook of the same reservations (see ForecastRequest::cube).
  std::shared_ptr<const CurveCube> cube;
  unsigned threads = 0;
  ProgressFn progress = nullptr;
  void *progressContext = nullptr;
};

/// One future night of the outlook (the total hotel).
struct OutlookNight {
  Date night;
  int lead = 0;
  int capacity = 0;
  int otb = 0;
  double otbRevenue = 0;
  std::optional<int> stlyOtb;   ///< OTB of the STLY night at the same lead (nullopt before data)
  double forecast = 0;          ///< unconstrained demand, mean
  std::optional<double> lo, hi; ///< its 80 % band
  double sd = 0;                ///< spread used for D (0 when no backtest errors)
  double constrained = 0, spill = 0, pSellout = 0;
  double occupancy = 0; ///< constrained / capacity
  double adr = 0;       ///< forecast ADR (see computeOutlook)
  double revpar = 0;    ///< constrained × ADR / capacity
  SeasonClass season = SeasonClass::Low;
  std::vector<std::string>
      flags;          ///< "full", "sell-out likely", "weak", "pace up", "pace down", "min stay"
  std::string method; ///< the method that made the forecast
  std::string event;  ///< event notes covering the night, joined by "; "
};

/// A peak night with a weak neighbour: a minimum stay would protect revenue (advisory).
struct MinStayHint {
  Date night;
  int minStay = 2;
  double pSellout = 0;
  std::optional<double> before, after; ///< neighbours' constrained occupancy (the evidence)
  std::string evidence;                ///< one plain sentence
};

struct Outlook {
  Date asOf;
  std::string method;
  bool unconstrained = true;
  std::vector<OutlookNight> nights;
  std::vector<MinStayHint> minStays;
  bool cancelled = false;
  /// The forecast run's curve cube, for the next outlook of the same reservations at the same
  /// reading date (OutlookOptions::cube).
  std::shared_ptr<const CurveCube> cube;
};

/// Computes the outlook of nights asOf + 1 … asOf + days. D ~ Normal(forecast, sd) with sd the
/// root mean square of the method's backtest errors in the night's lead bucket (the same
/// backtest that gives the band); ADR = (revenue on the books + max(0, constrained − OTB) × the
/// recent pickup rate at that lead) / max(constrained, OTB), the pickup rate being the revenue
/// per room picked up from that lead to arrival over the last rateWindowDays nights up to asOf
/// (when those nights picked up rooms and revenue; else the ADR on the books of the night; else
/// the ADR of those nights' finals). STLY OTB compares with the night last year of
/// HolidayMap::fromEvents(events) (as `curvebench pace` does). A night for which neither the
/// method nor its pickup-add fallback has a forecast is left out. Throws AsOfError / MethodError
/// as ForecastRun::compute, std::invalid_argument for days < 1 or an unknown
/// settings.unconstrainMethod.
Outlook computeOutlook(const std::vector<Reservation> &reservations, const Property &property,
                       const CensorSources &sources, const std::vector<EventNote> &events,
                       const OutlookOptions &options);

// The steps of computeOutlook, public so tests (and screens) can use them one at a time.

/// Fills constrained, spill, pSellout, occupancy, adr and revpar of `n` from its forecast, sd,
/// capacity, otb and otbRevenue, with `pickupRate` the revenue per room expected for rooms still
/// to be picked up. Capacity 0: nothing sells (constrained 0, spill = forecast, pSellout 1,
/// occupancy and RevPAR 0). Example: forecast 100, sd 20, capacity 120 → constrained 98.333691,
/// spill 1.666309 (check-values.md §3).
void fillCapacityFigures(OutlookNight &n, double pickupRate);
/// Sets the season class (forecast / capacity with `bands`) and the flags "full" (OTB ≥
/// capacity), "sell-out likely" (pSellout ≥ likelySellout, when not already full), "weak"
/// (occupancy < weakOccupancy), "pace up" / "pace down" (|OTB − STLY OTB| / max(STLY OTB, 1) >
/// paceAlert, when STLY OTB is known). Replaces any flags already there.
void classifyNight(OutlookNight &n, const SeasonBands &bands, const OutlookOptions &options);
/// Minimum-stay hints over consecutive nights: a night with pSellout ≥ minStayPeak and a
/// neighbour (the night before or after, when it is in `nights` and the day next to it) whose
/// constrained occupancy is below minStayWeak gets a hint of 2 nights and the flag "min stay".
/// Each night is judged on its own neighbours: in a run of peak nights only the nights at its
/// ends border a weak night, so they carry the hints (the evidence names the run) and the inner
/// nights, whose neighbours sell out too, get none.
std::vector<MinStayHint> findMinStays(std::vector<OutlookNight> &nights,
                                      const OutlookOptions &options);

/// Protection for one night from the store's forecasts by segment: each segment's demand still to
/// come (segment forecast − segment OTB, floored at 0; sd from its backtest errors), its rate (the
/// segment's ADR over the 365 nights up to asOf), capacity of the night and rooms sold (total OTB).
struct NightProtection {
  Date night;
  Date asOf;
  int capacity = 0;
  int sold = 0;
  ProtectionResult result;
  std::vector<int> segmentOtb;    ///< same order as result.lines
  std::vector<std::string> notes; ///< segments left out, and why
};

/// The segment rate is revenue / rooms of the segment's finals (OTB on the night itself, so
/// no-shows count: they stay on the books and are usually charged) over nights asOf − 364 …
/// asOf. A segment with no such rooms, or a rate of 0 (complimentary), cannot be ranked and is
/// left out with a note; so is one without a forecast for the night. Throws
/// std::invalid_argument when night ≤ asOf or no segment remains, and as ForecastRun::compute.
NightProtection protectNight(const std::vector<Reservation> &reservations, const Property &property,
                             const CensorSources &sources, Date asOf, Date night,
                             ProtectionMethod method, const OutlookOptions &options);

} // namespace cb
