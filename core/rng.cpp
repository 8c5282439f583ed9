#include "core/rng.h"

#include <cmath>
#include <limits>
#include <stdexcept>

namespace cb {

double Rng::uniform() {
  // 53 bits fill a double's mantissa exactly; the +0.5 centres each cell so 0 and 1 never occur.
  return (static_cast<double>(next() >> 11) + 0.5) * 0x1.0p-53;
}

int Rng::uniformInt(int lo, int hi) {
  if (hi < lo)
    throw std::invalid_argument("Rng::uniformInt: hi < lo");
  const std::uint64_t range =
      static_cast<std::uint64_t>(static_cast<std::int64_t>(hi) - static_cast<std::int64_t>(lo)) + 1;
  // Reject the top partial copy of [0, range) so every value is equally likely.
  const std::uint64_t limit =
      std::numeric_limits<std::uint64_t>::max() - std::numeric_limits<std::uint64_t>::max() % range;
  std::uint64_t x = next();
  while (x >= limit)
    x = next();
  return static_cast<int>(static_cast<std::int64_t>(lo) + static_cast<std::int64_t>(x % range));
}

double Rng::normal(double mean, double sd) {
  if (hasSpare_) {
    hasSpare_ = false;
    return mean + sd * spareNormal_;
  }
  double u = 0.0, v = 0.0, s = 0.0;
  do {
    u = 2.0 * uniform() - 1.0;
    v = 2.0 * uniform() - 1.0;
    s = u * u + v * v;
  } while (s >= 1.0 || s == 0.0);
  const double m = std::sqrt(-2.0 * std::log(s) / s);
  spareNormal_ = v * m;
  hasSpare_ = true;
  return mean + sd * u * m;
}

double Rng::exponential(double mean) { return -mean * std::log(uniform()); }

double Rng::gamma(double shape, double scale) {
  if (!(shape > 0.0) || !(scale > 0.0))
    throw std::invalid_argument("Rng::gamma: shape and scale must be positive");
  if (shape < 1.0)
    return gamma(shape + 1.0, scale) * std::pow(uniform(), 1.0 / shape);
  const double d = shape - 1.0 / 3.0;
  const double c = 1.0 / std::sqrt(9.0 * d);
  for (;;) {
    double x = 0.0, v = 0.0;
    do {
      x = normal();
      v = 1.0 + c * x;
    } while (v <= 0.0);
    v = v * v * v;
    const double u = uniform();
    if (u < 1.0 - 0.0331 * x * x * x * x)
      return d * v * scale;
    if (std::log(u) < 0.5 * x * x + d * (1.0 - v + std::log(v)))
      return d * v * scale;
  }
}

int Rng::poisson(double mean) {
  if (!(mean >= 0.0))
    throw std::invalid_argument("Rng::poisson: mean must be non-negative");
  if (mean == 0.0)
    return 0;
  return mean < 10.0 ? poissonKnuth(mean) : poissonPtrs(mean);
}

int Rng::poissonKnuth(double mean) {
  const double limit = std::exp(-mean);
  int k = 0;
  double p = uniform();
  while (p > limit) {
    ++k;
    p *= uniform();
  }
  return k;
}

int Rng::poissonPtrs(double mean) {
  // W. Hörmann, "The transformed rejection method for generating Poisson random variables",
  // Insurance: Mathematics and Economics 12 (1993) 39–45; constants as published.
  const double slam = std::sqrt(mean);
  const double loglam = std::log(mean);
  const double b = 0.931 + 2.53 * slam;
  const double a = -0.059 + 0.02483 * b;
  const double invalpha = 1.1239 + 1.1328 / (b - 3.4);
  const double vr = 0.9277 - 3.6224 / (b - 2.0);
  for (;;) {
    const double u = uniform() - 0.5;
    const double v = uniform();
    const double us = 0.5 - std::fabs(u);
    const double k = std::floor((2.0 * a / us + b) * u + mean + 0.43);
    if (us >= 0.07 && v <= vr)
      return static_cast<int>(k);
    if (k < 0.0 || (us < 0.013 && v > us))
      continue;
    if (std::log(v) + std::log(invalpha) - std::log(a / (us * us) + b) <=
        -mean + k * loglam - std::lgamma(k + 1.0))
      return static_cast<int>(k);
  }
}

int Rng::negativeBinomial(double mean, double shape) {
  if (mean <= 0.0)
    return 0;
  return poisson(gamma(shape, mean / shape));
}

std::size_t Rng::choose(std::span<const double> weights) {
  double total = 0.0;
  for (double w : weights)
    total += w;
  if (weights.empty() || !(total > 0.0))
    throw std::invalid_argument("Rng::choose: weights must have a positive sum");
  const double x = uniform() * total;
  double acc = 0.0;
  for (std::size_t i = 0; i < weights.size(); ++i) {
    acc += weights[i];
    if (x < acc)
      return i;
  }
  // Rounding in the running sum can leave x just above it: the last positive weight wins.
  for (std::size_t i = weights.size(); i-- > 0;)
    if (weights[i] > 0.0)
      return i;
  return weights.size() - 1;
}

} // namespace cb
