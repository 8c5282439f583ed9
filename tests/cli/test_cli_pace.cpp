// End-to-end runs of `curvebench pace` on a tiny hand-made store; every expected row is worked
// out by hand from the definitions (brief section 4: OTB, pickup, STLY).
#include "testsupport.h"

#include "core/store.h"

namespace {

using cbtest::CliRun;

CliRun run(const std::string &args, const cbtest::TempDir &dir) {
  return cbtest::runCli(CURVEBENCH_CLI, args, dir / "stderr.txt");
}

std::string q(const std::filesystem::path &p) { return cbtest::quotePath(p); }

// Reading date Mon 2026-06-15. Windows: 1 d = (06-14, 06-15], 7 d = (06-08, 06-15],
// 15 d = (05-31, 06-15]. STLY nights (364 days back) are read on 2025-06-16.
const char *kRows =
    "reservation_id,status,booked_on,cancelled_on,arrival,departure,rooms,room_type,segment,"
    "channel,rate,currency,block_id\n"
    "T1,booked,2026-06-01,,2026-06-16,2026-06-18,2,STD,CORP,WEB,100,,\n"
    "T2,booked,2026-06-15,,2026-06-16,2026-06-17,1,STD,FLEX,OTA,90,,\n"
    "T3,cancelled,2026-06-05,2026-06-10,2026-06-17,2026-06-19,3,STD,FLEX,OTA,80,,\n"
    "T4,cancelled,2026-06-12,2026-06-14,2026-06-18,2026-06-19,2,DLX,CORP,WEB,150,,\n"
    "T5,booked,2026-06-14,,2026-06-18,2026-06-20,1,DLX,FLEX,WEB,120,,\n"
    "T6,booked,2026-06-16,,2026-06-16,2026-06-17,4,STD,GRP,WEB,70,,\n" // after the reading date
    "L1,checked-out,2025-06-01,,2025-06-17,2025-06-19,4,STD,CORP,WEB,95,,\n"
    "L2,cancelled,2025-06-10,2025-06-16,2025-06-19,2025-06-20,2,STD,FLEX,OTA,85,,\n"
    "L3,checked-out,2025-06-17,,2025-06-19,2025-06-20,5,STD,FLEX,OTA,85,,\n";

const char *kHeader =
    "stay_date,weekday,series,dba,otb,pickup_1d_net,pickup_1d_gross,pickup_1d_cancelled,"
    "pickup_7d_net,pickup_7d_gross,pickup_7d_cancelled,pickup_15d_net,pickup_15d_gross,"
    "pickup_15d_cancelled,stly_night,stly_otb,diff_rooms,diff_pct\n";

class CliPace : public ::testing::Test {
protected:
  void SetUp() override {
    store_ = dir_ / "h.curvebench";
    ASSERT_EQ(run("init " + q(store_) + " --name Tiny --capacity 10", dir_).code, 0);
    cbtest::writeFile(dir_ / "rows.csv", kRows);
    CliRun imp = run("import " + q(store_) + " " + q(dir_ / "rows.csv"), dir_);
    ASSERT_EQ(imp.code, 0) << imp.out << imp.err;
  }
  cbtest::TempDir dir_;
  std::filesystem::path store_;
};

} // namespace

TEST_F(CliPace, TotalRowsByHand) {
  CliRun r = run("pace " + q(store_) + " --as-of 2026-06-15 --days 3", dir_);
  ASSERT_EQ(r.code, 0) << r.err;
  // 06-16: OTB T1 2 + T2 1; T2 booked on the reading date, T1 in the 15-day window.
  //        STLY 2025-06-17: L1 4.
  // 06-17: OTB T1 2; T3 booked 06-05 (15 d) and cancelled 06-10 (7 d, 15 d). STLY: L1 4.
  // 06-18: OTB T5 1; T3 cancelled; T4 booked 06-12 and cancelled 06-14 (7 d, 15 d; the 1-day
  //        window starts after 06-14); T5 booked 06-14. STLY 2025-06-19: L2 was cancelled on the
  //        STLY reading date and L3 booked a day later, so 0 and no percentage.
  EXPECT_EQ(r.out, std::string(kHeader) +
                       "2026-06-16,Tue,ALL,1,3,1,1,0,1,1,0,3,3,0,2025-06-17,4,-1,-25.0\n"
                       "2026-06-17,Wed,ALL,2,2,0,0,0,-3,0,3,2,5,3,2025-06-18,4,-2,-50.0\n"
                       "2026-06-18,Thu,ALL,3,1,0,0,0,-2,3,5,1,6,5,2025-06-19,0,1,\n");
}

TEST_F(CliPace, BySegmentRowsByHand) {
  CliRun r = run("pace " + q(store_) + " --as-of 2026-06-15 --days 3 --by segment", dir_);
  ASSERT_EQ(r.code, 0) << r.err;
  // GRP is booked only after the reading date, so it is not a series yet.
  EXPECT_EQ(r.out, std::string(kHeader) +
                       "2026-06-16,Tue,ALL,1,3,1,1,0,1,1,0,3,3,0,2025-06-17,4,-1,-25.0\n"
                       "2026-06-16,Tue,CORP,1,2,0,0,0,0,0,0,2,2,0,2025-06-17,4,-2,-50.0\n"
                       "2026-06-16,Tue,FLEX,1,1,1,1,0,1,1,0,1,1,0,2025-06-17,0,1,\n"
                       "2026-06-17,Wed,ALL,2,2,0,0,0,-3,0,3,2,5,3,2025-06-18,4,-2,-50.0\n"
                       "2026-06-17,Wed,CORP,2,2,0,0,0,0,0,0,2,2,0,2025-06-18,4,-2,-50.0\n"
                       "2026-06-17,Wed,FLEX,2,0,0,0,0,-3,0,3,0,3,3,2025-06-18,0,0,\n"
                       "2026-06-18,Thu,ALL,3,1,0,0,0,-2,3,5,1,6,5,2025-06-19,0,1,\n"
                       "2026-06-18,Thu,CORP,3,0,0,0,0,0,2,2,0,2,2,2025-06-19,0,0,\n"
                       "2026-06-18,Thu,FLEX,3,1,0,0,0,-2,1,3,1,4,3,2025-06-19,0,1,\n");
}

TEST_F(CliPace, MovingEventInTheStoreComparesWithItsOwnNight) {
  {
    auto store = cb::Store::open(store_);
    store->addEvent(
        {*cb::Date::parseIso("2025-06-17"), *cb::Date::parseIso("2025-06-17"), "Regatta"});
    store->addEvent(
        {*cb::Date::parseIso("2026-06-18"), *cb::Date::parseIso("2026-06-18"), "Regatta"});
  }
  CliRun r = run("pace " + q(store_) + " --as-of 2026-06-15 --days 3", dir_);
  ASSERT_EQ(r.code, 0) << r.err;
  // 06-18 (lead 3) now compares with 2025-06-17 read on 2025-06-14: L1 4.
  EXPECT_NE(r.out.find("2026-06-18,Thu,ALL,3,1,0,0,0,-2,3,5,1,6,5,2025-06-17,4,-3,-75.0\n"),
            std::string::npos)
      << r.out;
  EXPECT_NE(r.out.find("2026-06-16,Tue,ALL,1,3,1,1,0,1,1,0,3,3,0,2025-06-17,4,-1,-25.0\n"),
            std::string::npos)
      << r.out;
}

TEST_F(CliPace, ReadingDateAfterTheDataIsRefused) {
  CliRun r = run("pace " + q(store_) + " --as-of 2026-06-17", dir_);
  EXPECT_EQ(r.code, 2);
  EXPECT_TRUE(r.out.empty()) << r.out;
  EXPECT_NE(r.err.find("reading date 2026-06-17 is after the newest booking or cancellation"),
            std::string::npos)
      << r.err;
  EXPECT_NE(r.err.find("(2026-06-16)"), std::string::npos) << r.err;
  // The newest day itself is fine.
  EXPECT_EQ(run("pace " + q(store_) + " --as-of 2026-06-16 --days 1", dir_).code, 0);
}

TEST_F(CliPace, UsageErrors) {
  EXPECT_EQ(run("pace --help", dir_).code, 0);
  EXPECT_EQ(run("pace " + q(store_), dir_).code, 2); // --as-of is required
  EXPECT_EQ(run("pace " + q(store_) + " --as-of 2026-13-01", dir_).code, 2);
  EXPECT_EQ(run("pace " + q(store_) + " --as-of 2026-06-15 --by colour", dir_).code, 2);
  EXPECT_EQ(run("pace " + q(store_) + " --as-of 2026-06-15 --days 0", dir_).code, 2);
  CliRun missing = run("pace " + q(dir_ / "none.curvebench") + " --as-of 2026-06-15", dir_);
  EXPECT_EQ(missing.code, 2);
  EXPECT_NE(missing.err.find("none.curvebench"), std::string::npos) << missing.err;
}
