#include "core/expsmoothing.h"

#include <algorithm>
#include <numeric>
#include <stdexcept>
#include <string>

namespace cb {

ExpSmoothing::ExpSmoothing(double alpha, std::optional<double> beta, std::optional<double> gamma,
                           int period)
    : alpha_(alpha), beta_(beta), gamma_(period >= 2 ? gamma : std::nullopt),
      period_(gamma_ ? period : 0) {}

namespace {

// The recursion written once; `onStep` sees each fitted value. The seasonal factors live in a
// ring so that each step is O(1): ring[pos] is the season of the next observation.
template <class OnStep>
double filter(std::span<const double> y, SmoothingState &st, double alpha,
              std::optional<double> beta, std::optional<double> gamma, int period,
              OnStep &&onStep) {
  if (gamma && st.seasonal.size() != static_cast<std::size_t>(period))
    throw std::invalid_argument("exponential smoothing: " + std::to_string(st.seasonal.size()) +
                                " initial seasonal factors for period " + std::to_string(period));
  if (!beta)
    st.trend = 0;
  std::size_t pos = 0;
  double sse = 0;
  for (double v : y) {
    const double season = gamma ? st.seasonal[pos] : 0.0;
    const double prior = st.level + st.trend; // l_{t−1} + b_{t−1}
    const double fitted = prior + season;
    onStep(fitted);
    sse += (v - fitted) * (v - fitted);
    const double level = alpha * (v - season) + (1 - alpha) * prior;
    if (beta)
      st.trend = *beta * (level - st.level) + (1 - *beta) * st.trend;
    if (gamma) {
      // FPP's form: the season is updated against l_{t−1} + b_{t−1}, not against l_t as in R's
      // stats::HoltWinters (check-values §8c explains the correspondence g = gR (1 − a)).
      st.seasonal[pos] = *gamma * (v - prior) + (1 - *gamma) * season;
      pos = (pos + 1) % st.seasonal.size();
    }
    st.level = level;
  }
  if (gamma) // back to "seasonal[0] = season of the next observation"
    std::rotate(st.seasonal.begin(), st.seasonal.begin() + static_cast<std::ptrdiff_t>(pos),
                st.seasonal.end());
  return sse;
}

} // namespace

SmoothingRun ExpSmoothing::run(std::span<const double> y, const SmoothingState &initial) const {
  SmoothingRun out;
  out.end = initial;
  out.fitted.reserve(y.size());
  out.sse = filter(y, out.end, alpha_, beta_, gamma_, period_,
                   [&](double f) { out.fitted.push_back(f); });
  return out;
}

double ExpSmoothing::sse(std::span<const double> y, const SmoothingState &initial) const {
  SmoothingState st = initial;
  return filter(y, st, alpha_, beta_, gamma_, period_, [](double) {});
}

double ExpSmoothing::forecast(const SmoothingState &end, int h) const {
  if (h < 1)
    throw std::invalid_argument("exponential smoothing: forecast horizon must be at least 1");
  double f = end.level + (beta_ ? h * end.trend : 0.0);
  if (gamma_)
    f += end.seasonal[static_cast<std::size_t>((h - 1) % period_)];
  return f;
}

SmoothingState ExpSmoothing::simpleStart(std::span<const double> y, bool trend) {
  if (y.size() < (trend ? 2u : 1u))
    throw std::invalid_argument("exponential smoothing: too few values for the simple start");
  SmoothingState st;
  st.level = y[0];
  st.trend = trend ? y[1] - y[0] : 0.0;
  return st;
}

SmoothingState ExpSmoothing::seasonalStart(std::span<const double> y, int period) {
  const auto m = static_cast<std::size_t>(period);
  if (period < 2 || y.size() < 2 * m)
    throw std::invalid_argument("exponential smoothing: the seasonal start needs two periods");
  const double first = std::accumulate(y.begin(), y.begin() + period, 0.0) / period;
  const double second = std::accumulate(y.begin() + period, y.begin() + 2 * period, 0.0) / period;
  SmoothingState st;
  st.level = first;
  st.trend = (second - first) / period;
  for (std::size_t i = 0; i < m; ++i)
    st.seasonal.push_back(y[i] - first);
  return st;
}

} // namespace cb
