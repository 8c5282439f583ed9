// The Accuracy screen's model layer (no widgets): a backtest of every fast method over a window of
// past reading dates (nothing after each reading date is read), summarised per series, method and
// lead (MAE, RMSE, MAPE, WAPE, bias, MASE, band coverage, value added by overrides), and which
// method auto-selection picks per lead bucket and why.
#pragma once

#include "core/backtest.h"
#include "core/finding.h"
#include "ui/workbenchsession.h"

#include <map>
#include <optional>
#include <string>
#include <vector>

namespace cbui {

struct AccuracyRequest {
  int weeks = 8;       ///< nights scored: the `weeks` weeks up to the reading date, at every lead
  std::string segment; ///< "" = the hotel total
  std::vector<std::string> methods; ///< empty = every method but mlp (minutes), plus auto
  std::vector<int> leads = {1, 3, 7, 14, 30, 60, 90};
  cb::ProgressFn progress = nullptr; ///< (done, total) reading dates; false cancels
  void *progressContext = nullptr;
};

/// One summary line (series × method × lead) as the screen shows it.
struct AccuracyLine {
  std::string method;
  int lead = 0;
  cb::Accuracy accuracy;
  std::optional<double> coverage;   ///< share of finals inside the 80 % band
  std::int64_t overridden = 0;      ///< forecasts of nights with an override
  std::optional<double> valueAdded; ///< MAE of the method − MAE of the overrides (rooms)
};

/// How often auto-selection picked each method for one lead bucket, with the evidence of the
/// latest decision (every method's error over the selection window).
struct AutoPick {
  std::string bucket;               ///< e.g. "8–14 days"
  std::map<std::string, int> picks; ///< method → reading dates it was chosen
  std::string latest;               ///< the method chosen at the last reading date
  std::vector<std::pair<std::string, double>> latestEvidence; ///< method → error, best first
  std::string criterion;                                      ///< "mae", …
};

struct AccuracyData {
  cb::Date from, to;  ///< reading dates backtested
  std::string series; ///< "ALL" or the segment
  std::vector<std::string> methods;
  std::vector<AccuracyLine> lines; ///< ordered by method, then lead
  std::vector<AutoPick> autoPicks; ///< one per lead bucket
  bool cancelled = false;
  /// The line of `method` at `lead`; nullptr when none.
  const AccuracyLine *line(const std::string &method, int lead) const;
};

/// Runs the backtest (slow: seconds to a minute on the sample property; run it off the UI
/// thread). Trains on unconstrained history as the property's settings say (historyOptions),
/// censoring from the session's closures and denials, scores against the observed finals.
AccuracyData computeAccuracy(const WorkbenchSession &session, const AccuracyRequest &request);

} // namespace cbui
