// Forecast methods behind one interface (brief section 5): each forecasts Final(s) of a night s
// in one series, using only the data as it stood on reading date t.
#pragma once

#include "core/curvecube.h"
#include "core/reservation.h"

#include <memory>
#include <optional>
#include <stdexcept>
#include <string>
#include <string_view>
#include <vector>

namespace cb {

/// What a method may see: one series of a curve cube, masked at the reading date. The cube may
/// have been built as of a later date (the backtest builds one cube for all reading dates); the
/// accessors make any cell dated after `asOf` unreachable, which is what guarantees that no
/// method looks ahead (a cell OTB(s, s − d) with s − d ≤ t depends only on activity up to t).
class ForecastContext {
public:
  ForecastContext(const CurveCube &cube, std::size_t series, Date asOf, const Property &property);

  Date asOf() const { return asOf_; }
  std::size_t series() const { return series_; }
  const Property &property() const { return property_; }
  const CurveCube &cube() const { return cube_; }
  Date firstNight() const { return cube_.firstNight(); }
  int maxDba() const { return cube_.maxDba(); }

  /// OTB(s, s − d) when s − d ≤ asOf and the cell is inside the cube; nullopt otherwise.
  std::optional<int> otb(Date night, int dba) const { // inline: the pickup methods' inner loop
    if (dba < 0 || dba > cube_.maxDba() || night < cube_.firstNight() || night > cube_.lastNight())
      return std::nullopt;
    if (night - dba > asOf_)
      return std::nullopt; // after the reading date: not known yet
    return cube_.otbRooms(series_, night, dba);
  }
  /// OTB(s, t) as of the reading date itself (lead h = s − t); nullopt when h > maxDba, as the
  /// cube's earliest reading of s is s − maxDba. Build the cube with maxDba ≥ the longest lead.
  std::optional<int> otbNow(Date night) const;
  /// Final(s) as the methods learn it, when s ≤ asOf and inside the cube: the observed final,
  /// or its unconstrained estimate when useHistory() was given one.
  std::optional<double> final(Date night) const;
  /// Final(s) as observed (rooms on the books on the night), whatever useHistory() says.
  std::optional<int> observedFinal(Date night) const;
  /// Finals of nights firstNight … asOf as final() reads them, oldest first (a daily time
  /// series; index 0 = firstNight).
  const std::vector<double> &finals() const;
  /// Makes final() and finals() read `demand` (index 0 = firstNight, at least every night up to
  /// min(asOf, lastNight)): the unconstrained history known at asOf (core/unconstrain.h), so
  /// sold-out nights do not teach a method that demand stopped at capacity. nullptr = observed.
  /// The vector must outlive the context.
  void useHistory(const std::vector<double> *demand);
  const std::vector<double> *history() const { return history_; }

private:
  const CurveCube &cube_;
  std::size_t series_;
  Date asOf_;
  const Property &property_;
  const std::vector<double> *history_ = nullptr;
  mutable std::vector<double> finals_;
  mutable bool finalsReady_ = false;
};

/// Settings of the methods (CLI flags); defaults are those of brief section 5.
struct MethodOptions {
  int movingAverageK = 4;          ///< mavg: last k same-weekday finals
  int references = 8;              ///< pickup: N most recent same-weekday nights already arrived
  bool seasonalReferences = false; ///< pickup: references around s − 364 ± k weeks instead
  int seasonalWeeks = 4;           ///< k for seasonal references
  int paceWindow = 7;              ///< pace-extrap: w days (7 or 15)
  int maxArOrder = 14;             ///< ar: largest p tried (order chosen by AIC)
  std::uint64_t seed = 20261201;   ///< mlp: fixed seed
  /// mlp: days one set of nets serves in a backtest. 1 (the default) trains the nets again at
  /// every reading date. With k > 1 the backtest cuts its reading dates into blocks of k days
  /// (counted from its first reading date, warm-up included) and a net is trained once per block,
  /// at the block's first reading date that asks for it, on the data as of that date; the
  /// block's later dates reuse it with their own inputs (OTB and pickup as of their own reading
  /// date), so nothing after a date enters its forecast. About k times fewer trainings, at the
  /// cost of nets up to k − 1 days old. A single forecast (not a backtest) trains at its date.
  int mlpRetrainDays = 1;
};

class ForecastMethod {
public:
  virtual ~ForecastMethod() = default;
  /// CLI name, e.g. "pickup-add".
  virtual std::string name() const = 0;
  /// One or two plain sentences a revenue manager understands.
  virtual std::string description() const = 0;
  /// The formula in plain text, e.g. "F(s) = OTB(s,t) + mean_r [Final(r) − OTB(r, r − h)]".
  virtual std::string formula() const = 0;
  /// Fits parameters on the data as of ctx.asOf() (called once per reading date and series,
  /// before any forecast()).
  virtual void fit(const ForecastContext &ctx) = 0;
  /// Forecast of Final(night) for night > ctx.asOf(). Never negative. nullopt when the method has
  /// too little history (e.g. last-year before a year of data).
  virtual std::optional<double> forecast(const ForecastContext &ctx, Date night) const = 0;
};

/// Thrown for an unknown method name or invalid options.
class MethodError : public std::invalid_argument {
public:
  using std::invalid_argument::invalid_argument;
};

/// Every method's CLI name, in the order of brief section 5 ("auto" is the backtest's own).
std::vector<std::string> methodNames();
/// Creates a method by CLI name (not "auto"); throws MethodError.
std::unique_ptr<ForecastMethod> makeMethod(std::string_view name,
                                           const MethodOptions &options = {});

} // namespace cb
