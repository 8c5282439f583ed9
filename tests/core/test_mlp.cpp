// The small multilayer perceptron: gradient against finite differences, determinism with the
// seed, and that it learns a known function from noisy samples.
#include "core/mlp.h"

#include "core/rng.h"

#include <gtest/gtest.h>

#include <cmath>

namespace {

Eigen::MatrixXd randomMatrix(cb::Rng &rng, Eigen::Index rows, Eigen::Index cols) {
  Eigen::MatrixXd m(rows, cols);
  for (Eigen::Index j = 0; j < cols; ++j)
    for (Eigen::Index i = 0; i < rows; ++i)
      m(i, j) = rng.uniform(-1.5, 1.5);
  return m;
}

/// y = 2x + 1 + N(0, 0.1²) noise at x uniform on (−1, 1).
void linearData(std::uint64_t seed, int n, Eigen::MatrixXd &x, Eigen::VectorXd &y) {
  cb::Rng rng(seed);
  x.resize(n, 1);
  y.resize(n);
  for (int i = 0; i < n; ++i) {
    x(i, 0) = rng.uniform(-1.0, 1.0);
    y(i) = 2.0 * x(i, 0) + 1.0 + rng.normal(0.0, 0.1);
  }
}

} // namespace

TEST(Mlp, GradientMatchesCentralDifferences) {
  cb::Rng rng(11);
  cb::Mlp net(3, 4, 5);
  // Move the parameters away from the initialisation so the biases are not all 0.
  net.setParameters(randomMatrix(rng, net.parameterCount(), 1).col(0));
  const Eigen::MatrixXd z = randomMatrix(rng, 3, 10);
  const Eigen::VectorXd y = randomMatrix(rng, 10, 1).col(0);
  const double l2 = 0.1;
  Eigen::VectorXd g;
  net.loss(z, y, l2, &g);
  ASSERT_EQ(g.size(), 3 * 4 + 4 + 4 + 1);
  const Eigen::VectorXd p = net.parameters();
  // Central differences have O(ε²) truncation error and O(1e-16/ε) rounding error; ε = 1e-5
  // balances them near 1e-10, so 1e-7 leaves a wide margin and still catches any wrong term.
  const double eps = 1e-5;
  for (Eigen::Index k = 0; k < p.size(); ++k) {
    Eigen::VectorXd q = p;
    q(k) += eps;
    net.setParameters(q);
    const double up = net.loss(z, y, l2);
    q(k) -= 2 * eps;
    net.setParameters(q);
    const double down = net.loss(z, y, l2);
    EXPECT_NEAR(g(k), (up - down) / (2 * eps), 1e-7) << "parameter " << k;
  }
}

TEST(Mlp, ParametersRoundTrip) {
  cb::Mlp net(2, 3, 1);
  Eigen::VectorXd p = Eigen::VectorXd::LinSpaced(net.parameterCount(), -1.0, 1.0);
  net.setParameters(p);
  EXPECT_EQ(net.parameters(), p);
  EXPECT_THROW(net.setParameters(Eigen::VectorXd::Zero(3)), std::invalid_argument);
}

TEST(Mlp, SameSeedSameNetwork) {
  Eigen::MatrixXd x;
  Eigen::VectorXd y;
  linearData(3, 100, x, y);
  cb::Mlp a(1, 8, 42), b(1, 8, 42), c(1, 8, 43);
  EXPECT_EQ(a.parameters(), b.parameters());
  EXPECT_NE(a.parameters(), c.parameters());
  a.train(x, y);
  b.train(x, y);
  // Bit for bit: the same operations in the same order.
  EXPECT_EQ(a.parameters(), b.parameters());
  EXPECT_EQ(a.predict(x), b.predict(x));
}

TEST(Mlp, LearnsALinearFunctionFromNoisySamples) {
  Eigen::MatrixXd x;
  Eigen::VectorXd y;
  linearData(20261201, 200, x, y);
  cb::Mlp net(1, 8, 7);
  const double trainLoss = net.train(x, y);
  // Standardised loss: half the unexplained share of the variance. The noise alone leaves
  // var(noise)/var(y) = 0.01 / (4/3 + 0.01) ≈ 0.0074, so a fit near the noise floor is ≈ 0.0037.
  EXPECT_LT(trainLoss, 0.006);
  // Against the noise-free line on a grid: the least-squares line itself is off by about
  // σ/√n ≈ 0.007 here; allow half the noise σ (0.05) for the tanh curvature, the weight decay's
  // shrinkage and the fixed 300 epochs (we measured 0.025). A net that had not learned the slope
  // would miss by far more (sd of y ≈ 1.15).
  Eigen::MatrixXd grid = Eigen::VectorXd::LinSpaced(41, -0.9, 0.9);
  Eigen::VectorXd truth = (2.0 * grid.col(0).array() + 1.0).matrix();
  const double rmse = std::sqrt((net.predict(grid) - truth).squaredNorm() / 41.0);
  EXPECT_LT(rmse, 0.05);
}

TEST(Mlp, LearnsACurveALineCannot) {
  // y = x² on (−1, 1): a straight line leaves RMSE ≈ 0.30 (var of x² = 1/5 − 1/9 = 4/45);
  // eight tanh units can bend, so a bound of 0.05 shows the hidden layer is doing its work.
  cb::Rng rng(5);
  const int n = 200;
  Eigen::MatrixXd x(n, 1);
  Eigen::VectorXd y(n);
  for (int i = 0; i < n; ++i) {
    x(i, 0) = rng.uniform(-1.0, 1.0);
    y(i) = x(i, 0) * x(i, 0);
  }
  cb::Mlp net(1, 8, 9);
  cb::MlpTraining settings;
  settings.epochs = 1500;
  net.train(x, y, settings);
  const double rmse = std::sqrt((net.predict(x) - y).squaredNorm() / n);
  EXPECT_LT(rmse, 0.05);
}

TEST(Mlp, RejectsMismatchedData) {
  cb::Mlp net(2, 3, 1);
  EXPECT_THROW(net.train(Eigen::MatrixXd::Zero(4, 3), Eigen::VectorXd::Zero(4)),
               std::invalid_argument);
  EXPECT_THROW(net.train(Eigen::MatrixXd::Zero(4, 2), Eigen::VectorXd::Zero(3)),
               std::invalid_argument);
  EXPECT_THROW(cb::Mlp(0, 3, 1), std::invalid_argument);
}
