// Type-7 quantiles against R (tests/reference/quantile_type7.R, run with R 4.2.2 from Debian's
// r-base-core; R's quantile() default is Hyndman & Fan 1996 definition 7).
#include "core/quantile.h"

#include <gtest/gtest.h>

#include <random>
#include <stdexcept>
#include <vector>

namespace {

const std::vector<double> kProbs = {0, 0.1, 0.25, 0.5, 0.75, 0.9, 1};

// R computes (1 − h)·a + h·b, we compute a + h·(b − a): equal up to rounding in the last bits.
constexpr double kTol = 1e-12;

void expectAll(const std::vector<double> &sample, const std::vector<double> &fromR) {
  std::vector<double> q = cb::quantilesType7(sample, kProbs);
  ASSERT_EQ(q.size(), fromR.size());
  for (std::size_t i = 0; i < q.size(); ++i) {
    EXPECT_NEAR(q[i], fromR[i], kTol) << "p = " << kProbs[i];
    EXPECT_NEAR(cb::quantileType7(sample, kProbs[i]), fromR[i], kTol) << "p = " << kProbs[i];
  }
}

} // namespace

TEST(Quantile, MatchesR) {
  // Values printed by tests/reference/quantile_type7.R (R 4.2.2).
  expectAll({1, 2, 3, 4}, {1, 1.3, 1.75, 2.5, 3.25, 3.7000000000000002, 4});
  expectAll({12, 3, 7, 7, 25, 0, 18, 4, 9},
            {0, 2.4000000000000004, 4, 7, 12, 19.399999999999995, 25});
  expectAll({42}, {42, 42, 42, 42, 42, 42, 42});
  expectAll({-5, 5}, {-5, -3.9999999999999996, -2.5, 0, 2.5, 3.9999999999999996, 5});
  expectAll({0.5, 2.25, -1.75, 3.125, 10, 7.5, 7.5},
            {-1.75, -0.3999999999999998, 1.375, 3.125, 7.5, 8.5, 10});
}

TEST(Quantile, SeveralAtOnceGiveWhatOneAtATimeGives) {
  // quantilesType7 selects the ranks it reads; quantileType7 sorts. Same values, bit for bit, on
  // samples with many ties and on probabilities in any order, repeated or between ranks.
  std::mt19937 gen(7);
  const std::vector<double> probs = {0.9, 0.1, 0.5, 0.1, 1, 0, 0.333, 0.999, 0.25};
  for (int trial = 0; trial < 200; ++trial) {
    std::uniform_int_distribution<int> size(1, 300), value(-20, 20);
    std::vector<double> sample(static_cast<std::size_t>(size(gen)));
    for (double &v : sample)
      v = value(gen) / 4.0;
    const std::vector<double> q = cb::quantilesType7(sample, probs);
    ASSERT_EQ(q.size(), probs.size());
    for (std::size_t i = 0; i < probs.size(); ++i)
      ASSERT_EQ(q[i], cb::quantileType7(sample, probs[i])) << trial << " p = " << probs[i];
  }
  EXPECT_THROW(cb::quantilesType7({}, probs), std::invalid_argument);
  EXPECT_TRUE(cb::quantilesType7({}, std::vector<double>{}).empty()); // as the sort gave
  EXPECT_THROW(cb::quantilesType7({1, 2}, std::vector<double>{0.5, 1.5}), std::invalid_argument);
}

TEST(Quantile, CountedSampleMatchesRAndTheExpandedSample) {
  // The "leads" sample of the R script: 0 ×3, 2 ×4, 5 ×1, 14 ×6, 40 ×2 (R 4.2.2).
  const std::vector<double> fromR = {0, 0, 2, 9.5, 14, 27, 40};
  std::vector<std::pair<double, std::int64_t>> counted = {{14, 6}, {0, 3}, {40, 2}, {2, 4}, {5, 1}};
  std::vector<double> expanded;
  for (const auto &[v, c] : counted)
    expanded.insert(expanded.end(), static_cast<std::size_t>(c), v);
  for (std::size_t i = 0; i < kProbs.size(); ++i) {
    EXPECT_NEAR(cb::quantileType7Counts(counted, kProbs[i]), fromR[i], kTol) << kProbs[i];
    EXPECT_DOUBLE_EQ(cb::quantileType7Counts(counted, kProbs[i]),
                     cb::quantileType7(expanded, kProbs[i]));
  }
  // Zero and negative counts carry no weight.
  counted.push_back({1000, 0});
  counted.push_back({-1000, -3});
  EXPECT_NEAR(cb::quantileType7Counts(counted, 1.0), 40, kTol);
  EXPECT_NEAR(cb::quantileType7Counts(counted, 0.0), 0, kTol);
}

TEST(Quantile, CountedAgreesWithExpansionOnManyProbabilities) {
  std::vector<std::pair<double, std::int64_t>> counted = {{3, 1}, {1, 2}, {7, 5}, {2, 1}};
  std::vector<double> expanded = {1, 1, 2, 3, 7, 7, 7, 7, 7};
  for (int k = 0; k <= 100; ++k) {
    double p = k / 100.0;
    EXPECT_DOUBLE_EQ(cb::quantileType7Counts(counted, p), cb::quantileType7(expanded, p)) << p;
  }
}

TEST(Quantile, RefusesEmptySamplesAndBadProbabilities) {
  EXPECT_THROW(cb::quantileType7({}, 0.5), std::invalid_argument);
  EXPECT_THROW(cb::quantileType7({1, 2}, -0.1), std::invalid_argument);
  EXPECT_THROW(cb::quantileType7({1, 2}, 1.5), std::invalid_argument);
  EXPECT_THROW(cb::quantileType7Counts({{1.0, 0}}, 0.5), std::invalid_argument);
  EXPECT_THROW(cb::quantileType7Counts({{1.0, 2}}, 2.0), std::invalid_argument);
}
