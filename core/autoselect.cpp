#include "core/autoselect.h"

#include "core/backtest.h"

#include <algorithm>
#include <cmath>

namespace cb {

std::string_view criterionName(SelectionCriterion c) {
  switch (c) {
  case SelectionCriterion::Mae: return "mae";
  case SelectionCriterion::Rmse: return "rmse";
  case SelectionCriterion::Wape: return "wape";
  case SelectionCriterion::AbsBias: return "abs-bias";
  }
  return "mae";
}

std::optional<SelectionCriterion> parseCriterion(std::string_view name) {
  for (auto c : {SelectionCriterion::Mae, SelectionCriterion::Rmse, SelectionCriterion::Wape,
                 SelectionCriterion::AbsBias})
    if (criterionName(c) == name)
      return c;
  return std::nullopt;
}

AutoSelector::AutoSelector(const ErrorWindow &window, std::vector<std::uint32_t> candidates,
                           AutoSelectOptions options)
    : window_(window), candidates_(std::move(candidates)), options_(options) {}

AutoChoice AutoSelector::choose(std::uint32_t series, int bucket, Date readingDate) const {
  AutoChoice choice;
  const Date first = readingDate - (options_.windowDays - 1);
  for (std::uint32_t m : candidates_) {
    const auto rows = window_.rows(series, m, bucket, first, readingDate);
    if (static_cast<int>(rows.size()) < options_.minCount)
      continue;
    double sumAbs = 0, sumSq = 0, sum = 0, sumFinal = 0;
    for (const BacktestRow &r : rows) {
      const double e = r.forecast - r.final;
      sumAbs += std::abs(e);
      sumSq += e * e;
      sum += e;
      sumFinal += r.final;
    }
    const double n = static_cast<double>(rows.size());
    double error = sumAbs / n;
    switch (options_.criterion) {
    case SelectionCriterion::Mae: break;
    case SelectionCriterion::Rmse: error = std::sqrt(sumSq / n); break;
    case SelectionCriterion::Wape:
      // With no rooms at all in the window every method ties on MAE; fall back to it.
      error = sumFinal > 0 ? 100.0 * sumAbs / sumFinal : error;
      break;
    case SelectionCriterion::AbsBias: error = std::abs(sum / n); break;
    }
    choice.evidence.push_back({m, static_cast<std::int64_t>(rows.size()), error});
  }
  std::stable_sort(
      choice.evidence.begin(), choice.evidence.end(),
      [](const MethodEvidence &a, const MethodEvidence &b) { return a.error < b.error; });
  if (!choice.evidence.empty())
    choice.method = choice.evidence.front().method;
  return choice;
}

} // namespace cb
