// Rolling-origin backtest (brief section 5): for each reading date t in a window and each lead h,
// every method forecasts night s = t + h from the data as of t only, and the forecast is set
// against Final(s). Also the accuracy summary per series × method × lead.
#pragma once

#include "core/accuracy.h"
#include "core/autoselect.h"
#include "core/errorbands.h"
#include "core/finding.h"
#include "core/forecastmethod.h"
#include "core/unconstrain.h"

#include <cstdint>
#include <functional>
#include <map>
#include <optional>
#include <string>
#include <utility>
#include <vector>

namespace cb {

/// One forecast set against its outcome. Errors are e = forecast − final.
struct BacktestRow {
  Date night;               ///< s
  Date reading;             ///< t
  std::uint32_t series = 0; ///< index into BacktestResult::series
  int lead = 0;             ///< h = s − t
  std::uint32_t method = 0; ///< index into BacktestResult::methods
  double forecast = 0;
  double final = 0;
  /// Error band of this forecast (ErrorBands, from errors known at t); nullopt when too few.
  std::optional<double> lo, hi;
};

struct BacktestOptions {
  Date from, to; ///< reading dates, inclusive
  int step = 1;  ///< days between reading dates
  std::vector<int> leads = {1, 3, 7, 14, 30, 60, 90};
  /// Method names (see methodNames()); "auto" adds the auto-selected forecast, which chooses
  /// among the other methods listed (among all methods when "auto" is alone).
  std::vector<std::string> methods;
  MethodOptions methodOptions;
  /// Makes a method by name; makeMethod by default (tests plug in their own methods).
  std::function<std::unique_ptr<ForecastMethod>(std::string_view, const MethodOptions &)> factory =
      [](std::string_view name, const MethodOptions &o) { return makeMethod(name, o); };
  LeadBuckets buckets;
  AutoSelectOptions autoSelect;
  BandOptions bands;
  /// Also run the reading dates of the `max(autoSelect.windowDays, bands.windowDays +
  /// bands.calibrationDays + max lead) + max lead` days before `from` (not reported; without
  /// calibration the middle term is bands.windowDays), so that auto and the calibrated bands have
  /// known errors from the first reading date on.
  bool warmUp = true;
  /// Train on unconstrained history as known at each reading date (core/unconstrain.h);
  /// nullopt = the finals as observed. Forecasts are still scored against the observed finals.
  std::optional<UnconstrainOptions> unconstrain;
  const CensorSources *censoring = nullptr; ///< closures and denials; nullptr = none
  bool withBands = true; ///< false leaves BacktestRow::lo / hi empty (saves the quantile work)
  /// Only rows whose night is on or after it (no fit at a reading date whose leads all end
  /// before it); nullopt = every night. Each row is the same as without it.
  std::optional<Date> firstNight;
  /// Only this series of the cube (its index); nullopt = every series. Each row is the same as
  /// without it: a series' forecasts read its own cells and the hotel's (series 0) only.
  std::optional<std::size_t> series;
  unsigned threads = 0;          ///< 0 = every core
  ProgressFn progress = nullptr; ///< (done, total) in reading dates; false cancels
  void *progressContext = nullptr;
};

struct AutoRecord {
  Date reading;
  std::uint32_t series = 0;
  int bucket = 0;
  AutoChoice choice;
};

struct BacktestResult {
  std::vector<std::string> series;  ///< the cube's series names
  std::vector<std::string> methods; ///< as requested; "auto" (if any) last
  std::vector<BacktestRow> rows; ///< reading dates from … to, ordered by (t, method, series, h)
  std::vector<AutoRecord> autoChoices; ///< each auto decision with its evidence
  /// Per series: the MASE scale, the mean |Final(s) − Final(s − 7)| over nights up to `from`.
  std::vector<std::optional<double>> maseScale;
  LeadBuckets buckets;
  bool cancelled = false;
};

/// A night's expert override, for forecast value added (see ForecastOverride).
struct OverrideValue {
  Date night;
  std::string series; ///< series name ("ALL" for the hotel)
  double value = 0;
};

/// One line of the accuracy summary.
struct BacktestSummaryRow {
  std::uint32_t series = 0, method = 0;
  int lead = 0;
  Accuracy accuracy;
  std::int64_t banded = 0;        ///< forecasts that had a band
  std::optional<double> coverage; ///< share of those whose final lay inside [lo, hi]
  std::int64_t overridden = 0;    ///< forecasts of nights with an override
  /// Forecast value added of the overrides: MAE of this method − MAE of the override values,
  /// over the overridden nights (positive = the override was closer).
  std::optional<double> valueAdded;
};

class Backtest {
public:
  /// The cube a backtest reads: nights from the first arrival to min(to + max lead, newest
  /// activity), maxDba = max lead + 31 (room for the pace window), as of the newest activity.
  static CurveCube buildCube(const std::vector<Reservation> &reservations,
                             const BacktestOptions &options, SeriesBy by);
  /// The options buildCube() builds with, from what it needs to know of the reservations
  /// (bounds.newest and bounds.firstArrival set): for a cube made another way (core/keptcube.h).
  static CubeOptions cubeOptions(const ReservationBounds &bounds, const BacktestOptions &options,
                                 SeriesBy by);
  /// Runs the backtest over one cube. Only nights s ≤ cube.asOf() are forecast (their final is
  /// known). Rows are the same whatever the number of threads. Throws MethodError for an unknown
  /// method name and std::invalid_argument for an empty lead list or from > to.
  static BacktestResult run(const CurveCube &cube, const Property &property,
                            const BacktestOptions &options);
  /// Accuracy per series × method × lead, ordered that way; `overrides` give value added.
  static std::vector<BacktestSummaryRow>
  summarize(const BacktestResult &result, const std::vector<OverrideValue> &overrides = {});
};

} // namespace cb
