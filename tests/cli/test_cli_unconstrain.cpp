// End-to-end runs of `curvebench unconstrain`: a hand-made store whose output is worked out in
// the comments, and the sample property scored against its known true demand.
#include "testsupport.h"

#include "core/samplestore.h"
#include "core/store.h"

#include <map>
#include <sstream>

namespace {

using cbtest::CliRun;

std::string q(const std::filesystem::path &p) { return cbtest::quotePath(p); }

cb::Date d(const char *iso) { return *cb::Date::parseIso(iso); }

/// A 2-room hotel, nights Jan 2026: 1 room a night booked 3 days ahead, 2 on Saturdays (sold
/// out: 2 ≥ 98 % of 2). The whole hotel closed for Wed Jan 7 on Jan 5; a closure for Thu Jan 8
/// made on Jan 9, after the night (turned no one away). A denial of 1 LEIS room for Sat Jan 10
/// requested Jan 5, and one for Sat Jan 31 requested Feb 1 (after the reading date Jan 31).
class CliUnconstrainHand : public ::testing::Test {
protected:
  void SetUp() override {
    cb::Property p;
    p.name = "Test";
    p.capacity = 2;
    auto store = cb::Store::create(store_, p);
    cb::Store::Transaction tx(*store);
    for (cb::Date s = d("2026-01-01"); s <= d("2026-01-31"); ++s)
      for (int k = 0; k < (s.isoWeekday() == 6 ? 2 : 1); ++k) {
        const std::string id = s.toIso() + "-" + std::to_string(k);
        const std::string booked = (s - 3).toIso(), arr = s.toIso(), dep = (s + 1).toIso();
        store->upsertReservation(cbtest::makeReservation(id.c_str(), booked.c_str(), arr.c_str(),
                                                         dep.c_str(), 1, k ? "LEIS" : "CORP"),
                                 0);
      }
    // Activity up to Feb 1, so a reading date of Feb 1 is valid too.
    store->upsertReservation(
        cbtest::makeReservation("M", "2026-02-01", "2026-02-10", "2026-02-11", 1, "CORP"), 0);
    tx.commit();
    store->addClosure({d("2026-01-07"), "", d("2026-01-05"), std::nullopt});
    store->addClosure({d("2026-01-08"), "", d("2026-01-09"), std::nullopt});
    store->addDenial(
        {d("2026-01-05"), d("2026-01-10"), d("2026-01-11"), 1, "LEIS", cb::DenialKind::Denial});
    store->addDenial(
        {d("2026-02-01"), d("2026-01-31"), d("2026-02-01"), 1, "LEIS", cb::DenialKind::Regret});
  }
  CliRun run(const std::string &args) {
    return cbtest::runCli(CURVEBENCH_CLI, "unconstrain " + q(store_) + " " + args,
                          dir_ / "stderr.txt");
  }
  cbtest::TempDir dir_;
  std::filesystem::path store_ = dir_ / "t.curvebench";
};

} // namespace

TEST_F(CliUnconstrainHand, CensoredNightsByHand) {
  // Naive: the estimate is the final, plus rooms denied. Groups need 8 nights (5 Saturdays in
  // January), so no group is fitted and every estimate is final + denied.
  const CliRun r = run("--as-of 2026-01-31 --method naive");
  ASSERT_EQ(r.code, 0) << r.err;
  EXPECT_EQ(r.out, "night,series,final,reason,denied,estimate,group\n"
                   "2026-01-03,ALL,2,full,0,2.00,\n"
                   "2026-01-07,ALL,1,closed,0,1.00,\n"
                   "2026-01-10,ALL,2,full,1,3.00,\n"
                   "2026-01-17,ALL,2,full,0,2.00,\n"
                   "2026-01-24,ALL,2,full,0,2.00,\n"
                   "2026-01-31,ALL,2,full,0,2.00,\n");
  // By segment, without denials: LEIS has a room only on Saturdays; CORP 1 every night.
  const auto out = dir_ / "seg.csv";
  const CliRun s =
      run("--as-of 2026-01-31 --method naive --no-denials --by segment --out " + q(out) + " ");
  ASSERT_EQ(s.code, 0) << s.err;
  EXPECT_EQ(s.out, "");
  const std::string csv = cbtest::readFile(out);
  EXPECT_NE(csv.find("2026-01-10,ALL,2,full,1,2.00,\n"
                     "2026-01-10,CORP,1,full,0,1.00,\n"
                     "2026-01-10,LEIS,1,full,1,1.00,\n"),
            std::string::npos)
      << csv;
  EXPECT_NE(csv.find("2026-01-07,LEIS,0,closed,0,0.00,\n"), std::string::npos) << csv;
  // A reading date of Feb 1 knows the regret for Jan 31.
  const CliRun later = run("--as-of 2026-02-01 --method naive");
  ASSERT_EQ(later.code, 0) << later.err;
  EXPECT_NE(later.out.find("2026-01-31,ALL,2,full,1,3.00,\n"), std::string::npos) << later.out;
}

TEST_F(CliUnconstrainHand, BadInputIsRefused) {
  const CliRun late = run("--as-of 2026-03-01");
  EXPECT_EQ(late.code, 2);
  EXPECT_NE(late.err.find("after the newest booking or cancellation"), std::string::npos)
      << late.err;
  EXPECT_EQ(run("--method mean").code, 2);
  const auto bad = dir_ / "truth.csv";
  cbtest::writeFile(bad, "night,segment,unconstrained_room_nights,sold_room_nights\n"
                         "2026-01-03,CORP,x,1\n");
  const CliRun t = run("--truth " + q(bad));
  EXPECT_EQ(t.code, 2);
  EXPECT_NE(t.err.find("truth.csv:2:"), std::string::npos) << t.err;
}

TEST(CliUnconstrainSample, EmComesCloserToTheTruthThanTheFinals) {
  // The sample property and its true demand (true_demand.csv written beside it by the
  // simulator: the room-nights requested, served or not).
  cbtest::TempDir dir;
  cb::buildSampleStore(dir / "s.curvebench", dir / "files");
  const CliRun r =
      cbtest::runCli(CURVEBENCH_CLI,
                     "unconstrain " + q(dir / "s.curvebench") + " --by segment --truth " +
                         q(dir / "files" / "true_demand.csv"),
                     dir / "stderr.txt");
  ASSERT_EQ(r.code, 0) << r.err;
  std::printf("%s", r.out.c_str());
  std::map<std::string, std::vector<double>> rows; // "series/method" → nights, mae, bias
  std::istringstream in(r.out);
  std::string line;
  std::getline(in, line);
  EXPECT_EQ(line, "series,method,nights,mae,bias");
  while (std::getline(in, line)) {
    std::istringstream f(line);
    std::string series, method, cell;
    std::getline(f, series, ',');
    std::getline(f, method, ',');
    while (std::getline(f, cell, ','))
      rows[series + "/" + method].push_back(std::stod(cell));
  }
  // 5 methods for the total and each of the 5 segments.
  EXPECT_EQ(rows.size(), 30u);
  ASSERT_EQ(rows.count("ALL/naive"), 1u);
  ASSERT_EQ(rows.count("ALL/em"), 1u);
  // 74 sold-out nights by finals ≥ 98 % of capacity (sample_property/README.md).
  EXPECT_EQ(rows["ALL/naive"][0], 74);
  EXPECT_LT(rows["ALL/naive"][2], 0); // finals understate demand on sold-out nights
  EXPECT_LT(rows["ALL/em"][1], rows["ALL/naive"][1]);

  // The default listing: every censored night of the total, estimates never below the final.
  const CliRun list =
      cbtest::runCli(CURVEBENCH_CLI, "unconstrain " + q(dir / "s.curvebench"), dir / "stderr.txt");
  ASSERT_EQ(list.code, 0) << list.err;
  std::istringstream nights(list.out);
  std::getline(nights, line);
  int count = 0;
  while (std::getline(nights, line)) {
    std::vector<std::string> cells;
    std::istringstream f(line);
    std::string cell;
    while (std::getline(f, cell, ','))
      cells.push_back(cell);
    ASSERT_GE(cells.size(), 6u) << line;
    EXPECT_EQ(cells[3], "full") << line; // the sample logs no closures
    EXPECT_GE(std::stod(cells[5]), std::stod(cells[2])) << line;
    ++count;
  }
  EXPECT_EQ(count, 74);
}
