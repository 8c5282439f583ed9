// End-to-end runs of `curvebench outlook` and `curvebench protect` (brief section 6).
#include "testsupport.h"

#include "core/store.h"

#include <sstream>

namespace {

using cbtest::CliRun;

std::string q(const std::filesystem::path &p) { return cbtest::quotePath(p); }

std::vector<std::string> lines(const std::string &text) {
  std::vector<std::string> out;
  std::istringstream in(text);
  std::string line;
  while (std::getline(in, line))
    out.push_back(line);
  return out;
}

/// The sample property's store, built once for the suite with `curvebench sample --store`.
class CliOutlookSample : public ::testing::Test {
protected:
  static void SetUpTestSuite() {
    dir_ = new cbtest::TempDir();
    const CliRun r = cbtest::runCli(CURVEBENCH_CLI, "sample " + q(*dir_ / "files") + " --store " +
                                                        q(*dir_ / "sample.curvebench"));
    ASSERT_EQ(r.code, 0) << r.out;
  }
  static void TearDownTestSuite() {
    delete dir_;
    dir_ = nullptr;
  }
  static cbtest::TempDir *dir_;
};
cbtest::TempDir *CliOutlookSample::dir_ = nullptr;

} // namespace

TEST_F(CliOutlookSample, CsvHeaderRowsHintsAndCaution) {
  const CliRun r = cbtest::runCli(
      CURVEBENCH_CLI, "outlook " + q(*dir_ / "sample.curvebench") + " --as-of 2026-10-31 --days 30",
      *dir_ / "stderr.txt");
  ASSERT_EQ(r.code, 0) << r.err;
  const auto rows = lines(r.out);
  ASSERT_EQ(rows.size(), 31U) << r.out; // header + 30 nights
  // The column names issue 5 asks for, in the order of the CSV.
  EXPECT_EQ(rows[0], "night,weekday,event,capacity,otb,stly_otb,forecast,lo,hi,sd,constrained,"
                     "spill,p_sellout,occupancy,adr,revpar,season,flags,method");
  EXPECT_EQ(rows[1].rfind("2026-11-01,Sun,", 0), 0U) << rows[1];
  EXPECT_EQ(rows[30].rfind("2026-11-30,Mon,", 0), 0U) << rows[30];
  // Standard output is the CSV alone; the hints and the caution go to standard error.
  EXPECT_EQ(r.out.find("Advisory only"), std::string::npos);
  EXPECT_NE(r.err.find("minimum-stay hints"), std::string::npos) << r.err;
  EXPECT_NE(r.err.find("Advisory only: these figures support a decision"), std::string::npos)
      << r.err;

  // With --out the CSV goes to the file and the notes to standard output.
  const auto file = *dir_ / "outlook.csv";
  const CliRun f =
      cbtest::runCli(CURVEBENCH_CLI,
                     "outlook " + q(*dir_ / "sample.curvebench") +
                         " --as-of 2026-10-31 --days 30 --naive-history --out " + q(file),
                     *dir_ / "stderr.txt");
  ASSERT_EQ(f.code, 0) << f.err;
  EXPECT_EQ(lines(cbtest::readFile(file)).size(), 31U);
  EXPECT_NE(f.out.find("observed history"), std::string::npos) << f.out;
  EXPECT_NE(f.out.find("Advisory only"), std::string::npos) << f.out;
}

TEST_F(CliOutlookSample, ProtectFromTheStore) {
  const CliRun r = cbtest::runCli(CURVEBENCH_CLI,
                                  "protect " + q(*dir_ / "sample.curvebench") +
                                      " --night 2026-11-14 --as-of 2026-10-31",
                                  *dir_ / "stderr.txt");
  ASSERT_EQ(r.code, 0) << r.err;
  const auto rows = lines(r.out);
  ASSERT_GE(rows.size(), 3U) << r.out;
  EXPECT_EQ(rows[0], "rank,segment,rate,mean,sd,protection_level,protected_rooms,booking_limit,"
                     "status,otb");
  EXPECT_EQ(rows[1].rfind("1,", 0), 0U) << rows[1];
  EXPECT_NE(r.err.find("EMSR-b for 2026-11-14 as of 2026-10-31"), std::string::npos) << r.err;
  EXPECT_NE(r.err.find("Advisory only"), std::string::npos) << r.err;
}

TEST(CliProtect, FiigSixClassesBookingLimits) {
  // check-values.md §2a: Fiig, Isler, Hopperstad & Belobaba (2010), J. Revenue & Pricing Mgmt
  // 9(1/2):152-170, Table 1 inputs, capacity 100. EMSR-b protection levels (computed)
  // 20.364878, 35.404703, 54.338987, 80.073517, 117.435845; booking limits 100, 80, 65, 46, 20, 0.
  cbtest::TempDir dir;
  const auto file = dir / "fiig.csv";
  // Listed out of rate order on purpose: protect ranks by rate.
  cbtest::writeFile(file, "segment,rate,mean,sd\n"
                          "C3,800,14.8,7.7\n"
                          "C1,1200,31.2,11.2\n"
                          "C2,1000,10.9,6.6\n"
                          "C4,600,19.9,8.9\n"
                          "C5,400,26.9,10.4\n"
                          "C6,200,36.3,12.0\n");
  const CliRun r = cbtest::runCli(CURVEBENCH_CLI, "protect " + q(file) + " --capacity 100 --sold 0",
                                  dir / "stderr.txt");
  ASSERT_EQ(r.code, 0) << r.err;
  EXPECT_EQ(r.out, "rank,segment,rate,mean,sd,protection_level,protected_rooms,booking_limit,"
                   "status\n"
                   "1,C1,1200.00,31.20,11.20,20.36,20,100,open\n"
                   "2,C2,1000.00,10.90,6.60,35.40,35,80,open\n"
                   "3,C3,800.00,14.80,7.70,54.34,54,65,open\n"
                   "4,C4,600.00,19.90,8.90,80.07,80,46,open\n"
                   "5,C5,400.00,26.90,10.40,117.44,117,20,open\n"
                   "6,C6,200.00,36.30,12.00,,,0,closed\n");
  EXPECT_NE(r.err.find("EMSR-b: capacity 100, sold 0, remaining 100"), std::string::npos) << r.err;
  EXPECT_NE(r.err.find("Advisory only"), std::string::npos) << r.err;

  // EMSR-a (check-values.md §2a, computed): y2 = 31.721154 → 31.72, C3's limit 100 − 32 = 68.
  const CliRun a = cbtest::runCli(
      CURVEBENCH_CLI, "protect " + q(file) + " --capacity 100 --method emsra", dir / "stderr.txt");
  ASSERT_EQ(a.code, 0) << a.err;
  EXPECT_NE(a.out.find("2,C2,1000.00,10.90,6.60,31.72,32,80,open\n"), std::string::npos) << a.out;
  EXPECT_NE(a.out.find("3,C3,800.00,14.80,7.70,50.03,50,68,open\n"), std::string::npos) << a.out;
}

TEST(CliProtect, BadFileIsLocatedAndExitsWithFindings) {
  cbtest::TempDir dir;
  const auto file = dir / "bad.csv";
  cbtest::writeFile(file, "segment,rate,mean,sd\n"
                          "C1,1200,31.2,11.2\n"
                          "C2,abc,10.9,6.6\n"
                          "C3,800,14.8,-1\n");
  const CliRun r =
      cbtest::runCli(CURVEBENCH_CLI, "protect " + q(file) + " --capacity 100", dir / "stderr.txt");
  EXPECT_EQ(r.code, 1); // data findings (README exit codes)
  EXPECT_TRUE(r.out.empty()) << r.out;
  EXPECT_NE(r.err.find(file.string() + ":3:2: rate: not a number: \"abc\""), std::string::npos)
      << r.err;
  EXPECT_NE(r.err.find(file.string() + ":4:4: sd must be >= 0"), std::string::npos) << r.err;

  cbtest::writeFile(file, "segment,rate,mean\nC1,1200,31.2\n");
  const CliRun h =
      cbtest::runCli(CURVEBENCH_CLI, "protect " + q(file) + " --capacity 100", dir / "stderr.txt");
  EXPECT_EQ(h.code, 1);
  EXPECT_NE(h.err.find(file.string() + ":1: missing column \"sd\""), std::string::npos) << h.err;

  // No --capacity with a file, or --capacity with --night: a usage error.
  const CliRun u = cbtest::runCli(CURVEBENCH_CLI, "protect " + q(file), dir / "stderr.txt");
  EXPECT_EQ(u.code, 2);
  EXPECT_NE(u.err.find("--capacity"), std::string::npos) << u.err;
}
