#include "core/demandmath.h"

#include <boost/math/distributions/binomial.hpp>
#include <boost/math/distributions/normal.hpp>
#include <boost/math/distributions/poisson.hpp>

#include <algorithm>
#include <cmath>
#include <stdexcept>
#include <string>

namespace cb {
namespace {

// Boost's default discrete-quantile policy rounds outwards; we want the smallest k with
// F(k) ≥ p, so ask for rounding up and then check the neighbours against the definition.
using RoundUp = boost::math::policies::policy<
    boost::math::policies::discrete_quantile<boost::math::policies::integer_round_up>>;

const boost::math::normal &standardNormal() {
  static const boost::math::normal n(0.0, 1.0);
  return n;
}

void requireNotNan(double x, const char *what) {
  if (std::isnan(x))
    throw std::domain_error(std::string(what) + ": argument is NaN");
}

void requirePoissonMean(double mean, const char *what) {
  if (!std::isfinite(mean) || mean < 0)
    throw std::invalid_argument(std::string(what) + ": Poisson mean must be finite and >= 0");
}

/// P(X > k) for X ~ Poisson(mean > 0), k ≥ 0, from the upper tail directly (no 1 − F
/// cancellation).
double poissonUpper(int k, double mean) {
  return boost::math::cdf(boost::math::complement(boost::math::poisson(mean), k));
}

} // namespace

double normalPdf(double z) {
  requireNotNan(z, "normalPdf");
  if (std::isinf(z))
    return 0.0;
  return boost::math::pdf(standardNormal(), z);
}

double normalCdf(double z) {
  requireNotNan(z, "normalCdf");
  if (std::isinf(z))
    return z > 0 ? 1.0 : 0.0;
  return boost::math::cdf(standardNormal(), z);
}

double normalQuantile(double p) {
  if (!(p > 0.0 && p < 1.0))
    throw std::domain_error("normalQuantile: p must lie strictly between 0 and 1");
  return boost::math::quantile(standardNormal(), p);
}

double normalLoss(double z) {
  requireNotNan(z, "normalLoss");
  if (std::isinf(z))
    return z > 0 ? 0.0 : -z; // L(z) → −z as z → −∞
  // 1 − Φ(z) from the upper tail so that large positive z keeps its digits.
  const double upper = boost::math::cdf(boost::math::complement(standardNormal(), z));
  return std::max(0.0, boost::math::pdf(standardNormal(), z) - z * upper);
}

CapacityOutcome normalAgainstCapacity(double mu, double sigma, double capacity) {
  if (!std::isfinite(mu) || !std::isfinite(sigma) || !std::isfinite(capacity))
    throw std::invalid_argument("normalAgainstCapacity: inputs must be finite");
  if (sigma < 0)
    throw std::invalid_argument("normalAgainstCapacity: sigma must be >= 0");
  CapacityOutcome o;
  if (sigma == 0) { // demand is exactly mu
    o.sales = std::min(mu, capacity);
    o.spill = std::max(mu - capacity, 0.0);
    o.empty = std::max(capacity - mu, 0.0);
    o.pFull = mu >= capacity ? 1.0 : 0.0;
    return o;
  }
  const double z = (capacity - mu) / sigma;
  // L(−z) = L(z) + z: evaluate the loss at |z| (the small side) and add the linear part, so
  // neither spill nor empty is a difference of two large numbers.
  const double tail = sigma * normalLoss(std::abs(z));
  if (z >= 0) {
    o.spill = tail;
    o.empty = (capacity - mu) + tail;
    o.sales = mu - tail;
  } else {
    o.spill = (mu - capacity) + tail;
    o.empty = tail;
    o.sales = capacity - tail;
  }
  o.pFull = boost::math::cdf(boost::math::complement(standardNormal(), z));
  return o;
}

CapacityOutcome poissonAgainstCapacity(double mean, int capacity) {
  requirePoissonMean(mean, "poissonAgainstCapacity");
  if (capacity < 0)
    throw std::invalid_argument("poissonAgainstCapacity: capacity must be >= 0");
  CapacityOutcome o;
  if (mean == 0) { // no demand at all
    o.empty = capacity;
    o.pFull = capacity == 0 ? 1.0 : 0.0;
    return o;
  }
  // E[min(D, C)] = Σ_{k=0}^{C−1} P(D > k): a finite sum, no truncated infinite series. Once the
  // tail underflows to 0 the remaining terms are 0 too.
  double sales = 0;
  for (int k = 0; k < capacity; ++k) {
    const double up = poissonUpper(k, mean);
    if (up == 0)
      break;
    sales += up;
  }
  o.sales = sales;
  o.empty = std::max(0.0, static_cast<double>(capacity) - sales);
  // E[(D − C)+] = mean·P(D ≥ C − 1) − C·P(D ≥ C), because E[D·1{D ≥ C}] = mean·P(D ≥ C − 1)
  // for the Poisson; both tails come straight from Boost, so a tiny spill keeps its digits
  // (mean − sales would lose them when C is far above the mean).
  if (capacity == 0) {
    o.spill = mean;
    o.pFull = 1.0;
  } else {
    const double geC = poissonUpper(capacity - 1, mean); // P(D ≥ C)
    const double geCm1 = capacity >= 2 ? poissonUpper(capacity - 2, mean) : 1.0;
    o.spill = std::max(0.0, mean * geCm1 - static_cast<double>(capacity) * geC);
    o.pFull = geC;
  }
  return o;
}

double poissonCdf(int k, double mean) {
  requirePoissonMean(mean, "poissonCdf");
  if (k < 0)
    return 0.0;
  if (mean == 0)
    return 1.0;
  return boost::math::cdf(boost::math::poisson(mean), k);
}

int poissonQuantile(double p, double mean) {
  requirePoissonMean(mean, "poissonQuantile");
  if (!(p > 0.0 && p < 1.0))
    throw std::domain_error("poissonQuantile: p must lie strictly between 0 and 1");
  if (mean == 0)
    return 0;
  const double q =
      boost::math::quantile(boost::math::poisson_distribution<double, RoundUp>(mean), p);
  if (!(q < 2e9))
    throw std::overflow_error("poissonQuantile: quantile beyond the int range");
  int k = static_cast<int>(q);
  // Pin the definition exactly (the root finder works to a tolerance).
  while (k > 0 && poissonCdf(k - 1, mean) >= p)
    --k;
  while (poissonCdf(k, mean) < p)
    ++k;
  return k;
}

double binomialCdf(int k, int n, double prob) {
  if (n < 0)
    throw std::invalid_argument("binomialCdf: n must be >= 0");
  if (!(prob >= 0.0 && prob <= 1.0))
    throw std::invalid_argument("binomialCdf: prob must lie in [0, 1]");
  if (k < 0)
    return 0.0;
  if (k >= n)
    return 1.0;
  if (prob == 0.0)
    return 1.0; // X = 0 ≤ k
  if (prob == 1.0)
    return 0.0; // X = n > k
  return boost::math::cdf(boost::math::binomial(static_cast<double>(n), prob),
                          static_cast<double>(k));
}

} // namespace cb
