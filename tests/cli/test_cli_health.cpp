// End-to-end runs of `curvebench health`: findings one per line and the exit code.
#include "core/store.h"
#include "testsupport.h"

#include <algorithm>
#include <memory>
#include <vector>

namespace {

using cbtest::CliRun;

CliRun run(const std::string &args) { return cbtest::runCli(CURVEBENCH_CLI, args); }

std::string q(const std::filesystem::path &p) { return cbtest::quotePath(p); }

cb::Date d(const char *iso) { return *cb::Date::parseIso(iso); }

/// A store of `capacity` rooms whose only segment CORP is set up, holding one-night stays of
/// one room booked 2 days ahead, one per night from `first` to `last`, plus `extra`.
std::unique_ptr<cb::Store> makeStore(const std::filesystem::path &path, int capacity,
                                     cb::Date first, cb::Date last,
                                     std::vector<cb::Reservation> extra = {}) {
  cb::Property p;
  p.name = "Health House";
  p.capacity = capacity;
  auto store = cb::Store::create(path, p);
  store->upsertSegment({"CORP", "Corporate", 1, "#0072B2"});
  cb::Store::Transaction tx(*store);
  int n = 0;
  for (cb::Date a = first; a <= last; ++a) {
    cb::Reservation r;
    r.id = "H" + std::to_string(++n);
    r.bookedOn = a - 2;
    r.arrival = a;
    r.departure = a + 1;
    r.segment = "CORP";
    r.rate = 90;
    store->upsertReservation(r, 0);
  }
  for (auto &r : extra) {
    r.id = "X" + std::to_string(++n);
    store->upsertReservation(r, 0);
  }
  tx.commit();
  return store;
}

std::size_t lines(const std::string &s) {
  return static_cast<std::size_t>(std::count(s.begin(), s.end(), '\n'));
}

} // namespace

TEST(CliHealth, Help) {
  CliRun r = run("health --help");
  EXPECT_EQ(r.code, 0) << r.out;
  EXPECT_NE(r.out.find("--gap-days"), std::string::npos) << r.out;
}

TEST(CliHealth, CleanStoreExitsZero) {
  cbtest::TempDir dir;
  makeStore(dir / "clean.curvebench", 5, d("2026-01-01"), d("2026-03-31"));
  CliRun r = run("health " + q(dir / "clean.curvebench"));
  EXPECT_EQ(r.code, 0) << r.out;
  EXPECT_EQ(r.out, (dir / "clean.curvebench").string() + ": no findings\n");
}

TEST(CliHealth, NotesAloneExitZero) {
  cbtest::TempDir dir;
  cb::Property p;
  p.name = "Empty";
  p.capacity = 3;
  cb::Store::create(dir / "empty.curvebench", p);
  CliRun r = run("health " + q(dir / "empty.curvebench"));
  EXPECT_EQ(r.code, 0) << r.out;
  EXPECT_EQ(r.out, (dir / "empty.curvebench").string() + ": note: no reservations to check\n");
}

TEST(CliHealth, WarningsOnePerLineExitOne) {
  cbtest::TempDir dir;
  const auto path = dir / "h.curvebench";
  // Two more rooms on 10 February (capacity 2) and a segment the import created bare; no
  // booking was made on 1–8 March (8 days: the stays of 3–10 March were booked earlier).
  std::vector<cb::Reservation> extra;
  cb::Reservation r;
  r.bookedOn = d("2026-01-20");
  r.arrival = d("2026-02-10");
  r.departure = d("2026-02-11");
  r.rooms = 2;
  r.segment = "OTA";
  extra.push_back(r);
  for (cb::Date a = d("2026-03-03"); a <= d("2026-03-31"); ++a) {
    cb::Reservation s;
    s.bookedOn = a <= d("2026-03-10") ? a - 10 : a - 2;
    s.arrival = a;
    s.departure = a + 1;
    s.segment = "CORP";
    extra.push_back(s);
  }
  makeStore(path, 2, d("2026-01-01"), d("2026-03-02"), extra);
  const std::string prefix = path.string() + ": warning: ";
  CliRun r1 = run("health " + q(path));
  EXPECT_EQ(r1.code, 1) << r1.out;
  EXPECT_EQ(r1.out, prefix + "no bookings made from 2026-03-01 to 2026-03-08 (8 days)\n" + prefix +
                        "night 2026-02-10: 3 rooms on the books, capacity 2 (1 over)\n" + prefix +
                        "segment \"OTA\" is not set up (no name, no yield rank): 1 reservation\n");
  EXPECT_EQ(lines(r1.out), 3u);

  // A longer minimum gap leaves the 8 days out.
  CliRun r2 = run("health " + q(path) + " --gap-days 9");
  EXPECT_EQ(r2.code, 1) << r2.out;
  EXPECT_EQ(r2.out.find("no bookings made"), std::string::npos) << r2.out;
  EXPECT_EQ(lines(r2.out), 2u);
}

TEST(CliHealth, UsageAndIoProblemsExitTwo) {
  cbtest::TempDir dir;
  EXPECT_EQ(run("health").code, 2);
  CliRun missing = run("health " + q(dir / "missing.curvebench"));
  EXPECT_EQ(missing.code, 2) << missing.out;
  EXPECT_NE(missing.out.find("missing.curvebench"), std::string::npos) << missing.out;
  makeStore(dir / "h.curvebench", 5, d("2026-01-01"), d("2026-01-31"));
  EXPECT_EQ(run("health " + q(dir / "h.curvebench") + " --gap-days 0").code, 2);
  cbtest::writeFile(dir / "not-a-store.curvebench", "hello\n");
  EXPECT_EQ(run("health " + q(dir / "not-a-store.curvebench")).code, 2);
}
