// Distribution arithmetic for demand against capacity (brief section 6; check-values.md §1, §3,
// §7): the standard normal and its loss function, and the Poisson and binomial forms. Thin
// wrappers over Boost.Math so every caller uses one set of names and one set of edge rules.
#pragma once

namespace cb {

/// φ(z), Φ(z) and Φ⁻¹(p) of the standard normal. normalQuantile throws std::domain_error unless
/// 0 < p < 1; the others throw std::domain_error for a NaN z and give the limits for z = ±∞.
double normalPdf(double z);
double normalCdf(double z);
double normalQuantile(double p);
/// Standard normal loss L(z) = φ(z) − z(1 − Φ(z)) = E[(Z − z)+]. Example: L(0) = 0.3989422804.
double normalLoss(double z);

/// What capacity (or a protection level) C does to demand D.
struct CapacityOutcome {
  double sales = 0; ///< E[min(D, C)]: rooms sold (constrained demand)
  double spill = 0; ///< E[(D − C)+]: demand turned away
  double empty = 0; ///< E[(C − D)+]: rooms left empty
  double pFull = 0; ///< P(D ≥ C): sell-out probability
};

/// D ~ Normal(mu, sigma). sigma = 0 is the certain case (D = mu). Throws std::invalid_argument
/// for sigma < 0 or a non-finite input. Example: mu 100, sigma 20, C 120 → spill 1.666309,
/// sales 98.333691, empty 21.666309 (check-values.md §3).
CapacityOutcome normalAgainstCapacity(double mu, double sigma, double capacity);
/// D ~ Poisson(mean), integer capacity; sales by the finite sum Σ_{k<C} P(D > k). Throws
/// std::invalid_argument for a negative or non-finite mean or capacity < 0; mean 0 is D = 0.
/// Example: mean 27.3, C 24 → sales 23.203932, spill
/// 4.096068 (check-values.md §1a).
CapacityOutcome poissonAgainstCapacity(double mean, int capacity);

/// P(X ≤ k) for X ~ Poisson(mean); 0 for k < 0. Mean as for poissonAgainstCapacity.
double poissonCdf(int k, double mean);
/// Smallest k ≥ 0 with P(X ≤ k) ≥ p (0 < p < 1, else std::domain_error). Example: mean 27.3,
/// p 0.293333 → 24.
int poissonQuantile(double p, double mean);
/// P(X ≤ k) for X ~ Binomial(n, prob); 0 for k < 0, 1 for k ≥ n. Throws std::invalid_argument
/// for n < 0 or prob outside [0, 1].
double binomialCdf(int k, int n, double prob);

} // namespace cb
