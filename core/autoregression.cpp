#include "core/autoregression.h"

#include <Eigen/Dense>

#include <algorithm>
#include <cmath>
#include <limits>
#include <stdexcept>
#include <string>

namespace cb {

ArFit AutoRegression::fit(std::span<const double> x, int p, int first) {
  const int n = static_cast<int>(x.size());
  const int rows = n - first;
  if (p < 0 || first < p || rows < p + 2)
    throw std::invalid_argument("autoregression: " + std::to_string(n) +
                                " values are too few for order " + std::to_string(p));
  Eigen::MatrixXd design(rows, p + 1);
  Eigen::VectorXd target(rows);
  for (int r = 0; r < rows; ++r) {
    const auto t = static_cast<std::size_t>(first + r);
    target(r) = x[t];
    design(r, 0) = 1.0;
    for (int j = 1; j <= p; ++j)
      design(r, j) = x[t - static_cast<std::size_t>(j)];
  }
  // Column-pivoting QR: a flat stretch of finals makes lags collinear, and the fit must still
  // return a usable (minimum-effort) solution rather than NaNs.
  const Eigen::VectorXd beta = design.colPivHouseholderQr().solve(target);
  const double rss = (target - design * beta).squaredNorm();
  ArFit out;
  out.order = p;
  out.rows = rows;
  out.intercept = beta(0);
  for (int j = 1; j <= p; ++j)
    out.coefs.push_back(beta(j));
  out.sigma2 = rss / rows;
  // A perfect fit would give log(0); the floor keeps the comparison finite and ordered.
  out.aic =
      rows * std::log(std::max(out.sigma2, std::numeric_limits<double>::min())) + 2.0 * (p + 1);
  return out;
}

ArFit AutoRegression::fitByAic(std::span<const double> x, int maxP) {
  const int n = static_cast<int>(x.size());
  if (n < 6)
    throw std::invalid_argument("autoregression: at least 6 values are needed");
  // Rows n − maxP must be at least 3 (maxP + 1) so every candidate has a few residual degrees of
  // freedom: our own guard, no source.
  maxP = std::clamp(std::min(maxP, (n - 3) / 4), 1, std::max(1, n - 3));
  int best = 1;
  double bestAic = std::numeric_limits<double>::infinity();
  for (int p = 1; p <= maxP; ++p) {
    const double aic = fit(x, p, maxP).aic;
    if (aic < bestAic) {
      bestAic = aic;
      best = p;
    }
  }
  return fit(x, best);
}

double AutoRegression::forecast(const ArFit &fit, std::span<const double> x, int h) {
  const auto p = static_cast<std::size_t>(fit.order);
  if (x.size() < p || h < 1)
    throw std::invalid_argument("autoregression: forecast needs p values and h >= 1");
  std::vector<double> tail(x.end() - static_cast<std::ptrdiff_t>(p), x.end());
  double next = fit.intercept;
  for (int step = 0; step < h; ++step) {
    next = fit.intercept;
    for (std::size_t j = 0; j < p; ++j)
      next += fit.coefs[j] * tail[tail.size() - 1 - j];
    tail.push_back(next);
  }
  return next;
}

} // namespace cb
