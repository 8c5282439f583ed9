// Auto-selection (brief section 5): per series and lead bucket, the method whose recent backtest
// error is lowest, judged only on nights whose final is already known at the reading date.
#pragma once

#include "core/errorwindow.h"

#include <cstdint>
#include <optional>
#include <string_view>
#include <vector>

namespace cb {

enum class SelectionCriterion { Mae, Rmse, Wape, AbsBias };
std::string_view criterionName(SelectionCriterion c); ///< "mae", "rmse", "wape", "abs-bias"
std::optional<SelectionCriterion> parseCriterion(std::string_view name);

struct AutoSelectOptions {
  SelectionCriterion criterion = SelectionCriterion::Mae;
  /// Nights t − windowDays + 1 … t are the evidence at reading date t. 56 days = 8 weeks: every
  /// weekday 8 times, recent enough to follow the season (our own choice, no source).
  int windowDays = 56;
  /// A method needs this many known errors in the window to be chosen (our own choice).
  int minCount = 8;
};

/// One candidate's record in the window.
struct MethodEvidence {
  std::uint32_t method = 0;
  std::int64_t count = 0;
  double error = 0; ///< the criterion's value (MAE in rooms, RMSE, WAPE in %, |bias|)
};

struct AutoChoice {
  /// The chosen method; nullopt when no candidate had minCount errors in the window.
  std::optional<std::uint32_t> method;
  /// Every candidate with enough errors, best first (ties keep the candidate order).
  std::vector<MethodEvidence> evidence;
};

class AutoSelector {
public:
  /// `candidates` are method indices in the rows of `window`, in order of preference for ties.
  AutoSelector(const ErrorWindow &window, std::vector<std::uint32_t> candidates,
               AutoSelectOptions options);
  /// The choice at reading date t: only rows with night ≤ t are read, so only errors known
  /// at t count.
  AutoChoice choose(std::uint32_t series, int bucket, Date readingDate) const;

private:
  const ErrorWindow &window_;
  std::vector<std::uint32_t> candidates_;
  AutoSelectOptions options_;
};

} // namespace cb
