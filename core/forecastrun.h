// A forecast as shown to the user (a "forecast run"): per future night and series the point
// forecast, its error band and the method, stored with the method, parameters, data version and
// reading date so its accuracy can be measured later; and the expert overrides of nights.
#pragma once

#include "core/autoselect.h"
#include "core/curvecube.h"
#include "core/errorbands.h"
#include "core/finding.h"
#include "core/forecastmethod.h"
#include "core/unconstrain.h"

#include <cstdint>
#include <memory>
#include <optional>
#include <string>
#include <vector>

namespace cb {

class Store;

/// An expert's value for a night (brief section 3), kept in the forecast_overrides table.
struct ForecastOverride {
  std::int64_t id = 0;
  Date night;
  std::string segment; ///< empty = the whole hotel (series "ALL")
  double value = 0;
  std::string reason, author;
  std::string createdAt; ///< UTC "YYYY-MM-DDTHH:MM:SSZ"; set by addOverride() when empty
};

/// Stores an override (the segment row is created if missing) and returns its id.
std::int64_t addOverride(Store &store, ForecastOverride o);
/// Every override, ordered by night, then id.
std::vector<ForecastOverride> overrides(Store &store);

/// One forecast value of a run.
struct ForecastValue {
  Date night;
  std::string series;
  int lead = 0;
  int otb = 0; ///< OTB(s, t) at the reading date
  double forecast = 0;
  std::optional<double> lo, hi; ///< error band; nullopt without enough backtest errors
  /// Spread of the forecast: root mean square of the method's backtest errors in this lead's
  /// bucket over the band window; nullopt without errors.
  std::optional<double> sd;
  std::string method; ///< the method that made it (auto's choice for "auto")
};

struct ForecastRequest {
  Date asOf;
  int horizon = 90;
  std::string method = "auto"; ///< a name of methodNames() or "auto"
  SeriesBy by = SeriesBy::Total;
  MethodOptions methodOptions;
  AutoSelectOptions autoSelect;
  BandOptions bands;
  /// Train on unconstrained history (core/unconstrain.h); nullopt = the finals as observed.
  std::optional<UnconstrainOptions> unconstrain;
  const CensorSources *censoring = nullptr; ///< closures and denials; nullptr = none
  /// Only the series of this name ("ALL" or a code of `by`); nullopt = every series. Its values
  /// are the same as in the run of every series (each series' evidence is its own); a name the
  /// data does not have gives no values.
  std::optional<std::string> series;
  /// Keep the run's curve cube in ForecastRun::cube, for a caller that reads more of its cells
  /// (tens of MB at a large property, so only on request).
  bool keepCube = false;
  /// boundsOf(reservations) when the caller knows them (saves a pass over the reservations);
  /// they must be those of the reservations given.
  std::optional<ReservationBounds> bounds;
  /// The cube an earlier run over the same reservations kept (ForecastRun::cube): read instead of
  /// building one when it was built for exactly this run's nights, leads, series kind and
  /// reading date (a screen flipping through segments at one reading date); narrowed to this
  /// run's (CurveCube::narrowed) when it was built for the same first night, leads and series
  /// kind at a later reading date and reaches this run's last night (a screen moving the
  /// reading date back); else ignored. The caller must know that the reservations are the same.
  std::shared_ptr<const CurveCube> cube;
  unsigned threads = 0; ///< 0 = every core
  /// Auto only: true runs the evidence backtest of every method over every lead at once (the
  /// reference the faster two-part evidence is tested against; see ForecastRun::compute).
  bool fullEvidence = false;
  ProgressFn progress = nullptr;
  void *progressContext = nullptr;
};

class ForecastRun {
public:
  std::int64_t id = 0;           ///< 0 until saved
  std::string createdAt;         ///< UTC
  std::string method;            ///< as requested ("auto" or a method name)
  std::string parameters = "{}"; ///< JSON: options, lead buckets and auto's evidence
  std::string dataVersion;
  Date readingDate;
  std::vector<ForecastValue> values; ///< ordered by night, then series
  bool cancelled = false;
  /// With ForecastRequest::keepCube, the curve cube the run read (every night from the first
  /// arrival to the last forecast night, leads to horizon + 31); not saved.
  std::shared_ptr<const CurveCube> cube;

  /// Forecasts nights asOf + 1 … asOf + horizon from the data as of asOf. Bands and auto's
  /// choice come from a backtest of the last 8 weeks of outcomes before asOf: reading dates
  /// asOf − windowDays − horizon … asOf − 1, every lead 1 … horizon, nights ≤ asOf only; the
  /// band of a lead uses the errors of its lead bucket (LeadBuckets defaults). Throws AsOfError
  /// when asOf is after the newest activity, MethodError for an unknown method.
  static ForecastRun compute(const std::vector<Reservation> &reservations, const Property &property,
                             const ForecastRequest &request);

  /// "import 7, 79330 reservations": the newest written import and `reservations`, the number of
  /// reservations the run read (the caller has them; counting the table would read all of it).
  static std::string dataVersionOf(Store &store, std::size_t reservations);
  /// Saves the run and its values (one transaction); sets id and, when empty, createdAt.
  std::int64_t save(Store &store);
  /// Every stored run with its values, oldest first.
  static std::vector<ForecastRun> load(Store &store);
};

} // namespace cb
