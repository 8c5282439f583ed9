// The settings verb: shows the defaults, changes only the options given, keeps them in the store
// and refuses inconsistent bands without writing anything.
#include "core/store.h"
#include "testsupport.h"

#include <gtest/gtest.h>

namespace {

std::string cli() { return CURVEBENCH_CLI; }

TEST(CliSettings, ShowChangeAndRefuse) {
  cbtest::TempDir dir;
  const auto path = dir.path() / "s.curvebench";
  cb::Property p;
  p.name = "Dune House";
  p.capacity = 40;
  cb::Store::create(path, p);
  const std::string store = cbtest::quotePath(path);

  auto shown = cbtest::runCli(cli(), "settings " + store);
  ASSERT_EQ(shown.code, 0) << shown.out;
  EXPECT_NE(shown.out.find("low below 70 %, shoulder from 70 %, peak from 90 %"), std::string::npos)
      << shown.out;
  EXPECT_NE(shown.out.find("not set (overbook needs --walk-cost)"), std::string::npos);

  auto changed =
      cbtest::runCli(cli(), "settings " + store + " --walk-cost 175.5 --peak-from 85 --history pd");
  ASSERT_EQ(changed.code, 0) << changed.out;
  const cb::Property after = cb::Store::open(path)->property();
  EXPECT_EQ(after.settings.walkCost, 175.5);
  EXPECT_DOUBLE_EQ(after.settings.seasons.peakFrom, 0.85);
  EXPECT_DOUBLE_EQ(after.settings.seasons.shoulderFrom, 0.70); // not given: kept
  EXPECT_EQ(after.settings.unconstrainMethod, "pd");
  EXPECT_TRUE(after.settings.unconstrainHistory);

  auto refused = cbtest::runCli(cli(), "settings " + store + " --peak-from 50");
  EXPECT_EQ(refused.code, 2);
  EXPECT_NE(refused.out.find("peak from 50 % must be at least shoulder from 70 %"),
            std::string::npos)
      << refused.out;
  EXPECT_DOUBLE_EQ(cb::Store::open(path)->property().settings.seasons.peakFrom, 0.85);

  auto observed = cbtest::runCli(cli(), "settings " + store + " --history observed");
  ASSERT_EQ(observed.code, 0);
  EXPECT_FALSE(cb::Store::open(path)->property().settings.unconstrainHistory);
}

} // namespace
