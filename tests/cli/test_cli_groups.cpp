// End-to-end runs of `curvebench import-blocks`, `groups` and `displace`: a tiny store whose
// group figures are worked out by hand (the case of tests/core/test_groupmodel.cpp), bad files
// located to file:line:column, and the sample property (groups and transient apart).
#include "testsupport.h"

#include "core/advice.h"
#include "core/store.h"

#include <sstream>

namespace {

using cbtest::CliRun;

std::string q(const std::filesystem::path &p) { return cbtest::quotePath(p); }
bool has(const std::string &text, const std::string &needle) {
  return text.find(needle) != std::string::npos;
}
std::vector<std::string> lines(const std::string &text) {
  std::vector<std::string> out;
  std::istringstream in(text);
  for (std::string line; std::getline(in, line);)
    out.push_back(line);
  return out;
}
std::vector<std::string> cells(const std::string &line) {
  std::vector<std::string> out;
  std::istringstream in(line);
  for (std::string c; std::getline(in, c, ',');)
    out.push_back(c);
  return out;
}

cb::Reservation grp(const char *id, const char *block, const char *booked, const char *arr,
                    const char *dep, int rooms, const char *cancelled = nullptr) {
  cb::Reservation r = cbtest::makeReservation(id, booked, arr, dep, rooms, "GRP", cancelled);
  r.blockId = block;
  return r;
}

/// Blocks A, B (past) and C (future) of the core test, imported through the CLI; reservations
/// written directly. Hand figures at 2026-03-01 (see test_groupmodel.cpp for the working):
/// wash at lead 30 = 0.5 over 1 block; C: share 4 / 16 = 0.25, typical median 0.85 and lower
/// quartile 0.775 at lead 9 → well behind; expected 2 + 0.5 × 6 × (1/6) = 2.5 a night → 5.
class CliGroups : public ::testing::Test {
protected:
  void SetUp() override {
    cb::Property p;
    p.name = "Tiny";
    p.capacity = 40;
    auto store = cb::Store::create(store_, p);
    cb::Store::Transaction tx(*store);
    for (const auto &r :
         {grp("A1", "A", "2026-01-01", "2026-02-10", "2026-02-12", 4),
          grp("A2", "A", "2026-01-25", "2026-02-10", "2026-02-12", 3),
          grp("A3", "A", "2026-01-05", "2026-02-10", "2026-02-11", 2, "2026-02-01"),
          grp("A4", "A", "2026-02-05", "2026-02-11", "2026-02-12", 1),
          grp("B1", "B", "2026-02-01", "2026-02-20", "2026-02-21", 5),
          grp("C1", "C", "2026-02-15", "2026-03-10", "2026-03-12", 2),
          cbtest::makeReservation("T1", "2026-02-20", "2026-03-10", "2026-03-11", 9, "TRN")})
      store->upsertReservation(r, 0);
    tx.commit();
  }
  CliRun run(const std::string &args) {
    return cbtest::runCli(CURVEBENCH_CLI, args, dir_ / "stderr.txt");
  }
  cbtest::TempDir dir_;
  std::filesystem::path store_ = dir_ / "t.curvebench";
};

const char *kBlocks =
    "block_id,name,segment,arrival,departure,rooms_per_night,cutoff,status,contracted_on,"
    "room_type\n"
    "A,Choir,GRP,2026-02-10,2026-02-12,10,2026-01-27,definite,2025-12-01,\n"
    "B,Crew,GRP,2026-02-20,2026-02-21,5,2026-02-06,definite,2026-01-25,\n"
    "C,Dentists,GRP,2026-03-10,2026-03-12,8,2026-03-03,tentative,2026-02-01,\n";

} // namespace

TEST_F(CliGroups, ImportThenBlocksWithHandFigures) {
  cbtest::writeFile(dir_ / "blocks.csv", kBlocks);
  CliRun r = run("import-blocks " + q(store_) + " " + q(dir_ / "blocks.csv"));
  ASSERT_EQ(r.code, 0) << r.err;
  EXPECT_TRUE(has(r.out, "read 3 blocks, added 3, updated 0, unchanged 0, rejected 0 — written"))
      << r.out;
  r = run("groups " + q(store_) + " --as-of 2026-03-01");
  ASSERT_EQ(r.code, 0) << r.err;
  const auto rows = lines(r.out);
  ASSERT_EQ(rows.size(), 2U) << r.out; // header + block C (A and B have departed)
  EXPECT_EQ(rows[1], "C,Dentists,GRP,tentative,2026-03-10,2026-03-12,8,2026-03-03,2,9,16,4,"
                     "0.2500,0.8500,0.7750,2,0.8333,5.00,well behind");
  EXPECT_TRUE(has(r.err, "30d  50.0 % (1 all)")) << r.err; // GRP borrows the all-segment wash
}

TEST_F(CliGroups, TentativeProbabilityIsAPropertySetting) {
  cbtest::writeFile(dir_ / "blocks.csv", kBlocks);
  ASSERT_EQ(run("import-blocks " + q(store_) + " " + q(dir_ / "blocks.csv")).code, 0);
  CliRun r = run("settings " + q(store_) + " --tentative-probability 80");
  ASSERT_EQ(r.code, 0) << r.err;
  EXPECT_TRUE(has(r.out, "tentative blocks  count at 80 %")) << r.out;
  // Block C at 80 %: 2 + 0.8 × 6 × (1 − 5/6) = 2.8 a night → 5.60 room-nights.
  r = run("groups " + q(store_) + " --as-of 2026-03-01");
  ASSERT_EQ(r.code, 0) << r.err;
  EXPECT_TRUE(has(r.out, ",5.60,well behind")) << r.out;
  EXPECT_TRUE(has(r.err, "tentative blocks count at 80 %")) << r.err;
  EXPECT_EQ(run("settings " + q(store_) + " --tentative-probability 120").code, 2);
}

TEST_F(CliGroups, StrictImportWritesNothingAndLocatesTheCell) {
  cbtest::writeFile(dir_ / "bad.csv", std::string(kBlocks) +
                                          "D,Rowers,GRP,2026-04-01,2026-04-03,x,2026-03-01,"
                                          "definite,,\n");
  const CliRun r = run("import-blocks " + q(store_) + " " + q(dir_ / "bad.csv"));
  EXPECT_EQ(r.code, 1);
  EXPECT_TRUE(has(r.err, "bad.csv:5:6: rooms_per_night \"x\" is not a whole number")) << r.err;
  EXPECT_TRUE(has(r.out, "nothing written")) << r.out;
  EXPECT_TRUE(cb::Store::open(store_)->groupBlocks().empty());
}

TEST_F(CliGroups, DisplaceRejectsABadOfferFile) {
  cbtest::writeFile(dir_ / "offer.csv", "night,rooms,rate\n2026-03-10,5,90\n2026-03-10,x,90\n");
  const CliRun r =
      run("displace " + q(store_) + " --offer " + q(dir_ / "offer.csv") + " --as-of 2026-03-01");
  EXPECT_EQ(r.code, 1);
  EXPECT_TRUE(has(r.err, "offer.csv:3:1: night 2026-03-10 is listed twice (first on line 2)"))
      << r.err;
  EXPECT_TRUE(has(r.err, "offer.csv:3:2: rooms: not a number of at least 0: \"x\"")) << r.err;
}

/// The sample property's store (it has group blocks, tentative and definite, washing and
/// released at their cutoff), built once for the suite.
class CliGroupsSample : public ::testing::Test {
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
cbtest::TempDir *CliGroupsSample::dir_ = nullptr;

TEST_F(CliGroupsSample, SplitShowsGroupAndTransientApart) {
  const CliRun r = cbtest::runCli(
      CURVEBENCH_CLI, "groups " + q(*dir_ / "sample.curvebench") + " --as-of 2026-10-31 --split 60",
      *dir_ / "stderr.txt");
  ASSERT_EQ(r.code, 0) << r.err;
  const auto rows = lines(r.out);
  ASSERT_EQ(rows.size(), 61U) << r.out;
  const auto head = cells(rows[0]);
  ASSERT_EQ(head.size(), 19U);
  EXPECT_EQ(head[5], "group");
  EXPECT_EQ(head[7], "transient");
  EXPECT_EQ(head[11], "total");
  int nightsWithGroups = 0;
  for (std::size_t i = 1; i < rows.size(); ++i) {
    const auto c = cells(rows[i]);
    ASSERT_EQ(c.size(), 19U) << rows[i];
    const double group = std::stod(c[5]), transient = std::stod(c[7]), total = std::stod(c[11]);
    EXPECT_NEAR(total, group + transient, 0.011) << rows[i]; // printed to 2 decimals
    // Capacity left after groups: capacity − group (not below 0).
    EXPECT_NEAR(std::stod(c[14]), std::max(0.0, std::stod(c[2]) - group), 0.011) << rows[i];
    nightsWithGroups += group > 0;
  }
  EXPECT_GT(nightsWithGroups, 10);
  EXPECT_TRUE(has(r.err, "tentative blocks at 50 %")) << r.err;
}

TEST_F(CliGroupsSample, BlocksListTentativeAndReleasedAndDisplaceCarriesTheCaution) {
  CliRun r = cbtest::runCli(CURVEBENCH_CLI,
                            "groups " + q(*dir_ / "sample.curvebench") + " --as-of 2026-10-31",
                            *dir_ / "stderr.txt");
  ASSERT_EQ(r.code, 0) << r.err;
  EXPECT_TRUE(has(r.out, ",tentative,")) << r.out;
  EXPECT_TRUE(has(r.out, ",definite,")) << r.out;
  EXPECT_TRUE(has(r.out, ",released\n")) << r.out;
  // The committed sample blocks file reads back into the sample store unchanged.
  r = cbtest::runCli(CURVEBENCH_CLI,
                     "import-blocks " + q(*dir_ / "sample.curvebench") + " " +
                         q(cbtest::sourceDir() / "sample_property" / "blocks.csv"),
                     *dir_ / "stderr.txt");
  ASSERT_EQ(r.code, 0) << r.err;
  EXPECT_TRUE(has(r.out, "read 257 blocks, added 0, updated 0, unchanged 257")) << r.out;
  cbtest::writeFile(*dir_ / "offer.csv",
                    "night,rooms,rate,other_revenue,cost\n2026-12-14,20,95,20,12\n"
                    "2026-12-15,20,95,20,12\n");
  r = cbtest::runCli(CURVEBENCH_CLI,
                     "displace " + q(*dir_ / "sample.curvebench") + " --offer " +
                         q(*dir_ / "offer.csv") + " --as-of 2026-10-31",
                     *dir_ / "stderr.txt");
  ASSERT_EQ(r.code, 0) << r.err;
  const auto rows = lines(r.out);
  ASSERT_EQ(rows.size(), 5U) << r.out; // header, shoulder, 2 offer nights, shoulder
  EXPECT_TRUE(has(rows[1], ",shoulder,"));
  EXPECT_TRUE(has(rows[2], ",offer,"));
  EXPECT_TRUE(has(rows[4], ",shoulder,"));
  EXPECT_TRUE(has(r.err, "break-even group rate:")) << r.err;
  EXPECT_TRUE(has(r.err, std::string(cb::kAdvisoryCaution))) << r.err;
}
