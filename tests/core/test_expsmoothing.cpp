// Exponential smoothing with fixed parameters against check-values.md section 8 (values printed
// to 6 decimals, produced by statsmodels, ETSModel, a plain recursion and R) and, to 1e-9,
// against R 4.2.2 stats::HoltWinters seeded with the equivalent states
// (tests/reference/ar_expsmoothing_holtwinters.R, output committed beside it).
#include "core/expsmoothing.h"

#include "testsupport.h"

#include <gtest/gtest.h>

#include <fstream>
#include <map>
#include <sstream>
#include <string>
#include <tuple>
#include <vector>

using cb::ExpSmoothing;
using cb::SmoothingState;

namespace {

// check-values.md §8: hand-made public-domain series, 4 weeks Mon..Sun.
const std::vector<double> y = {60, 62, 65, 70, 95,  110, 80, 63, 64, 68, 74, 99,  115, 83,
                               66, 68, 70, 77, 103, 118, 88, 70, 71, 74, 80, 106, 122, 90};

// Half a unit in the 6th decimal: the precision at which check-values.md prints its values.
constexpr double printed = 5e-7;
constexpr double full = 1e-9;

using Key = std::tuple<std::string, std::string, int>;
std::map<Key, double> rReference() {
  std::ifstream in(cbtest::sourceDir() / "tests/reference/ar_expsmoothing_holtwinters.csv");
  std::map<Key, double> out;
  std::string line;
  std::getline(in, line); // header
  while (std::getline(in, line)) {
    std::stringstream ss(line);
    std::string c, what, t, v;
    std::getline(ss, c, ',');
    std::getline(ss, what, ',');
    std::getline(ss, t, ',');
    std::getline(ss, v, ',');
    out[{c, what, std::stoi(t)}] = std::stod(v);
  }
  return out;
}

const std::map<Key, double> &ref() {
  static const auto r = rReference();
  return r;
}

double r(const std::string &c, const std::string &what, int t) {
  auto it = ref().find({c, what, t});
  if (it == ref().end())
    throw std::runtime_error("no R reference " + c + " " + what + " " + std::to_string(t));
  return it->second;
}

} // namespace

TEST(ExpSmoothing, SesReproducesCheckValues8a) {
  auto run = ExpSmoothing::simple(0.3).run(y, SmoothingState{60, 0, {}});
  // check-values.md §8a fitted t = 1..28 (statsmodels SimpleExpSmoothing, known l0 = 60).
  const std::vector<double> fitted = {
      60.000000, 60.000000, 60.600000, 61.920000, 64.344000, 73.540800, 84.478560,
      83.134992, 77.094494, 73.166146, 71.616302, 72.331412, 80.331988, 90.732392,
      88.412674, 81.688872, 77.582210, 75.307547, 75.815283, 83.970698, 94.179489,
      92.325642, 85.627949, 81.239565, 79.067695, 79.347387, 87.343171, 97.740219};
  ASSERT_EQ(run.fitted.size(), fitted.size());
  for (std::size_t i = 0; i < fitted.size(); ++i)
    EXPECT_NEAR(run.fitted[i], fitted[i], printed) << "t = " << i + 1;
  EXPECT_NEAR(run.end.level, 95.418154, printed); // §8a l_T
  EXPECT_NEAR(run.sse, 10382.212896, printed);    // §8a SSE
  EXPECT_NEAR(ExpSmoothing::simple(0.3).sse(y, {60, 0, {}}), 10382.212896, printed);
  for (int h = 1; h <= 7; ++h) // §8a: every forecast equals l_T
    EXPECT_DOUBLE_EQ(ExpSmoothing::simple(0.3).forecast(run.end, h), run.end.level);
  // R HoltWinters(alpha = 0.3, beta = FALSE, gamma = FALSE, l.start = 60), fitted from t = 2.
  for (int t = 2; t <= 28; ++t)
    EXPECT_NEAR(run.fitted[static_cast<std::size_t>(t - 1)], r("8a", "fitted", t), full) << t;
  EXPECT_NEAR(run.end.level, r("8a", "level", 28), full);
}

TEST(ExpSmoothing, HoltReproducesCheckValues8b) {
  const auto model = ExpSmoothing::holt(0.3, 0.1);
  auto run = model.run(y, SmoothingState{60, 1, {}});
  // check-values.md §8b fitted t = 1..28 (statsmodels Holt, known l0 = 60, b0 = 1).
  const std::vector<double> fitted = {
      61.000000, 61.670000, 62.748900, 64.471663, 67.343447, 77.683393, 90.390853,
      89.974349, 83.773566, 79.139811, 76.761988, 76.814653, 85.017078, 96.458264,
      94.463346, 87.113003, 81.994372, 78.651500, 78.361944, 86.698397, 97.972962,
      96.565969, 89.384094, 84.105259, 81.006917, 80.607870, 88.890301, 100.481294};
  for (std::size_t i = 0; i < fitted.size(); ++i)
    EXPECT_NEAR(run.fitted[i], fitted[i], printed) << "t = " << i + 1;
  EXPECT_NEAR(run.end.level, 97.336906, printed); // §8b l_T
  EXPECT_NEAR(run.end.trend, 1.343644, printed);  // §8b b_T
  EXPECT_NEAR(run.sse, 10782.651357, printed);    // §8b SSE
  const std::vector<double> forecasts = {98.680550,  100.024194, 101.367838, 102.711482,
                                         104.055126, 105.398770, 106.742415}; // §8b
  for (int h = 1; h <= 7; ++h)
    EXPECT_NEAR(model.forecast(run.end, h), forecasts[static_cast<std::size_t>(h - 1)], printed);
  // R HoltWinters seeded with the states after t = 2: fitted t = 3..28, coefficients, predict.
  for (int t = 3; t <= 28; ++t)
    EXPECT_NEAR(run.fitted[static_cast<std::size_t>(t - 1)], r("8b", "fitted", t), full) << t;
  EXPECT_NEAR(run.end.level, r("8b", "level", 28), full);
  EXPECT_NEAR(run.end.trend, r("8b", "trend", 28), full);
  for (int h = 1; h <= 7; ++h)
    EXPECT_NEAR(model.forecast(run.end, h), r("8b", "forecast", h), full) << h;

  // §8b variant, forecast::holt(initial = "simple"): l0 = y1 = 60, b0 = y2 − y1 = 2.
  const SmoothingState simple = ExpSmoothing::simpleStart(y, true);
  EXPECT_EQ(simple.level, 60);
  EXPECT_EQ(simple.trend, 2);
  const auto end = model.run(y, simple).end;
  const std::vector<double> simpleForecasts = {98.784749,  100.144147, 101.503545, 102.862944,
                                               104.222342, 105.581741, 106.941139};
  for (int h = 1; h <= 7; ++h)
    EXPECT_NEAR(model.forecast(end, h), simpleForecasts[static_cast<std::size_t>(h - 1)], printed);
}

TEST(ExpSmoothing, HoltWintersAdditiveReproducesCheckValues8c) {
  const auto model = ExpSmoothing::holtWinters(0.3, 0.1, 0.2, 7);
  const SmoothingState start{80, 0.5, {-20, -18, -15, -10, 15, 30, 18}};
  auto run = model.run(y, start);
  // check-values.md §8c fitted t = 1..28 (statsmodels ExponentialSmoothing / ETSModel, known
  // states).
  const std::vector<double> fitted = {
      60.500000, 62.835000, 66.044450, 71.159731, 96.205637,  111.201601, 99.162728,
      55.060635, 59.360351, 63.834452, 70.310122, 96.767663,  112.864900, 98.403987,
      61.131871, 64.040073, 68.384845, 74.093160, 100.093686, 116.463293, 98.386717,
      66.896396, 69.262855, 72.574409, 78.581076, 104.187370, 119.974387, 99.693901};
  for (std::size_t i = 0; i < fitted.size(); ++i)
    EXPECT_NEAR(run.fitted[i], fitted[i], printed) << "t = " << i + 1;
  EXPECT_NEAR(run.end.level, 87.776417, printed); // §8c l_T
  EXPECT_NEAR(run.end.trend, 0.305741, printed);  // §8c b_T
  EXPECT_NEAR(run.sse, 1023.028562, printed);     // §8c SSE
  const std::vector<double> seasons = {-16.917781, -16.099656, -13.767631, -8.628818,
                                       16.149129,  30.899164,  7.070533}; // §8c y_29..y_35
  ASSERT_EQ(run.end.seasonal.size(), 7u);
  for (std::size_t j = 0; j < 7; ++j)
    EXPECT_NEAR(run.end.seasonal[j], seasons[j], printed) << j;
  // §8c forecasts; h = 7 is 96.987138, not the 98.925918 of the statsmodels bug (#9538) noted
  // there: it must use s_T, the season updated at the last observation.
  const std::vector<double> forecasts = {71.164378,  72.288244,  74.926009, 80.370564,
                                         105.454251, 120.510027, 96.987138};
  for (int h = 1; h <= 7; ++h)
    EXPECT_NEAR(model.forecast(run.end, h), forecasts[static_cast<std::size_t>(h - 1)], printed);
  // Beyond one period the seasons repeat and the trend keeps adding (FPP's k = ⌊(h − 1)/m⌋).
  EXPECT_NEAR(model.forecast(run.end, 8), model.forecast(run.end, 1) + 7 * run.end.trend, 1e-12);

  // R HoltWinters with gamma = 0.2 / 0.7 and the states after t = 7 (§8c R cross-check).
  for (int t = 8; t <= 28; ++t)
    EXPECT_NEAR(run.fitted[static_cast<std::size_t>(t - 1)], r("8c", "fitted", t), full) << t;
  EXPECT_NEAR(run.end.level, r("8c", "level", 28), full);
  EXPECT_NEAR(run.end.trend, r("8c", "trend", 28), full);
  for (int j = 1; j <= 7; ++j)
    EXPECT_NEAR(run.end.seasonal[static_cast<std::size_t>(j - 1)], r("8c", "season", j), full);
  for (int h = 1; h <= 7; ++h)
    EXPECT_NEAR(model.forecast(run.end, h), r("8c", "forecast", h), full) << h;
}

TEST(ExpSmoothing, SeasonalSimpleStartReproducesCheckValues8e) {
  // check-values.md §8e, forecast::hw(initial = "simple"): l0 = mean(y_1..y_7) = 77.428571,
  // b0 = (mean(y_8..y_14) − mean(y_1..y_7)) / 7 = 0.489796, s0 = y_1..y_7 − l0.
  const SmoothingState start = ExpSmoothing::seasonalStart(y, 7);
  EXPECT_NEAR(start.level, 542.0 / 7, 1e-12);
  EXPECT_NEAR(start.trend, (566.0 / 7 - 542.0 / 7) / 7, 1e-12);
  EXPECT_NEAR(start.seasonal[0], 60 - 542.0 / 7, 1e-12);
  const auto model = ExpSmoothing::holtWinters(0.3, 0.1, 0.2, 7);
  const auto run = model.run(y, start);
  EXPECT_NEAR(run.fitted[0], 60.489796, printed); // §8e first fitted
  const std::vector<double> forecasts = {72.513640,  74.238952,  77.428278, 83.373650,
                                         108.908721, 124.369222, 93.835306}; // §8e
  for (int h = 1; h <= 7; ++h)
    EXPECT_NEAR(model.forecast(run.end, h), forecasts[static_cast<std::size_t>(h - 1)], printed);
}

TEST(ExpSmoothing, RefusesBadStatesAndHorizons) {
  const auto model = ExpSmoothing::holtWinters(0.3, 0.1, 0.2, 7);
  EXPECT_THROW(model.run(y, SmoothingState{80, 0, {1, 2, 3}}), std::invalid_argument);
  EXPECT_THROW(model.forecast(SmoothingState{80, 0, std::vector<double>(7, 0.0)}, 0),
               std::invalid_argument);
  EXPECT_THROW(ExpSmoothing::seasonalStart(std::span(y).first(13), 7), std::invalid_argument);
  EXPECT_THROW(ExpSmoothing::simpleStart(std::span(y).first(1), true), std::invalid_argument);
}
