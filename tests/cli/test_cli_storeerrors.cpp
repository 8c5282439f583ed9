// What the command line says about a store it cannot use (issue 9): the message names the file
// and the problem, the exit code is 2, and the file is left as it was.
#include "core/sha256.h"
#include "core/sqlite.h"

#include "testsupport.h"

#include <fstream>

namespace {

using cbtest::CliRun;

CliRun run(const std::string &args) { return cbtest::runCli(CURVEBENCH_CLI, args); }
std::string q(const std::filesystem::path &p) { return cbtest::quotePath(p); }

/// A store of 3,000 reservations made through the command line.
std::filesystem::path makeStore(const cbtest::TempDir &dir) {
  const auto store = dir / "hotel store.curvebench"; // a space in the name, on purpose
  EXPECT_EQ(run("init " + q(store) + " --name Harbour --capacity 80").code, 0);
  std::ofstream out(dir / "rows.csv", std::ios::binary);
  out << "reservation_id,status,booked_on,cancelled_on,arrival,departure,rooms,room_type,"
         "segment,channel,rate,currency,block_id\n";
  for (int i = 0; i < 3000; ++i)
    out << "R" << i << ",booked,2025-01-01,,2025-03-01,2025-03-03,1,DBL,LEIS,Web,90,EUR,\n";
  out.close();
  EXPECT_EQ(run("import " + q(store) + " " + q(dir / "rows.csv")).code, 0);
  return store;
}

} // namespace

TEST(CliStoreErrors, NewerSchemaIsRefusedWithAClearMessage) {
  cbtest::TempDir dir;
  const auto store = makeStore(dir);
  {
    cb::SqliteDb db(store, cb::SqliteDb::Mode::OpenExisting);
    db.exec("PRAGMA user_version = 42");
  }
  const auto before = cb::sha256File(store);
  CliRun r = run("info " + q(store));
  EXPECT_EQ(r.code, 2);
  EXPECT_NE(r.out.find(store.string() + " was written by a newer Curvebench (schema 42"),
            std::string::npos)
      << r.out;
  EXPECT_EQ(cb::sha256File(store), before);
}

TEST(CliStoreErrors, TruncatedStoreIsRefusedAndLeftAsItWas) {
  cbtest::TempDir dir;
  const auto store = makeStore(dir);
  std::filesystem::resize_file(store, std::filesystem::file_size(store) / 2);
  const auto before = cb::sha256File(store);
  CliRun r = run("import " + q(store) + " " + q(dir / "rows.csv"));
  EXPECT_EQ(r.code, 2);
  EXPECT_NE(r.out.find("curvebench: " + store.string() + " is damaged: the file is cut short"),
            std::string::npos)
      << r.out;
  EXPECT_EQ(cb::sha256File(store), before);
}

TEST(CliStoreErrors, ImportFileThatIsAStoreIsNamedAsSuch) {
  cbtest::TempDir dir;
  const auto store = makeStore(dir);
  // A user picks the store itself as the file to import.
  CliRun r = run("import " + q(store) + " " + q(store));
  EXPECT_EQ(r.code, 1);
  EXPECT_NE(r.out.find(store.string() + ":1:1: the file is an SQLite database (a Curvebench "
                                        "store?), not CSV text"),
            std::string::npos)
      << r.out;
}
