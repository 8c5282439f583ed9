// Error bands (brief section 5): empirical type-7 quantiles of the backtest residuals at the same
// series and lead bucket, added to the point forecast, then conformally calibrated on forecasts
// whose outcomes are already known.
#pragma once

#include "core/errorwindow.h"

#include <cstdint>
#include <map>
#include <mutex>
#include <optional>
#include <span>
#include <tuple>
#include <vector>

namespace cb {

struct BandOptions {
  double lower = 0.10; ///< probability of the lower edge
  double upper = 0.90; ///< of the upper edge (10 %–90 %: an 80 % band)
  int windowDays = 56; ///< nights t − windowDays + 1 … t (same evidence as auto selection)
  int minCount = 10;   ///< fewer residuals give no band (our own choice: 10 % of 10 is one value)
  /// Conformal calibration (see ErrorBands): scores of the forecasts whose nights lie in
  /// t − calibrationDays + 1 … t. 0 turns it off. A year covers every season once.
  int calibrationDays = 365;
};

struct Band {
  double lo = 0, hi = 0;
};

/// Error bands in two steps.
/// 1. Base band: residuals r = final − forecast of the rows with nights in the windowDays up to
///    t (same series, method, lead bucket); base = [F + Q7(r, lower), F + Q7(r, upper)].
/// 2. Conformalized quantile regression (Romano, Patterson & Candès, "Conformalized Quantile
///    Regression", NeurIPS 2019; also Angelopoulos & Bates 2021, "A gentle introduction to
///    conformal prediction", arXiv 2107.07511 — both cited from memory): every earlier forecast j
///    of the same series, method and bucket whose night lies in the calibration window (so its
///    final is known at t) and which had a base band [l_j, u_j] — itself from nights ≤ its own
///    reading date — gets the score E_j = max(l_j − y_j, y_j − u_j) (> 0 outside the band). The
///    band is [base lo − Q, base hi + Q] with Q the conformal quantile of the scores at level upper
///    − lower. The short base window follows the current error level; the correction repairs its
///    systematic under-coverage (recent errors are autocorrelated, so 56 days of them understate
///    the spread, most at long leads). Fewer than minCount scores: no correction.
class ErrorBands {
public:
  /// Computes the base band of every row of `window` (the rows must outlive this object).
  ErrorBands(const ErrorWindow &window, BandOptions options);
  /// Band of a forecast made at reading date t by `method`, floored at 0; only rows with nights
  /// ≤ t are read. nullopt with fewer than minCount residuals.
  std::optional<Band> band(std::uint32_t series, std::uint32_t method, int bucket, Date readingDate,
                           double forecast) const;
  /// The base band from a list of residuals (final − forecast), floored at 0. Example: residuals
  /// 1 … 10, p 0.1 and 0.9, forecast 20 → {21.9, 29.1}.
  static std::optional<Band> fromResiduals(std::span<const double> residuals, double forecast,
                                           const BandOptions &options);
  /// CQR score of an outcome y against the band [lo, hi]: max(lo − y, y − hi).
  static double score(double lo, double hi, double y);
  /// Conformal quantile: the ⌈(n + 1)·level⌉-th smallest of the n scores (the largest when that
  /// rank passes n). Throws std::invalid_argument for no scores. Example: scores 1 … 10, level
  /// 0.8 → the 9th smallest, 9.
  static double conformalQuantile(std::vector<double> scores, double level);

private:
  /// (series, method, bucket, reading date in days): what a band's offsets depend on. Every
  /// forecast of one key gets the same offsets, only its own point forecast differs.
  using Key = std::tuple<std::uint32_t, std::uint32_t, int, std::int32_t>;
  using Quantiles = std::optional<std::pair<double, double>>;
  Quantiles residualQuantiles(std::uint32_t series, std::uint32_t method, int bucket,
                              Date readingDate) const;
  /// The conformal correction Q of a key (nullopt with fewer than minCount scores).
  std::optional<double> correction(std::uint32_t series, std::uint32_t method, int bucket,
                                   Date readingDate) const;

  const ErrorWindow &window_;
  BandOptions options_;
  /// Per window row: the base residual quantiles known at its reading date.
  std::vector<Quantiles> base_;
  /// The base quantiles of every key of the window's rows, worked out once in the constructor.
  std::map<Key, Quantiles> quantiles_;
  /// Offsets of the keys band() was asked for and quantiles_ lacks, and the corrections, each
  /// worked out once: a backtest asks for the same key at every lead of a bucket (a year of
  /// reading dates of additive pickup at a million bookings: 30 ms of bands became a few).
  /// band() is const and may be called from several threads, hence the lock (which makes the
  /// class neither copyable nor movable; it holds a reference to its window anyway).
  mutable std::mutex memoMutex_;
  mutable std::map<Key, Quantiles> extraQuantiles_;
  mutable std::map<Key, std::optional<double>> corrections_;
};

/// Share of outcomes inside their band, edges included: finals[i] ∈ [bands[i].lo, bands[i].hi].
/// nullopt for no bands. Throws std::invalid_argument on different lengths.
std::optional<double> bandCoverage(std::span<const Band> bands, std::span<const double> finals);

} // namespace cb
