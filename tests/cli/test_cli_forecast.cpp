// End-to-end runs of `curvebench forecast`, `backtest` and `override` on a tiny hand-made store
// whose every expected value is worked out in the comments (brief sections 4 and 5).
#include "testsupport.h"

#include "core/store.h"

namespace {

using cbtest::CliRun;

CliRun run(const std::string &args, const cbtest::TempDir &dir) {
  return cbtest::runCli(CURVEBENCH_CLI, args, dir / "stderr.txt");
}

std::string q(const std::filesystem::path &p) { return cbtest::quotePath(p); }

/// Every night of Jan–Mar 2026: 2 CORP rooms booked 5 days ahead and 1 LEIS room booked the day
/// before. So Final = 3 and OTB(s, s − h) = 3 at h = 1, 2 at h = 2…5, 0 at h ≥ 6.
class CliForecast : public ::testing::Test {
protected:
  void SetUp() override {
    cb::Property p;
    p.name = "Test";
    p.capacity = 10;
    auto store = cb::Store::create(store_, p);
    cb::Store::Transaction tx(*store);
    for (const cb::Reservation &r : cbtest::steadyQuarterRows())
      store->upsertReservation(r, 0);
    tx.commit();
  }
  cbtest::TempDir dir_;
  std::filesystem::path store_ = dir_ / "t.curvebench";
};

} // namespace

TEST_F(CliForecast, NaiveForecastWithBands) {
  // naive = the last same-weekday final = 3; every past naive error was 0, so the band is [3, 3].
  const CliRun r =
      run("forecast " + q(store_) + " --as-of 2026-03-01 --horizon 3 --method naive", dir_);
  ASSERT_EQ(r.code, 0) << r.err;
  EXPECT_EQ(r.out, "stay_date,series,h,otb,forecast,lo,hi,method\n"
                   "2026-03-02,ALL,1,3,3.00,3.00,3.00,naive\n"
                   "2026-03-03,ALL,2,2,3.00,3.00,3.00,naive\n"
                   "2026-03-04,ALL,3,2,3.00,3.00,3.00,naive\n");
  EXPECT_NE(r.err.find("forecast run 1 stored"), std::string::npos) << r.err;
}

TEST_F(CliForecast, PickupBacktestDetailSummaryAndOverride) {
  // An override of 4 rooms for the whole hotel on 02-02 (final 3).
  const CliRun o = run("override " + q(store_) +
                           " --night 2026-02-02 --value 4 --reason \"trade fair\" --author ana",
                       dir_);
  ASSERT_EQ(o.code, 0) << o.err;
  EXPECT_EQ(o.out, "override 1 stored: 2026-02-02 ALL = 4\n");
  // pickup-add: OTB(s,t) + mean_r [Final(r) − OTB(r, r − h)] = 3 + 0 at h = 1, 0 + 3 at h = 7.
  const auto detail = dir_ / "detail.csv";
  const CliRun r = run("backtest " + q(store_) +
                           " --from 2026-02-01 --to 2026-02-02 --leads 7,1 --methods pickup-add"
                           " --detail " +
                           q(detail),
                       dir_);
  ASSERT_EQ(r.code, 0) << r.err;
  EXPECT_EQ(cbtest::readFile(detail), "stay_date,reading_date,series,h,method,forecast,final\n"
                                      "2026-02-02,2026-02-01,ALL,1,pickup-add,3.00,3\n"
                                      "2026-02-08,2026-02-01,ALL,7,pickup-add,3.00,3\n"
                                      "2026-02-03,2026-02-02,ALL,1,pickup-add,3.00,3\n"
                                      "2026-02-09,2026-02-02,ALL,7,pickup-add,3.00,3\n");
  // Finals never change: the lag-7 naive scale is 0, so MASE is empty. The warm-up errors are
  // all 0, so each band is [3, 3] and holds the final. The override on 02-02 (lead 1 only):
  // fva = |3 − 3| − |4 − 3| = −1.
  EXPECT_EQ(r.out, "series,method,h,count,mae,rmse,mape,wape,bias,mase,coverage,overrides,fva\n"
                   "ALL,pickup-add,1,2,0.000,0.000,0.000,0.000,0.000,,1.000,1,-1.000\n"
                   "ALL,pickup-add,7,2,0.000,0.000,0.000,0.000,0.000,,1.000,0,\n");
}

TEST_F(CliForecast, HelpListsEveryMethodAndBadInputIsRefused) {
  const CliRun h = run("backtest --help", dir_);
  ASSERT_EQ(h.code, 0);
  for (const char *name :
       {"naive", "last-year", "mavg", "ses", "holt-winters", "ar", "pickup-add", "pickup-adv",
        "pickup-mult", "pace-extrap", "regress", "blend", "mlp", "auto"})
    EXPECT_NE(h.out.find(std::string("  ") + name + " "), std::string::npos) << name;
  const CliRun bad = run("forecast " + q(store_) + " --as-of 2026-03-01 --method nope", dir_);
  EXPECT_EQ(bad.code, 2);
  EXPECT_NE(bad.err.find("unknown forecast method \"nope\""), std::string::npos) << bad.err;
  const CliRun late = run("forecast " + q(store_) + " --as-of 2026-05-01", dir_);
  EXPECT_EQ(late.code, 2);
  EXPECT_NE(late.err.find("after the newest booking"), std::string::npos) << late.err;
  const CliRun leads = run("backtest " + q(store_) +
                               " --from 2026-02-01 --to 2026-02-02 "
                               "--leads 1,x",
                           dir_);
  EXPECT_EQ(leads.code, 2);
}

// The first backtest on a store written without an import builds the kept total cube
// (core/keptcube.h) and writes it; the next reads it instead of the reservations, with the same
// output, hand-worked in PickupBacktestDetailSummaryAndOverride. Leads beyond the kept cube's 365
// days build their own cube.
TEST_F(CliForecast, BacktestReadsTheKeptCube) {
  const std::filesystem::path cube = dir_ / "t.curvebench.cube";
  ASSERT_FALSE(std::filesystem::exists(cube));
  auto backtest = [&](const std::string &leads, const char *detail) {
    const CliRun r = run("backtest " + q(store_) + " --from 2026-02-01 --to 2026-02-02 --leads " +
                             leads + " --methods pickup-add --detail " + q(dir_ / detail),
                         dir_);
    EXPECT_EQ(r.code, 0) << r.err;
    return r.out + cbtest::readFile(dir_ / detail);
  };
  const std::string built = backtest("7,1", "a.csv");
  ASSERT_TRUE(std::filesystem::exists(cube));
  const std::string read = backtest("7,1", "b.csv");
  EXPECT_EQ(read, built);
  EXPECT_NE(read.find("2026-02-02,2026-02-01,ALL,1,pickup-add,3.00,3\n"), std::string::npos)
      << read;
  const std::string far = backtest("340,1", "c.csv");
  EXPECT_NE(far.find("2026-02-02,2026-02-01,ALL,1,pickup-add,3.00,3\n"), std::string::npos) << far;
}
