// End-to-end runs of the `curvebench` executable: verbs, messages and exit codes.
#include "testsupport.h"

namespace {

using cbtest::CliRun;

CliRun run(const std::string &args) { return cbtest::runCli(CURVEBENCH_CLI, args); }

std::string q(const std::filesystem::path &p) { return cbtest::quotePath(p); }

const char *kHeader =
    "reservation_id,status,booked_on,cancelled_on,arrival,departure,rooms,room_type,"
    "segment,channel,rate,currency,block_id\n";

} // namespace

TEST(Cli, HelpOnEveryVerbExitsZero) {
  for (const char *verb : {"", "init", "import", "info", "sample"}) {
    CliRun r = run(std::string(verb) + " --help");
    EXPECT_EQ(r.code, 0) << verb << "\n" << r.out;
    EXPECT_NE(r.out.find("Usage"), std::string::npos) << verb;
  }
}

TEST(Cli, UsageErrorsExitTwo) {
  EXPECT_EQ(run("").code, 2);
  EXPECT_EQ(run("no-such-verb").code, 2);
  EXPECT_EQ(run("init only-a-store.curvebench").code, 2); // --name and --capacity missing
  cbtest::TempDir dir;
  CliRun r = run("info " + q(dir / "missing.curvebench"));
  EXPECT_EQ(r.code, 2);
  EXPECT_NE(r.out.find("missing.curvebench"), std::string::npos) << r.out;
}

TEST(Cli, InitImportInfo) {
  cbtest::TempDir dir;
  auto store = dir / "h.curvebench";
  CliRun init = run("init " + q(store) + " --name \"Test House\" --capacity 1200 --currency GBP");
  ASSERT_EQ(init.code, 0) << init.out;
  EXPECT_EQ(run("init " + q(store) + " --name X --capacity 5").code, 2) << "must not overwrite";

  auto csv = dir / "res.csv";
  cbtest::writeFile(
      csv, std::string(kHeader) +
               "A1,checked-out,2026-01-02,,2026-02-01,2026-02-03,2,STD,CORP,WEB,120.50,,\n"
               "A2,cancelled,2026-01-05,2026-01-20,2026-02-01,2026-02-02,1,STD,FLEX,OTA,99,,\n"
               "A3,booked,2026-01-06,,2026-03-01,2026-03-01,1,STD,CORP,WEB,0,,\n");
  CliRun imp = run("import " + q(store) + " " + q(csv));
  ASSERT_EQ(imp.code, 0) << imp.out;
  EXPECT_NE(imp.out.find("added 3"), std::string::npos) << imp.out;

  CliRun again = run("import " + q(store) + " " + q(csv));
  ASSERT_EQ(again.code, 0) << again.out;
  EXPECT_NE(again.out.find("added 0, updated 0, unchanged 3"), std::string::npos) << again.out;

  CliRun info = run("info " + q(store));
  ASSERT_EQ(info.code, 0) << info.out;
  EXPECT_NE(info.out.find("Test House"), std::string::npos) << info.out;
  EXPECT_NE(info.out.find("1,200 rooms"), std::string::npos) << info.out; // thousands separator
  EXPECT_NE(info.out.find("Reservations  3 (1 day-use)"), std::string::npos) << info.out;
  EXPECT_NE(info.out.find("Data as of    2026-01-20"), std::string::npos) << info.out;
  EXPECT_NE(info.out.find("Import log"), std::string::npos) << info.out;
}

TEST(Cli, RejectedRowExitsOneAndNamesFileLineColumn) {
  cbtest::TempDir dir;
  auto store = dir / "h.curvebench";
  ASSERT_EQ(run("init " + q(store) + " --name T --capacity 10").code, 0);
  auto csv = dir / "bad.csv";
  cbtest::writeFile(csv, std::string(kHeader) +
                             "B1,booked,2026-01-02,,2026-02-01,2026-02-03,1,STD,CORP,WEB,100,,\n"
                             "B2,booked,2026-01-02,,2026-02-05,2026-02-03,1,STD,CORP,WEB,100,,\n");
  CliRun strict = run("import " + q(store) + " " + q(csv));
  EXPECT_EQ(strict.code, 1) << strict.out;
  EXPECT_NE(strict.out.find("bad.csv:3:6:"), std::string::npos) << strict.out; // departure column
  EXPECT_NE(strict.out.find("nothing written"), std::string::npos) << strict.out;
  EXPECT_NE(run("info " + q(store)).out.find("Reservations  0"), std::string::npos);

  auto rejects = dir / "rejects.csv";
  CliRun lenient = run("import " + q(store) + " " + q(csv) + " --lenient --rejects " + q(rejects));
  EXPECT_EQ(lenient.code, 1) << lenient.out;
  EXPECT_NE(lenient.out.find("added 1"), std::string::npos) << lenient.out;
  EXPECT_NE(cbtest::readFile(rejects).find("B2"), std::string::npos);
}

TEST(Cli, IoAndUsageProblemsExitTwo) {
  cbtest::TempDir dir;
  auto store = dir / "h.curvebench";
  CliRun zero = run("init " + q(store) + " --name T --capacity 0");
  EXPECT_EQ(zero.code, 2) << zero.out;
  EXPECT_NE(zero.out.find("capacity"), std::string::npos) << zero.out;
  ASSERT_EQ(run("init " + q(store) + " --name T --capacity 10").code, 0);
  auto csv = dir / "ok.csv";
  cbtest::writeFile(csv, std::string(kHeader) +
                             "B1,booked,2026-01-02,,2026-02-01,2026-02-03,1,STD,CORP,WEB,100,,\n");
  // --rejects only makes sense with --lenient.
  EXPECT_EQ(run("import " + q(store) + " " + q(csv) + " --rejects " + q(dir / "r.csv")).code, 2);
  CliRun missing = run("import " + q(store) + " " + q(dir / "nonexist.csv"));
  EXPECT_EQ(missing.code, 2) << missing.out;
  EXPECT_NE(missing.out.find("nonexist.csv"), std::string::npos) << missing.out;
  EXPECT_EQ(missing.out.find("Success"), std::string::npos) << missing.out;
  CliRun profile = run("import " + q(store) + " " + q(csv) + " --profile no-such-profile");
  EXPECT_EQ(profile.code, 2) << profile.out;
  EXPECT_NE(profile.out.find("no-such-profile"), std::string::npos) << profile.out;
  // None of it wrote anything.
  EXPECT_NE(run("info " + q(store)).out.find("Reservations  0"), std::string::npos);
}

TEST(Cli, SampleReproducesCommittedFilesByteForByte) {
  cbtest::TempDir dir;
  CliRun r = run("sample " + q(dir / "out"));
  ASSERT_EQ(r.code, 0) << r.out;
  const char *files[] = {"reservations.csv", "blocks.csv", "denials.csv",
                         "true_demand.csv",  "events.csv", "property.json"};
  for (const char *name : files) {
    auto made = dir / "out" / name;
    auto committed = cbtest::sourceDir() / "sample_property" / name;
    ASSERT_TRUE(std::filesystem::exists(made)) << name << " was not written";
    std::string a = cbtest::readFile(made);
    EXPECT_FALSE(a.empty()) << name;
    EXPECT_TRUE(a == cbtest::readFile(committed)) << name << " differs from the committed sample";
  }
}
