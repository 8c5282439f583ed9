// Portable deterministic random numbers: the same seed gives the same draws everywhere.
#pragma once

#include <cstddef>
#include <cstdint>
#include <random>
#include <span>

namespace cb {

/// Seeded random source for the simulator and every seeded method.
///
/// Why not the std:: distributions: the standard fixes the raw sequence of std::mt19937_64
/// ([rand.predef]) but leaves the algorithm of every distribution (uniform_real_distribution,
/// normal_distribution, poisson_distribution, …) to the implementation, so libstdc++, libc++
/// and MSVC give different numbers for one seed and committed sample files would not be
/// reproducible. Boost.Random's distributions are the same on every platform but have changed
/// algorithm between Boost releases, and the sample must not change with a Debian upgrade.
/// So only the engine's raw 64-bit output is used; every transform below is written out here.
/// Caveat: the transforms call std::log/exp/sqrt/pow/lgamma. sqrt is exactly rounded by
/// IEEE 754; the others are not required to be, so another maths library could, rarely, move
/// a draw across a threshold.
///
/// Example: `cb::Rng rng(42); int n = rng.poisson(3.5); double x = rng.normal(0, 1);`
class Rng {
public:
  explicit Rng(std::uint64_t seed) : engine_(seed) {}

  /// The engine's raw output (fixed by the C++ standard).
  std::uint64_t next() { return engine_(); }
  /// Uniform on the open interval (0, 1) from the top 53 bits; never 0 or 1, so log() is safe.
  double uniform();
  /// Uniform on (lo, hi).
  double uniform(double lo, double hi) { return lo + (hi - lo) * uniform(); }
  /// Uniform integer on [lo, hi], both inclusive; unbiased (rejection of the ragged top).
  int uniformInt(int lo, int hi);
  /// True with probability p.
  bool bernoulli(double p) { return uniform() < p; }
  /// Normal by the Marsaglia polar method; the second value of each pair is kept for the
  /// next call.
  double normal(double mean = 0.0, double sd = 1.0);
  /// Exponential with the given mean (inversion).
  double exponential(double mean);
  /// Gamma(shape, scale), mean shape × scale, by Marsaglia & Tsang (2000); for shape < 1
  /// their boost gamma(shape + 1) × U^(1/shape).
  double gamma(double shape, double scale);
  /// Poisson: Knuth's multiplication method below mean 10 (cost grows with the mean), the
  /// PTRS transformed rejection of Hörmann (1993) from 10 on (constant cost), the same split
  /// as NumPy's generator.
  int poisson(double mean);
  /// Negative binomial as a gamma–Poisson mixture: mean `mean`, variance mean + mean²/shape
  /// (over-dispersed counts; shape → ∞ gives Poisson).
  int negativeBinomial(double mean, double shape);
  /// Index i drawn with probability weights[i] / Σ weights (weights ≥ 0, sum > 0).
  std::size_t choose(std::span<const double> weights);

private:
  int poissonKnuth(double mean);
  int poissonPtrs(double mean);

  std::mt19937_64 engine_;
  double spareNormal_ = 0.0;
  bool hasSpare_ = false;
};

} // namespace cb
