// Error measures against the check values of Hyndman & Koehler (2006) computed with R's forecast
// package 8.20 (check-values.md section 6).
#include "core/accuracy.h"

#include <gtest/gtest.h>

#include <vector>

using cb::Accuracy;

namespace {

// check-values.md §6 (same 28 values as §8): train = y[1:21], test = y[22:28].
const std::vector<double> kY = {60, 62, 65, 70, 95,  110, 80, 63, 64, 68, 74, 99,  115, 83,
                                66, 68, 70, 77, 103, 118, 88, 70, 71, 74, 80, 106, 122, 90};

std::vector<double> train() { return {kY.begin(), kY.begin() + 21}; }
std::vector<double> test() { return {kY.begin() + 21, kY.end()}; }

} // namespace

TEST(Accuracy, NaiveForecastMatchesHyndmanKoehlerCheckValues) {
  // Source: check-values.md §6, R forecast 8.20 accuracy() of naive (last value 88):
  // ME −0.428571, RMSE 18.349776, MAE 15.857143, MAPE 17.949868, MASE 1.132653 (scale 14.0).
  const std::vector<double> fc(7, 88.0);
  const auto scale = cb::naiveScale(train(), 1);
  ASSERT_TRUE(scale);
  EXPECT_NEAR(*scale, 14.0, 1e-9);
  const Accuracy a = Accuracy::measure(fc, test(), scale);
  EXPECT_EQ(a.count, 7);
  EXPECT_NEAR(a.mae, 15.857143, 1e-6);
  EXPECT_NEAR(a.rmse, 18.349776, 1e-6);
  ASSERT_TRUE(a.mape);
  EXPECT_NEAR(*a.mape, 17.949868, 1e-6);
  // Our bias is forecast − final; H&K's ME is final − forecast.
  EXPECT_NEAR(a.bias, 0.428571, 1e-6);
  ASSERT_TRUE(a.mase);
  EXPECT_NEAR(*a.mase, 1.132653, 1e-6);
  // Exact fractions behind the printed figures: MAE = 111/7, MASE = 111/98.
  EXPECT_NEAR(a.mae, 111.0 / 7.0, 1e-12);
  EXPECT_NEAR(*a.mase, 111.0 / 98.0, 1e-12);
  // WAPE = Σ|e| / Σ final = 111 / 613 (our own measure; hand-worked).
  ASSERT_TRUE(a.wape);
  EXPECT_NEAR(*a.wape, 100.0 * 111.0 / 613.0, 1e-12);
}

TEST(Accuracy, SeasonalNaiveMatchesHyndmanKoehlerCheckValues) {
  // Source: check-values.md §6, seasonal naive m = 7 (forecast = y[15:21]): ME 3.285714,
  // RMSE 3.359422, MAE 3.285714, MAPE 3.918020, MASE 0.958333 (scale 3.428571).
  const std::vector<double> tr = train();
  const std::vector<double> fc(tr.end() - 7, tr.end());
  const auto scale = cb::naiveScale(tr, 7);
  ASSERT_TRUE(scale);
  EXPECT_NEAR(*scale, 3.428571, 1e-6);
  const Accuracy a = Accuracy::measure(fc, test(), scale);
  EXPECT_NEAR(a.mae, 3.285714, 1e-6);
  EXPECT_NEAR(a.rmse, 3.359422, 1e-6);
  EXPECT_NEAR(*a.mape, 3.918020, 1e-6);
  EXPECT_NEAR(a.bias, -3.285714, 1e-6); // ME 3.285714 with the opposite sign
  EXPECT_NEAR(*a.mase, 0.958333, 1e-6);
  EXPECT_NEAR(*a.mase, 23.0 / 24.0, 1e-12); // MAE 23/7 over scale 24/7
}

TEST(Accuracy, MapeSkipsZeroFinalsAndEmptyInputsGiveNoPercentages) {
  // Hand-worked: errors 2 (final 0) and −1 (final 4): MAPE uses only the second → 25 %.
  const std::vector<double> fc = {2, 3}, fin = {0, 4};
  const Accuracy a = Accuracy::measure(fc, fin);
  EXPECT_DOUBLE_EQ(a.mae, 1.5);
  EXPECT_DOUBLE_EQ(*a.mape, 25.0);
  EXPECT_DOUBLE_EQ(*a.wape, 75.0);
  EXPECT_DOUBLE_EQ(a.bias, 0.5);
  EXPECT_FALSE(a.mase);
  const std::vector<double> zero = {0, 0};
  const Accuracy z = Accuracy::measure(fc, zero);
  EXPECT_FALSE(z.mape);
  EXPECT_FALSE(z.wape);
  EXPECT_EQ(Accuracy::measure({}, {}).count, 0);
  EXPECT_THROW(Accuracy::measure(fc, std::vector<double>{1}), std::invalid_argument);
  EXPECT_FALSE(cb::naiveScale(std::vector<double>(7, 1.0), 7));
}
