// The Date Study's model layer: every figure the Date Study screen shows for one night, computed
// by core and testable without widgets. Slow work (forecasts of every method for a reading date,
// their backtest accuracy, protection) is split out so the panel can run it off the UI thread.
#pragma once

#include "core/comparablenights.h"
#include "core/forecastrun.h"
#include "core/outlook.h"
#include "ui/workbenchsession.h"

#include <atomic>
#include <map>
#include <memory>
#include <optional>
#include <string>
#include <vector>

namespace cbui {

/// Forecasts of several methods for one reading date (series split by segment, plus "ALL") and
/// each method's backtest MAE per series and lead: computed once, then every method switch reads
/// from here.
struct ForecastCache {
  cb::Date asOf;
  int horizon = 0;
  std::map<std::string, cb::ForecastRun> runs; ///< by method name
  /// method → series → backtested lead → MAE (rooms), over the 8 weeks before asOf.
  std::map<std::string, std::map<std::string, std::map<int, double>>> mae;
  std::vector<std::string> failures; ///< "method: reason" for methods that could not run
  bool cancelled = false;
};

/// Shared between the UI thread and the worker: cancel flag and progress.
struct CacheProgress {
  std::atomic<bool> cancel{false};
  std::atomic<int> done{0};
  std::atomic<int> total{0};
};

/// The leads the accuracy backtest scores (the lead shown is the nearest of these).
const std::vector<int> &backtestLeads();

/// Forecasts `methods` as of `asOf` for `horizon` nights, by segment, trained on unconstrained
/// history (the property's setting), and backtests them over the 8 weeks before asOf at
/// backtestLeads(). Safe to call from a worker thread while the session is not changed.
ForecastCache computeForecastCache(const WorkbenchSession &session, cb::Date asOf, int horizon,
                                   const std::vector<std::string> &methods,
                                   CacheProgress *progress = nullptr);

/// Protection of the night's segments with one method's forecasts (cb::protectNight, EMSR-b).
/// Slow (it forecasts); run off the UI thread. Throws as cb::protectNight, and
/// std::runtime_error when `cancel` turns true while it forecasts.
cb::NightProtection computeProtection(const WorkbenchSession &session, cb::Date asOf,
                                      cb::Date night, const std::string &method,
                                      const std::atomic<bool> *cancel = nullptr);

class DateStudyModel {
public:
  explicit DateStudyModel(const WorkbenchSession &session) : s_(session) {}

  void setNight(cb::Date night) { night_ = night; }
  cb::Date night() const { return night_; }
  /// "" = the whole hotel.
  void setSegment(const std::string &segment) { segment_ = segment; }
  const std::string &segment() const { return segment_; }
  /// Series name in forecasts and cubes: "ALL" for the hotel.
  std::string series() const { return segment_.empty() ? std::string("ALL") : segment_; }
  /// Days from the reading date to the night (≤ 0 for a night already stayed).
  int lead() const { return night_ - s_.readingDate(); }
  /// Leads the chart covers: at least 90, and 30 beyond the night's lead.
  int maxLead() const;

  /// This year's and last year's curve of the selected segment (or the hotel).
  NightCurves curves() const;
  /// One this-year curve per segment (same leads as curves().thisYear), for the stacked view.
  std::vector<CurveSeries> segmentCurves() const;
  /// Comparable-nights band of the selected series at leads 0 … maxLead().
  cb::ComparableNights comparable() const;

  /// The cache the forecasts are read from (nullptr = none yet).
  void setCache(std::shared_ptr<const ForecastCache> cache) { cache_ = std::move(cache); }
  /// True when the cache is for the reading date and reaches the night.
  bool cacheCovers() const;
  /// Horizon a cache needs to reach this night.
  int horizonNeeded() const;
  /// Forecast of the selected series by `method`, from the cache (nullopt when not cached).
  std::optional<cb::ForecastValue> forecast(const std::string &method,
                                            const std::string &series = {}) const;
  /// The method's backtest MAE for the selected series at the backtested lead nearest the
  /// night's lead; `leadOut` receives that lead.
  std::optional<double> mae(const std::string &method, int *leadOut = nullptr) const;
  /// How many forecasts were served from the cache (a test checks switches use it).
  int cacheReads() const { return cacheReads_; }

  /// Unconstrained demand against capacity for the hotel: forecast and spread of `method`,
  /// capacity of the night, constrained rooms, spill, sell-out probability (core/outlook.h).
  /// The ADR of rooms still to come is taken as the ADR on the books.
  std::optional<cb::OutlookNight> capacityFigures(const std::string &method) const;

  /// Reservations on the books for the night at the reading date (Reservation::onBooks), of the
  /// selected segment, by booking date.
  std::vector<cb::Reservation> reservationsOnBooks() const;
  /// Rooms of those reservations (equals the OTB of the night).
  int roomsOnBooks() const;

  /// Every override in the store (opens it: read once, not at every night switch).
  std::vector<cb::ForecastOverride> allOverrides() const;
  /// Overrides stored for this night (any segment), oldest first. Opens the store.
  std::vector<cb::ForecastOverride> overrides() const;
  /// Stores an override for the night and the selected segment; returns its id.
  std::int64_t addOverride(double value, const std::string &reason,
                           const std::string &author) const;

private:
  const WorkbenchSession &s_;
  cb::Date night_;
  std::string segment_;
  std::shared_ptr<const ForecastCache> cache_;
  mutable int cacheReads_ = 0;
};

} // namespace cbui
