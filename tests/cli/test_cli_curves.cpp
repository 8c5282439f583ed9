// End-to-end runs of `curvebench curves` and `curvebench finals` on a store of five rows whose
// curves are worked out by hand below from the OTB definition (brief section 4).
#include "testsupport.h"

namespace {

using cbtest::CliRun;

CliRun run(const std::string &args) { return cbtest::runCli(CURVEBENCH_CLI, args); }

std::string q(const std::filesystem::path &p) { return cbtest::quotePath(p); }

// A1: 2 rooms, nights 01-05 and 01-06, booked 01-02.
// A2: 1 room, night 01-05, booked 01-01, cancelled 01-04 (on the books when read 01-01 … 01-03).
// A3: 1 room, night 01-06, booked 01-04, a no-show (on the books, not occupied).
// A4: a day use on 01-05: occupies no night.
// A5: 1 room, night 01-08, booked 01-06 — the newest activity, so the default reading date.
//     Its segment starts with "=", which a spreadsheet would run as a formula.
const char *kRows =
    "reservation_id,status,booked_on,cancelled_on,arrival,departure,rooms,room_type,"
    "segment,channel,rate,currency,block_id\n"
    "A1,checked-out,2026-01-02,,2026-01-05,2026-01-07,2,STD,CORP,WEB,100.50,,\n"
    "A2,cancelled,2026-01-01,2026-01-04,2026-01-05,2026-01-06,1,DLX,FLEX,OTA,80,,\n"
    "A3,no-show,2026-01-04,,2026-01-06,2026-01-07,1,STD,FLEX,WEB,90,,\n"
    "A4,checked-out,2026-01-03,,2026-01-05,2026-01-05,3,STD,CORP,WEB,50,,\n"
    "A5,booked,2026-01-06,,2026-01-08,2026-01-09,1,STD,=CMD,WEB,70,,\n";

class CliCurves : public ::testing::Test {
protected:
  void SetUp() override {
    ASSERT_EQ(run("init " + q(store_) + " --name T --capacity 10").code, 0);
    cbtest::writeFile(dir_ / "res.csv", kRows);
    CliRun imp = run("import " + q(store_) + " " + q(dir_ / "res.csv"));
    ASSERT_EQ(imp.code, 0) << imp.out;
  }
  std::string store() const { return q(store_); }
  cbtest::TempDir dir_;
  std::filesystem::path store_ = dir_ / "h.curvebench";
};

} // namespace

TEST_F(CliCurves, HelpExitsZero) {
  for (const char *verb : {"curves", "finals"}) {
    CliRun r = run(std::string(verb) + " --help");
    EXPECT_EQ(r.code, 0) << r.out;
    EXPECT_NE(r.out.find("--as-of"), std::string::npos) << r.out;
    EXPECT_NE(r.out.find("default: the first night stayed"), std::string::npos) << r.out;
  }
}

TEST_F(CliCurves, TotalCurvesAreTheKnownCells) {
  // Reading date 01-06 (A5's booking). Nights 01-05 … 01-08: the last night stayed, which is
  // before 01-06 + 3. Cells read after 01-06 (d < s − 01-06) are left out.
  CliRun r = run("curves " + store() + " --max-dba 3");
  ASSERT_EQ(r.code, 0) << r.out;
  EXPECT_EQ(r.out, "stay_date,series,dba,otb_rooms,otb_revenue\n"
                   "2026-01-05,ALL,0,2,201.00\n" // A1
                   "2026-01-05,ALL,1,2,201.00\n"
                   "2026-01-05,ALL,2,3,281.00\n" // A1 + A2, read 01-03 before its cancellation
                   "2026-01-05,ALL,3,3,281.00\n"
                   "2026-01-06,ALL,0,3,291.00\n" // A1 + A3
                   "2026-01-06,ALL,1,3,291.00\n"
                   "2026-01-06,ALL,2,3,291.00\n"
                   "2026-01-06,ALL,3,2,201.00\n" // read 01-03: A3 not booked yet
                   "2026-01-07,ALL,1,0,0.00\n"
                   "2026-01-07,ALL,2,0,0.00\n"
                   "2026-01-07,ALL,3,0,0.00\n"
                   "2026-01-08,ALL,2,1,70.00\n" // A5, booked on the reading date
                   "2026-01-08,ALL,3,0,0.00\n");
}

TEST_F(CliCurves, SplitBySegmentWithRangeAndFile) {
  auto out = dir_ / "curves.csv";
  CliRun r = run("curves " + store() +
                 " --by segment --from 2026-01-05 --to 2026-01-05 --max-dba 2 --out " + q(out));
  ASSERT_EQ(r.code, 0) << r.out;
  EXPECT_EQ(r.out, "") << "the CSV goes to the file only";
  // Series: ALL, then the codes sorted ("=" sorts before letters), the formula-like one
  // written with a leading apostrophe.
  EXPECT_EQ(cbtest::readFile(out), "stay_date,series,dba,otb_rooms,otb_revenue\n"
                                   "2026-01-05,ALL,0,2,201.00\n"
                                   "2026-01-05,ALL,1,2,201.00\n"
                                   "2026-01-05,ALL,2,3,281.00\n"
                                   "2026-01-05,'=CMD,0,0,0.00\n"
                                   "2026-01-05,'=CMD,1,0,0.00\n"
                                   "2026-01-05,'=CMD,2,0,0.00\n"
                                   "2026-01-05,CORP,0,2,201.00\n"
                                   "2026-01-05,CORP,1,2,201.00\n"
                                   "2026-01-05,CORP,2,2,201.00\n"
                                   "2026-01-05,FLEX,0,0,0.00\n"
                                   "2026-01-05,FLEX,1,0,0.00\n"
                                   "2026-01-05,FLEX,2,1,80.00\n");
}

TEST_F(CliCurves, AsOfShowsTheCurvesAsTheyStood) {
  // Read on 01-03: A2 not cancelled yet, A3 and A5 not booked. Default last night = 01-03 + 3.
  CliRun r = run("curves " + store() + " --max-dba 3 --as-of 2026-01-03");
  ASSERT_EQ(r.code, 0) << r.out;
  EXPECT_EQ(r.out, "stay_date,series,dba,otb_rooms,otb_revenue\n"
                   "2026-01-05,ALL,2,3,281.00\n"
                   "2026-01-05,ALL,3,3,281.00\n"
                   "2026-01-06,ALL,3,2,201.00\n");
}

TEST_F(CliCurves, FinalsAndActuals) {
  CliRun total = run("finals " + store());
  ASSERT_EQ(total.code, 0) << total.out;
  // Nights up to the reading date 01-06; 01-06 less A3, the no-show.
  EXPECT_EQ(total.out, "stay_date,series,final,actual\n"
                       "2026-01-05,ALL,2,2\n"
                       "2026-01-06,ALL,3,2\n");
  CliRun bySegment = run("finals " + store() + " --by segment --from 2026-01-06");
  ASSERT_EQ(bySegment.code, 0) << bySegment.out;
  EXPECT_EQ(bySegment.out, "stay_date,series,final,actual\n"
                           "2026-01-06,ALL,3,2\n"
                           "2026-01-06,'=CMD,0,0\n"
                           "2026-01-06,CORP,2,2\n"
                           "2026-01-06,FLEX,1,0\n");
  // Read before any night was stayed: no final is known yet.
  CliRun early = run("finals " + store() + " --as-of 2026-01-03");
  ASSERT_EQ(early.code, 0) << early.out;
  EXPECT_EQ(early.out, "stay_date,series,final,actual\n");
}

TEST_F(CliCurves, BadDatesAndLateReadingDatesExitTwo) {
  CliRun late = run("curves " + store() + " --as-of 2026-01-07");
  EXPECT_EQ(late.code, 2) << late.out;
  EXPECT_NE(late.out.find("reading date 2026-01-07 is after the newest booking or cancellation "
                          "in the data (2026-01-06)"),
            std::string::npos)
      << late.out;
  CliRun lateFinals = run("finals " + store() + " --as-of 2026-02-01");
  EXPECT_EQ(lateFinals.code, 2) << lateFinals.out;
  EXPECT_NE(lateFinals.out.find("2026-02-01"), std::string::npos) << lateFinals.out;

  CliRun badDate = run("curves " + store() + " --from 2026-02-30");
  EXPECT_EQ(badDate.code, 2) << badDate.out;
  EXPECT_NE(badDate.out.find("not a date (YYYY-MM-DD): 2026-02-30"), std::string::npos)
      << badDate.out;
  CliRun reversed = run("finals " + store() + " --from 2026-01-06 --to 2026-01-05");
  EXPECT_EQ(reversed.code, 2) << reversed.out;
  EXPECT_NE(reversed.out.find("--from 2026-01-06 is after --to 2026-01-05"), std::string::npos)
      << reversed.out;
  EXPECT_EQ(run("curves " + store() + " --by rate").code, 2);
  EXPECT_EQ(run("curves " + store() + " --max-dba -1").code, 2);
  CliRun badOut = run("curves " + store() + " --out " + q(dir_ / "no-such-dir" / "c.csv"));
  EXPECT_EQ(badOut.code, 2) << badOut.out;
  EXPECT_NE(badOut.out.find("cannot write"), std::string::npos) << badOut.out;
}

TEST(CliCurvesEmpty, StoreWithoutReservationsExitsTwo) {
  cbtest::TempDir dir;
  auto store = dir / "empty.curvebench";
  ASSERT_EQ(run("init " + q(store) + " --name T --capacity 10").code, 0);
  for (const char *verb : {"curves", "finals"}) {
    CliRun r = run(std::string(verb) + " " + q(store));
    EXPECT_EQ(r.code, 2) << r.out;
    EXPECT_NE(r.out.find("has no reservations"), std::string::npos) << r.out;
  }
}

// The import leaves the kept total cube beside the store (core/keptcube.h), which `curves` and
// `finals` read instead of the reservations (`backtest`: test_cli_forecast.cpp). Their output is
// the same without it (each then builds it again from the reservations and writes it) and with a
// damaged one (ignored). The hand-worked figures above are read through it.
TEST_F(CliCurves, TheKeptCubeChangesNoOutput) {
  const std::filesystem::path cube = dir_ / "h.curvebench.cube";
  ASSERT_TRUE(std::filesystem::exists(cube)) << "the import writes it";
  const std::vector<std::string> commands = {
      "curves " + store() + " --max-dba 3",
      "curves " + store() + " --as-of 2026-01-03 --from 2026-01-01 --to 2026-01-09",
      "finals " + store(),
      "backtest " + store() +
          " --from 2026-01-05 --to 2026-01-06 --leads 1,2 --methods "
          "pickup-add --naive-history"};
  std::vector<std::string> withCube;
  for (const std::string &c : commands) {
    CliRun r = run(c);
    ASSERT_EQ(r.code, 0) << c << "\n" << r.out;
    withCube.push_back(r.out);
  }
  for (std::size_t i = 0; i < commands.size(); ++i) {
    std::filesystem::remove(cube);
    CliRun r = run(commands[i]);
    EXPECT_EQ(r.out, withCube[i]) << commands[i];
    EXPECT_TRUE(std::filesystem::exists(cube)) << "written again by " << commands[i];
  }
  std::string damaged = cbtest::readFile(cube);
  damaged[damaged.size() / 2] = static_cast<char>(damaged[damaged.size() / 2] ^ 1);
  cbtest::writeFile(cube, damaged);
  for (std::size_t i = 0; i < commands.size(); ++i)
    EXPECT_EQ(run(commands[i]).out, withCube[i]) << commands[i];
  EXPECT_NE(withCube[0].find("2026-01-05,ALL,2,3,281.00\n"), std::string::npos) << withCube[0];
}

// Revenue is written to the cent: whole cents from the integer sum, any other amount rounded as
// printf's %.2f rounds it (3 rooms at 33.333 = 99.999 → 100.00; 1 room → 33.33).
TEST(CliCurvesCents, RevenueNotInWholeCentsIsRounded) {
  cbtest::TempDir dir;
  const auto store = dir / "c.curvebench";
  ASSERT_EQ(run("init " + q(store) + " --name T --capacity 10").code, 0);
  cbtest::writeFile(dir / "r.csv",
                    "reservation_id,status,booked_on,cancelled_on,arrival,departure,rooms,"
                    "room_type,segment,channel,rate,currency,block_id\n"
                    "C1,booked,2026-01-01,,2026-01-03,2026-01-04,3,STD,CORP,WEB,33.333,,\n"
                    "C2,booked,2026-01-02,,2026-01-03,2026-01-04,1,STD,CORP,WEB,33.333,,\n"
                    "C3,booked,2026-01-02,,2026-01-04,2026-01-05,2,STD,CORP,WEB,10.25,,\n");
  ASSERT_EQ(run("import " + q(store) + " " + q(dir / "r.csv")).code, 0);
  CliRun r = run("curves " + q(store) + " --max-dba 2");
  ASSERT_EQ(r.code, 0) << r.out;
  EXPECT_EQ(r.out, "stay_date,series,dba,otb_rooms,otb_revenue\n"
                   "2026-01-03,ALL,1,4,133.33\n" // read 01-02: 4 × 33.333 = 133.332
                   "2026-01-03,ALL,2,3,100.00\n" // read 01-01: 3 × 33.333 = 99.999
                   "2026-01-04,ALL,2,2,20.50\n");
}
