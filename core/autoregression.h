// Autoregression AR(p) fitted by ordinary least squares, with the order chosen by AIC.
#pragma once

#include <span>
#include <vector>

namespace cb {

/// x_t = c + φ_1 x_{t−1} + … + φ_p x_{t−p} + e_t.
struct ArFit {
  int order = 0;
  double intercept = 0;      ///< c
  std::vector<double> coefs; ///< φ_1 … φ_p
  double sigma2 = 0;         ///< RSS / n (the maximum-likelihood innovation variance)
  double aic = 0;            ///< n log(RSS / n) + 2 (p + 1), n = rows used
  int rows = 0;              ///< n
};

class AutoRegression {
public:
  /// OLS of x_t on 1, x_{t−1} … x_{t−p} over t = first … end (0-based; first ≥ p), by a
  /// Householder QR in Eigen. With first = p this is R's `lm(x[t] ~ x[t−1] + … + x[t−p])` and
  /// `ar.ols(x, aic = FALSE, order.max = p, demean = FALSE, intercept = TRUE)`.
  /// Throws std::invalid_argument when there are fewer rows than p + 2.
  static ArFit fit(std::span<const double> x, int p, int first);
  static ArFit fit(std::span<const double> x, int p) { return fit(x, p, p); }
  /// Fits p = 1 … maxP on the same rows (t ≥ maxP, so the AICs compare), keeps the order with
  /// the lowest AIC and refits it on all its rows (t ≥ p). maxP is lowered when the series is
  /// too short for it (at least 3 (p + 1) rows); throws std::invalid_argument below 6 values.
  static ArFit fitByAic(std::span<const double> x, int maxP);
  /// The recursion iterated h ≥ 1 steps beyond the end of x (x must hold ≥ p values).
  static double forecast(const ArFit &fit, std::span<const double> x, int h);
};

} // namespace cb
