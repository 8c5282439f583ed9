// AR(p) by OLS against R 4.2.2 (lm on the lagged design, cross-checked with ar.ols, and
// predict.ar) on R's built-in LakeHuron series; reference produced by
// tests/reference/ar_lakehuron.R, output committed as tests/reference/ar_lakehuron.csv.
#include "core/autoregression.h"

#include "testsupport.h"

#include <gtest/gtest.h>

#include <fstream>
#include <map>
#include <sstream>
#include <string>
#include <tuple>
#include <vector>

using cb::AutoRegression;

namespace {

// R datasets::LakeHuron, level of Lake Huron in feet, 1875–1972 (public domain).
const std::vector<double> lakeHuron = {
    580.38, 581.86, 580.97, 580.80, 579.79, 580.39, 580.42, 580.82, 581.40, 581.32, 581.44,
    581.68, 581.17, 580.53, 580.01, 579.91, 579.14, 579.16, 579.55, 579.67, 578.44, 578.24,
    579.10, 579.09, 579.35, 578.82, 579.32, 579.01, 579.00, 579.80, 579.83, 579.72, 579.89,
    580.01, 579.37, 578.69, 578.19, 578.67, 579.55, 578.92, 578.09, 579.37, 580.13, 580.14,
    579.51, 579.24, 578.66, 578.86, 578.05, 577.79, 576.75, 576.75, 577.82, 578.64, 580.58,
    579.48, 577.38, 576.90, 576.94, 576.24, 576.84, 576.85, 576.90, 577.79, 578.18, 577.51,
    577.23, 578.42, 579.61, 579.05, 579.26, 579.22, 579.38, 579.10, 577.95, 578.12, 579.75,
    580.85, 580.41, 579.96, 579.61, 578.76, 578.18, 577.21, 577.13, 579.10, 578.25, 577.91,
    576.89, 575.96, 576.80, 577.68, 578.38, 578.52, 579.74, 579.31, 579.89, 579.96};

using Key = std::tuple<std::string, int, int>;
const std::map<Key, double> &ref() {
  static const auto r = [] {
    std::map<Key, double> out;
    std::ifstream in(cbtest::sourceDir() / "tests/reference/ar_lakehuron.csv");
    std::string line;
    std::getline(in, line);
    while (std::getline(in, line)) {
      std::stringstream ss(line);
      std::string what, p, i, v;
      std::getline(ss, what, ',');
      std::getline(ss, p, ',');
      std::getline(ss, i, ',');
      std::getline(ss, v, ',');
      if (what != "r_version")
        out[{what, std::stoi(p), std::stoi(i)}] = std::stod(v);
    }
    return out;
  }();
  return r;
}

double r(const std::string &what, int p, int i) {
  auto it = ref().find({what, p, i});
  if (it == ref().end())
    throw std::runtime_error("no R reference " + what);
  return it->second;
}

} // namespace

TEST(AutoRegression, OlsCoefficientsMatchR) {
  ASSERT_EQ(lakeHuron.size(), 98u);
  for (int p = 1; p <= 3; ++p) {
    const auto fit = AutoRegression::fit(lakeHuron, p);
    EXPECT_EQ(fit.rows, 98 - p);
    // R 4.2.2 lm(X[,1] ~ X[,-1]) with X = embed(LakeHuron, p + 1) (= ar.ols slopes).
    EXPECT_NEAR(fit.intercept, r("intercept", p, 0), 1e-6) << p;
    for (int j = 1; j <= p; ++j)
      EXPECT_NEAR(fit.coefs[static_cast<std::size_t>(j - 1)], r("coef", p, j), 1e-6) << p << j;
    EXPECT_NEAR(fit.sigma2, r("sigma2", p, 0), 1e-9) << p; // RSS / rows from lm residuals
    // R predict(ar.ols(...), n.ahead = 5): the recursion iterated beyond the data.
    for (int h = 1; h <= 5; ++h)
      EXPECT_NEAR(AutoRegression::forecast(fit, lakeHuron, h), r("forecast", p, h), 1e-6)
          << p << " h=" << h;
  }
  // The values themselves, so a broken reference file cannot pass silently (R 4.2.2, AR(2)).
  EXPECT_NEAR(AutoRegression::fit(lakeHuron, 2).coefs[0], 1.021731582515508, 1e-6);
  EXPECT_NEAR(AutoRegression::fit(lakeHuron, 2).coefs[1], -0.2375742150788513, 1e-6);
}

TEST(AutoRegression, OrderByAicOnCommonRowsMatchesR) {
  // The same AIC, n log(RSS/n) + 2(p + 1) on rows t > 6, computed in R from lm residuals.
  for (int p = 1; p <= 6; ++p)
    EXPECT_NEAR(AutoRegression::fit(lakeHuron, p, 6).aic, r("aic_common", p, 0), 1e-8) << p;
  const auto best = AutoRegression::fitByAic(lakeHuron, 6);
  EXPECT_EQ(best.order, static_cast<int>(r("aic_order", 6, 0))); // R: 2
  EXPECT_EQ(best.order, 2);
  EXPECT_EQ(best.rows, 96); // refitted on all its rows
  EXPECT_NEAR(best.coefs[0], r("coef", 2, 1), 1e-6);
}

TEST(AutoRegression, HandWorkedRecursionAndGuards) {
  // x_t = 1 + 0.5 x_{t−1} exactly: OLS must recover c = 1, φ = 0.5 (zero residuals), and the
  // forecast from x_n = 2 + 2^{−9} … continues the same halving of the distance to 2.
  std::vector<double> x{10};
  for (int i = 0; i < 9; ++i)
    x.push_back(1 + 0.5 * x.back());
  const auto fit = AutoRegression::fit(x, 1);
  EXPECT_NEAR(fit.intercept, 1, 1e-9);
  EXPECT_NEAR(fit.coefs[0], 0.5, 1e-9);
  EXPECT_NEAR(AutoRegression::forecast(fit, x, 1), 1 + 0.5 * x.back(), 1e-9);
  EXPECT_NEAR(AutoRegression::forecast(fit, x, 2), 1 + 0.5 * (1 + 0.5 * x.back()), 1e-9);
  EXPECT_THROW(AutoRegression::fit(std::span(x).first(3), 2), std::invalid_argument);
  EXPECT_THROW(AutoRegression::fitByAic(std::span(x).first(5), 3), std::invalid_argument);
  EXPECT_THROW(AutoRegression::forecast(fit, x, 0), std::invalid_argument);
  // A short series lowers the largest order tried instead of failing: 10 values allow p ≤ 1.
  EXPECT_EQ(AutoRegression::fitByAic(x, 14).order, 1);
}
