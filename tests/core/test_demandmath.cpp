// Distribution arithmetic against check-values.md §3 (standard normal loss, spill and sales),
// §1a (Poisson demand against a protection level) and §7c (binomial), plus the edge rules of
// core/demandmath.h (certain demand, no demand, far tails, bad input).
#include "core/demandmath.h"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <stdexcept>

namespace {

struct LossRow {
  double z, phi, cdf, loss;
};

// check-values.md §3 table: computed with scipy, identical in R
// (dnorm(z) - z*pnorm(z, lower.tail=FALSE)); tolerance 1e-9 absolute.
constexpr LossRow kLossTable[] = {
    {-3.00, 0.0044318484, 0.0013498980, 3.0003821543},
    {-2.00, 0.0539909665, 0.0227501319, 2.0084907026},
    {-1.50, 0.1295175957, 0.0668072013, 1.5293067938},
    {-1.00, 0.2419707245, 0.1586552539, 1.0833154706},
    {-0.50, 0.3520653268, 0.3085375387, 0.6977965574},
    {0.00, 0.3989422804, 0.5000000000, 0.3989422804},
    {0.25, 0.3866681168, 0.5987063257, 0.2863446982},
    {0.50, 0.3520653268, 0.6914624613, 0.1977965574},
    {0.75, 0.3011374322, 0.7733726476, 0.1311669179},
    {1.00, 0.2419707245, 0.8413447461, 0.0833154706},
    {1.50, 0.1295175957, 0.9331927987, 0.0293067938},
    {2.00, 0.0539909665, 0.9772498681, 0.0084907026},
    {2.50, 0.0175283005, 0.9937903347, 0.0020041372},
    {3.00, 0.0044318484, 0.9986501020, 0.0003821543},
};

TEST(DemandMath, StandardNormalAndLossTable) {
  for (const LossRow &r : kLossTable) {
    SCOPED_TRACE(r.z);
    EXPECT_NEAR(cb::normalPdf(r.z), r.phi, 1e-9);   // check-values.md §3
    EXPECT_NEAR(cb::normalCdf(r.z), r.cdf, 1e-9);   // check-values.md §3
    EXPECT_NEAR(cb::normalLoss(r.z), r.loss, 1e-9); // check-values.md §3
    // L(−z) = L(z) + z (check-values.md §3, the identity stated there).
    EXPECT_NEAR(cb::normalLoss(-r.z), cb::normalLoss(r.z) + r.z, 1e-12);
  }
}

TEST(DemandMath, NormalQuantileMatchesPublishedZ) {
  // check-values.md §1b (computed with scipy, checked with R qnorm), to 1e-6.
  EXPECT_NEAR(cb::normalQuantile(0.4), -0.253347, 1e-6);
  EXPECT_NEAR(cb::normalQuantile(1.0 - 225.0 / 650.0), 0.395725, 1e-6);
  EXPECT_NEAR(cb::normalQuantile(1.0 - 375.0 / 675.0), -0.139710, 1e-6);
  // check-values.md §7a, computed z of CR = 80/280.
  EXPECT_NEAR(cb::normalQuantile(80.0 / 280.0), -0.565949, 1e-6);
  EXPECT_THROW(cb::normalQuantile(0.0), std::domain_error);
  EXPECT_THROW(cb::normalQuantile(1.0), std::domain_error);
  EXPECT_THROW(cb::normalQuantile(std::nan("")), std::domain_error);
}

struct SpillRow {
  double mu, sigma, capacity, spill, sales, empty;
};

// check-values.md §3 spill / sales table (computed, checked by numerical integration to 1e-6);
// tolerance 1e-6 relative.
constexpr SpillRow kSpillTable[] = {
    {100, 20, 100, 7.978846, 92.021154, 7.978846},
    {100, 20, 120, 1.666309, 98.333691, 21.666309},
    {100, 20, 80, 21.666309, 78.333691, 1.666309},
    {80, 35, 85, 11.605217, 68.394783, 16.605217},
};

void expectRel(double got, double want, double rel) {
  EXPECT_NEAR(got, want, rel * std::abs(want)) << "want " << want;
}

TEST(DemandMath, NormalSpillAndSalesTable) {
  for (const SpillRow &r : kSpillTable) {
    SCOPED_TRACE(r.capacity);
    const cb::CapacityOutcome o = cb::normalAgainstCapacity(r.mu, r.sigma, r.capacity);
    expectRel(o.spill, r.spill, 1e-6); // check-values.md §3
    expectRel(o.sales, r.sales, 1e-6); // check-values.md §3
    expectRel(o.empty, r.empty, 1e-6); // check-values.md §3
  }
  // P(D ≥ C) = 1 − Φ(z), z = (C − mu)/sigma, with Φ from the §3 table (z = 0, 1, −1).
  EXPECT_NEAR(cb::normalAgainstCapacity(100, 20, 100).pFull, 0.5, 1e-12);
  EXPECT_NEAR(cb::normalAgainstCapacity(100, 20, 120).pFull, 1 - 0.8413447461, 1e-9); // §3, z=1
  EXPECT_NEAR(cb::normalAgainstCapacity(100, 20, 80).pFull, 1 - 0.1586552539, 1e-9);  // §3, z=−1
}

TEST(DemandMath, NormalCertainDemandAndFarTails) {
  // sigma = 0: D = mu exactly (header rule).
  cb::CapacityOutcome o = cb::normalAgainstCapacity(90, 0, 100);
  EXPECT_EQ(o.sales, 90);
  EXPECT_EQ(o.spill, 0);
  EXPECT_EQ(o.empty, 10);
  EXPECT_EQ(o.pFull, 0);
  o = cb::normalAgainstCapacity(100, 0, 100);
  EXPECT_EQ(o.sales, 100);
  EXPECT_EQ(o.pFull, 1); // P(D ≥ C) with D = C
  o = cb::normalAgainstCapacity(130, 0, 100);
  EXPECT_EQ(o.spill, 30);
  EXPECT_EQ(o.empty, 0);
  // Forty sds either side: finite, never negative, sales + spill = mu (identity E[min] +
  // E[(D − C)+] = E[D]).
  for (double capacity : {-700.0, 900.0}) {
    o = cb::normalAgainstCapacity(100, 20, capacity);
    EXPECT_TRUE(std::isfinite(o.sales) && std::isfinite(o.spill) && std::isfinite(o.empty));
    EXPECT_GE(o.spill, 0);
    EXPECT_GE(o.empty, 0);
    EXPECT_NEAR(o.sales + o.spill, 100, 1e-9);
  }
  EXPECT_EQ(cb::normalLoss(50), 0);
  EXPECT_NEAR(cb::normalLoss(-50), 50, 1e-12);
  EXPECT_EQ(cb::normalLoss(std::numeric_limits<double>::infinity()), 0);
  EXPECT_THROW(cb::normalAgainstCapacity(100, -1, 100), std::invalid_argument);
  EXPECT_THROW(cb::normalAgainstCapacity(std::nan(""), 1, 100), std::invalid_argument);
  EXPECT_THROW(cb::normalLoss(std::nan("")), std::domain_error);
}

TEST(DemandMath, PoissonAgainstProtectionLevel) {
  // check-values.md §1a, Cachon & Terwiesch 118-room example, Poisson mean 27.3 against the
  // protection level 24; E[min(D,24)] = 23.203932 and E[(D-24)+] = 4.096068 recomputed with
  // scipy there (confirmed-in-source example, computed values).
  const cb::CapacityOutcome o = cb::poissonAgainstCapacity(27.3, 24);
  expectRel(o.sales, 23.203932, 1e-6);
  expectRel(o.spill, 4.096068, 1e-6);
  EXPECT_NEAR(o.empty, 24 - o.sales, 1e-12);             // definition E[(C − D)+]
  EXPECT_NEAR(o.pFull, 1 - 0.238121, 5e-7);              // P(D ≥ 24) = 1 − F(23), §1a
  EXPECT_NEAR(cb::poissonCdf(23, 27.3), 0.238121, 5e-7); // check-values.md §1a
  EXPECT_NEAR(cb::poissonCdf(24, 27.3), 0.304032, 5e-7); // check-values.md §1a
  EXPECT_EQ(cb::poissonQuantile(0.293333, 27.3), 24);    // check-values.md §1a
  EXPECT_EQ(cb::poissonQuantile((225.0 - 159.0) / 225.0, 27.3), 24);
  // check-values.md §7b: Poisson mean 8.5, F(6) = 0.256178, F(7) = 0.385597.
  EXPECT_NEAR(cb::poissonCdf(6, 8.5), 0.256178, 5e-7);
  EXPECT_NEAR(cb::poissonCdf(7, 8.5), 0.385597, 5e-7);
  // The quantile is the smallest k with F(k) ≥ p, exactly at the boundary too.
  EXPECT_EQ(cb::poissonQuantile(cb::poissonCdf(7, 8.5), 8.5), 7);
  EXPECT_EQ(cb::poissonQuantile(std::nextafter(cb::poissonCdf(7, 8.5), 1.0), 8.5), 8);
}

TEST(DemandMath, PoissonEdges) {
  // sales + spill = mean (identity), also far above the mean where the spill is tiny but must
  // stay positive and finite.
  for (int c : {0, 1, 2, 10, 27, 60, 200}) {
    SCOPED_TRACE(c);
    const cb::CapacityOutcome o = cb::poissonAgainstCapacity(27.3, c);
    EXPECT_NEAR(o.sales + o.spill, 27.3, 1e-9);
    EXPECT_GE(o.spill, 0);
    EXPECT_GE(o.empty, 0);
    EXPECT_TRUE(std::isfinite(o.pFull));
  }
  // C = 1: E[min(D,1)] = P(D ≥ 1) = 1 − e^−mean (definition).
  EXPECT_NEAR(cb::poissonAgainstCapacity(2.0, 1).sales, 1 - std::exp(-2.0), 1e-14);
  EXPECT_GT(cb::poissonAgainstCapacity(27.3, 60).spill, 0);
  // Mean 0: no demand.
  const cb::CapacityOutcome none = cb::poissonAgainstCapacity(0, 5);
  EXPECT_EQ(none.sales, 0);
  EXPECT_EQ(none.spill, 0);
  EXPECT_EQ(none.empty, 5);
  EXPECT_EQ(none.pFull, 0);
  EXPECT_EQ(cb::poissonQuantile(0.9, 0), 0);
  EXPECT_EQ(cb::poissonCdf(-1, 3), 0);
  EXPECT_THROW(cb::poissonAgainstCapacity(-1, 5), std::invalid_argument);
  EXPECT_THROW(cb::poissonAgainstCapacity(3, -1), std::invalid_argument);
  EXPECT_THROW(cb::poissonQuantile(1.0, 3), std::domain_error);
}

TEST(DemandMath, BinomialCdf) {
  // check-values.md §7c (exact binomial, computed): 341 reservations, show prob 0.85:
  // P(shows ≤ 300) = 0.950271; 342 → 0.934238; 215 at 0.9: P(shows ≤ 200) = 0.950358.
  EXPECT_NEAR(cb::binomialCdf(300, 341, 0.85), 0.950271, 5e-7);
  EXPECT_NEAR(cb::binomialCdf(300, 342, 0.85), 0.934238, 5e-7);
  EXPECT_NEAR(cb::binomialCdf(200, 215, 0.9), 0.950358, 5e-7);
  EXPECT_EQ(cb::binomialCdf(-1, 10, 0.5), 0);
  EXPECT_EQ(cb::binomialCdf(10, 10, 0.5), 1);
  EXPECT_EQ(cb::binomialCdf(3, 10, 0.0), 1);
  EXPECT_EQ(cb::binomialCdf(3, 10, 1.0), 0);
  EXPECT_NEAR(cb::binomialCdf(0, 3, 0.5), 0.125, 1e-15); // (1/2)^3 by hand
  EXPECT_THROW(cb::binomialCdf(3, 10, 1.5), std::invalid_argument);
  EXPECT_THROW(cb::binomialCdf(3, -1, 0.5), std::invalid_argument);
}

} // namespace
