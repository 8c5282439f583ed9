// Store robustness (issue 9): a damaged, read-only, busy, full or shared store gives a clear
// message naming the file, and loses nothing.
#include "core/reservationimporter.h"
#include "core/reservationsnapshot.h"
#include "core/sha256.h"
#include "core/sqlite.h"
#include "core/store.h"

#include "testsupport.h"

#include <gtest/gtest.h>

#include <fmt/format.h>

#include <csignal>
#include <fstream>

#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

namespace fs = std::filesystem;

namespace {

/// A native file of `rows` reservations R000000…, two years of arrivals.
void writeRows(const fs::path &file, int rows, int firstId = 0) {
  std::ofstream out(file, std::ios::binary);
  out << "reservation_id,status,booked_on,cancelled_on,arrival,departure,rooms,room_type,"
         "segment,channel,rate,currency,block_id\n";
  const cb::Date first = cb::Date::fromYmd(2025, 1, 1);
  for (int i = firstId; i < firstId + rows; ++i) {
    const cb::Date arrival = first + i % 730;
    out << fmt::format("R{:06},booked,{},,{},{},1,DBL,LEIS,Web,{},EUR,\n", i,
                       (arrival - i % 60).toIso(), arrival.toIso(), (arrival + 2).toIso(),
                       90 + i % 40);
  }
}

class StoreRobustness : public ::testing::Test {
protected:
  cbtest::TempDir dir;
  fs::path path = dir / "hotel.curvebench";

  /// A store with `rows` reservations, closed (its write-ahead log folded in).
  void makeStore(int rows) {
    cb::Property p;
    p.name = "Robust house";
    p.capacity = 120;
    auto store = cb::Store::create(path, p);
    writeRows(dir / "rows.csv", rows);
    ASSERT_TRUE(cb::importReservations(*store, dir / "rows.csv").written);
  }

  /// Every reservation and the import log, as text.
  static std::string content(cb::Store &store) {
    std::string s;
    for (const auto &r : store.reservations())
      s += fmt::format("{} {} {} {}\n", r.id, r.arrival.toIso(), r.rooms, r.rate);
    for (const auto &e : store.importLog())
      s += fmt::format("{} {} {} {}\n", e.id, e.file, e.added, e.outcome);
    return s;
  }
};

/// The message of the StoreError `f` throws, or "" when it throws nothing.
template <class F> std::string storeErrorOf(F &&f) {
  try {
    f();
  } catch (const cb::StoreError &e) {
    return e.what();
  }
  return "";
}

TEST_F(StoreRobustness, TruncatedStoreIsRefusedNamingTheFileAndLeftAsItWas) {
  makeStore(3000);
  const auto size = fs::file_size(path);
  ASSERT_GT(size, 100'000U);
  fs::resize_file(path, size / 2);
  const auto before = cb::sha256File(path);
  const std::string msg = storeErrorOf([&] { cb::Store::open(path); });
  EXPECT_NE(msg.find(path.string()), std::string::npos) << msg;
  EXPECT_NE(msg.find("is damaged: the file is cut short"), std::string::npos) << msg;
  EXPECT_NE(msg.find(fmt::format("{} bytes", size / 2)), std::string::npos) << msg;
  EXPECT_EQ(cb::sha256File(path), before); // refused before anything was written
}

TEST_F(StoreRobustness, CorruptedBytesAreReportedAsDamageAndNothingIsWritten) {
  makeStore(3000);
  // Without the snapshot beside it (core/reservationsnapshot.h): a current snapshot would serve
  // the reads below without touching the damaged pages; the import further down still meets them.
  fs::remove(cb::snapshotPathFor(path));
  const auto size = fs::file_size(path);
  const std::uint64_t pageSize = 4096; // SQLite's default page size
  {
    // Every third page of the middle half of the file is overwritten with a pattern.
    std::fstream f(path, std::ios::in | std::ios::out | std::ios::binary);
    const std::string junk(pageSize, '\x55');
    for (std::uint64_t page = size / pageSize / 4; page < 3 * size / pageSize / 4; page += 3) {
      f.seekp(static_cast<std::streamoff>(page * pageSize));
      f.write(junk.data(), static_cast<std::streamsize>(junk.size()));
    }
  }
  const auto before = cb::sha256File(path);
  const std::string msg = storeErrorOf([&] {
    auto store = cb::Store::open(path);
    (void)store->reservations();
    (void)store->summary();
  });
  EXPECT_NE(msg.find(path.string() + " is damaged and cannot be read safely"), std::string::npos)
      << msg;
  // An import into it is refused as well, and the file is not made worse.
  const std::string importMsg = storeErrorOf([&] {
    auto store = cb::Store::open(path);
    writeRows(dir / "more.csv", 2000, 5000);
    cb::importReservations(*store, dir / "more.csv");
  });
  EXPECT_NE(importMsg.find("is damaged"), std::string::npos) << importMsg;
  EXPECT_EQ(cb::sha256File(path), before);
}

TEST_F(StoreRobustness, ReadOnlyStoreReadsButRefusesWritesSayingWhy) {
  makeStore(200);
  std::string before;
  {
    auto rw = cb::Store::open(path);
    before = content(*rw);
  }
  auto store = cb::Store::open(path, cb::Store::Access::ReadOnly);
  EXPECT_TRUE(store->readOnly());
  EXPECT_EQ(store->reservationCount(), 200);
  writeRows(dir / "more.csv", 10, 1000);
  const std::string msg = storeErrorOf([&] { cb::importReservations(*store, dir / "more.csv"); });
  EXPECT_EQ(msg, path.string() + " is open for reading only; nothing was written");
  EXPECT_NE(
      storeErrorOf([&] {
        store->addEvent({cb::Date::fromYmd(2025, 1, 1), cb::Date::fromYmd(2025, 1, 1), "fair"});
      }),
      "");
  EXPECT_EQ(content(*store), before);
}

TEST_F(StoreRobustness, WriteProtectedFileOpensReadOnly) {
  if (geteuid() == 0)
    GTEST_SKIP() << "running as root, which writes through file permissions; the read-only "
                    "behaviour itself is checked through Access::ReadOnly above";
  makeStore(50);
  fs::permissions(path, fs::perms::owner_read | fs::perms::group_read | fs::perms::others_read);
  auto store = cb::Store::open(path);
  EXPECT_TRUE(store->readOnly());
  EXPECT_NE(store->readOnlyReason().find("is write-protected"), std::string::npos);
  writeRows(dir / "more.csv", 10, 1000);
  const std::string msg = storeErrorOf([&] { cb::importReservations(*store, dir / "more.csv"); });
  EXPECT_NE(msg.find("write-protected"), std::string::npos) << msg;
  EXPECT_EQ(store->reservationCount(), 50);
}

TEST_F(StoreRobustness, StoreBusyInAnotherProcessGivesInUseMessageAndLosesNothing) {
  makeStore(100);
  int ready[2];
  ASSERT_EQ(pipe(ready), 0);
  const pid_t child = fork();
  ASSERT_GE(child, 0);
  if (child == 0) {
    // Another program: holds a write transaction open until it is killed.
    close(ready[0]);
    try {
      cb::SqliteDb db(path, cb::SqliteDb::Mode::OpenExisting);
      db.exec("BEGIN IMMEDIATE; INSERT INTO events (starts_on, ends_on, label) "
              "VALUES ('2025-01-01', '2025-01-01', 'not committed')");
      const char ok = 'y';
      if (write(ready[1], &ok, 1) != 1)
        _exit(2);
      for (;;)
        pause();
    } catch (...) {
      _exit(1);
    }
  }
  close(ready[1]);
  char got = 0;
  ASSERT_EQ(read(ready[0], &got, 1), 1);
  close(ready[0]);

  auto store = cb::Store::open(path);
  const std::string before = content(*store);
  store->sqliteForTesting().setBusyTimeout(200); // the program waits 5 s; the test need not
  writeRows(dir / "more.csv", 10, 1000);
  const std::string msg = storeErrorOf([&] { cb::importReservations(*store, dir / "more.csv"); });
  kill(child, SIGKILL);
  int status = 0;
  waitpid(child, &status, 0);
  EXPECT_NE(msg.find(path.string() + " is in use by another program"), std::string::npos) << msg;
  EXPECT_EQ(content(*store), before);
  EXPECT_TRUE(store->events().empty()); // the other program's open transaction died with it
  // Once the other program is gone the same import goes through.
  EXPECT_TRUE(cb::importReservations(*store, dir / "more.csv").written);
  EXPECT_EQ(store->reservationCount(), 110);
}

TEST_F(StoreRobustness, DiskFullDuringImportGivesAClearMessageAndLosesNothing) {
  makeStore(500);
  auto store = cb::Store::open(path);
  const std::string before = content(*store);
  auto &db = store->sqliteForTesting();
  // SQLite's per-connection page limit stands in for a full disk: both fail with SQLITE_FULL.
  const auto pages = db.queryInt64("PRAGMA page_count");
  db.exec(fmt::format("PRAGMA max_page_count = {}", pages + 4));
  writeRows(dir / "more.csv", 20'000, 1000);
  const std::string msg = storeErrorOf([&] { cb::importReservations(*store, dir / "more.csv"); });
  EXPECT_NE(msg.find(path.string() + ": the disk is full"), std::string::npos) << msg;
  EXPECT_FALSE(db.inTransaction());
  EXPECT_EQ(content(*store), before);
  EXPECT_EQ(db.queryText("PRAGMA integrity_check"), "ok");
  // With room again, the same import succeeds: nothing was left half-written in the way.
  db.exec("PRAGMA max_page_count = 1073741823");
  auto rep = cb::importReservations(*store, dir / "more.csv");
  EXPECT_TRUE(rep.written);
  EXPECT_EQ(store->reservationCount(), 20'500);
}

TEST_F(StoreRobustness, NewerSchemaIsRefusedWithBothVersionsAndTheFileUntouched) {
  makeStore(10);
  {
    cb::SqliteDb db(path, cb::SqliteDb::Mode::OpenExisting);
    db.exec("PRAGMA user_version = 99");
  }
  const auto before = cb::sha256File(path);
  const std::string msg = storeErrorOf([&] { cb::Store::open(path); });
  EXPECT_EQ(msg, fmt::format("{} was written by a newer Curvebench (schema 99; this build reads "
                             "up to {}); update Curvebench to open it",
                             path.string(), cb::Store::kSchemaVersion));
  EXPECT_EQ(cb::sha256File(path), before);
}

TEST_F(StoreRobustness, SecondWindowOnOneStoreOpensReadOnlyAndSaysSo) {
  makeStore(20);
  auto first = cb::Store::open(path, cb::Store::Access::WriterElseReadOnly);
  EXPECT_FALSE(first->readOnly());
  EXPECT_EQ(first->readOnlyReason(), "");
  auto second = cb::Store::open(path, cb::Store::Access::WriterElseReadOnly);
  EXPECT_TRUE(second->readOnly());
  EXPECT_EQ(second->readOnlyReason(),
            path.string() + " is open in another Curvebench window, so this one can only read "
                            "it; close the other window to make changes here");
  EXPECT_EQ(second->reservationCount(), 20); // reading works
  const std::string msg = storeErrorOf([&] { second->setProperty(second->property()); });
  EXPECT_EQ(msg, second->readOnlyReason() + "; nothing was written");
  // The first window writes, and the second one sees it.
  first->addEvent({cb::Date::fromYmd(2025, 3, 1), cb::Date::fromYmd(2025, 3, 2), "Fair"});
  EXPECT_EQ(second->events().size(), 1U);
  // Once the first window closes, the next one may write.
  second.reset();
  first.reset();
  auto third = cb::Store::open(path, cb::Store::Access::WriterElseReadOnly);
  EXPECT_FALSE(third->readOnly());
  // A plain read-write open (the command line) is not kept out by the window's lock.
  auto cli = cb::Store::open(path);
  EXPECT_FALSE(cli->readOnly());
}

// What an import's progress callback saw of the files beside the store: the rollback journal
// of Store::DirectWrite ("<store>-journal") or the write-ahead log ("<store>-wal").
struct LogFilesSeen {
  fs::path store;
  bool journal = false;
  bool wal = false;
  static bool look(void *context, std::int64_t, std::int64_t) {
    auto &seen = *static_cast<LogFilesSeen *>(context);
    std::error_code ec;
    seen.journal = seen.journal || fs::exists(seen.store.string() + "-journal", ec);
    seen.wal = seen.wal || fs::exists(seen.store.string() + "-wal", ec);
    return true;
  }
};

TEST_F(StoreRobustness, FirstImportGoesThroughTheRollbackJournalAndLeavesTheStoreInWalMode) {
  {
    cb::Property p;
    p.name = "Robust house";
    p.capacity = 120;
    cb::Store::create(path, p);
  }
  writeRows(dir / "rows.csv", 20'000);
  auto store = cb::Store::open(path);
  LogFilesSeen seen{path};
  cb::ImportOptions options;
  options.progress = &LogFilesSeen::look;
  options.progressContext = &seen;
  ASSERT_TRUE(cb::importReservations(*store, dir / "rows.csv", options).written);
  EXPECT_TRUE(seen.journal); // each page written once, into the store itself
  EXPECT_FALSE(seen.wal);
  auto &db = store->sqliteForTesting();
  EXPECT_EQ(db.queryText("PRAGMA journal_mode"), "wal"); // back to the log once committed
  EXPECT_EQ(db.queryInt64("PRAGMA synchronous"), 1);     // NORMAL again (SQLite PRAGMA docs)
  EXPECT_EQ(db.queryText("PRAGMA integrity_check"), "ok");
  EXPECT_EQ(store->reservationCount(), 20'000);
  EXPECT_FALSE(fs::exists(path.string() + "-journal"));
  // Written without SQLite's foreign-key lookups (the import put each code in its table first):
  // none is broken, and the checks are on again for what follows.
  EXPECT_EQ(db.queryInt64("SELECT count(*) FROM pragma_foreign_key_check"), 0);
  EXPECT_EQ(db.queryInt64("SELECT count(*) FROM segments WHERE code = 'LEIS'"), 1);
  EXPECT_EQ(db.queryInt64("PRAGMA foreign_keys"), 1);
  // The store's own count refuses this one; SQLite's foreign key the raw delete below.
  EXPECT_THROW(store->deleteSegment("LEIS"), cb::StoreError); // 20,000 reservations use it
  EXPECT_THROW(db.exec("DELETE FROM channels WHERE code = 'Web'"), cb::StoreError);

  // The next import (the store holds reservations now) goes through the log as always.
  writeRows(dir / "more.csv", 5'000, 20'000);
  seen = LogFilesSeen{path};
  ASSERT_TRUE(cb::importReservations(*store, dir / "more.csv", options).written);
  EXPECT_TRUE(seen.wal);
  EXPECT_FALSE(seen.journal);
  EXPECT_EQ(store->reservationCount(), 25'000);
  store.reset();
  auto again = cb::Store::open(path, cb::Store::Access::ReadOnly);
  EXPECT_EQ(again->reservationCount(), 25'000);
}

// A first import that fails (strict, one bad row) leaves the foreign-key checks on, as one that
// succeeds does: they are off only while its DirectWrite lives.
TEST_F(StoreRobustness, FailedFirstImportLeavesForeignKeysOn) {
  {
    cb::Property p;
    p.name = "Robust house";
    p.capacity = 120;
    cb::Store::create(path, p);
  }
  writeRows(dir / "rows.csv", 2'000);
  {
    std::ofstream out(dir / "rows.csv", std::ios::binary | std::ios::app);
    out << "R999999,booked,2025-01-01,,2025-02-10,2025-02-08,1,DBL,LEIS,Web,90,EUR,\n";
  }
  auto store = cb::Store::open(path);
  EXPECT_FALSE(cb::importReservations(*store, dir / "rows.csv").written);
  EXPECT_EQ(store->reservationCount(), 0);
  auto &db = store->sqliteForTesting();
  EXPECT_EQ(db.queryInt64("PRAGMA foreign_keys"), 1);
  EXPECT_EQ(db.queryText("PRAGMA journal_mode"), "wal");
  db.exec("INSERT INTO segments (code) VALUES ('ONLY')");
  db.exec("INSERT INTO reservations (id, status, booked_on, arrival, departure, rooms, segment, "
          "rate) VALUES ('X1', 'booked', '2025-01-01', '2025-02-01', '2025-02-02', 1, 'ONLY', 1)");
  EXPECT_THROW(db.exec("DELETE FROM segments WHERE code = 'ONLY'"), cb::StoreError);
}

TEST_F(StoreRobustness, FirstImportWithTheStoreOpenElsewhereGoesThroughTheLog) {
  {
    cb::Property p;
    p.name = "Robust house";
    p.capacity = 120;
    cb::Store::create(path, p);
  }
  auto reader = cb::Store::open(path, cb::Store::Access::ReadOnly); // the workbench, say
  EXPECT_EQ(reader->reservationCount(), 0);
  auto store = cb::Store::open(path);
  {
    cb::Store::DirectWrite direct(*store);
    EXPECT_FALSE(direct.active()); // SQLite cannot leave WAL mode while another connection reads
  }
  writeRows(dir / "rows.csv", 10'000);
  LogFilesSeen seen{path};
  cb::ImportOptions options;
  options.progress = &LogFilesSeen::look;
  options.progressContext = &seen;
  ASSERT_TRUE(cb::importReservations(*store, dir / "rows.csv", options).written);
  EXPECT_TRUE(seen.wal);
  EXPECT_FALSE(seen.journal);
  EXPECT_EQ(store->sqliteForTesting().queryText("PRAGMA journal_mode"), "wal");
  EXPECT_EQ(reader->reservationCount(), 10'000); // the other connection sees the commit
}

TEST_F(StoreRobustness, FirstImportCutShortIsUndoneAtTheNextOpen) {
  {
    cb::Property p;
    p.name = "Robust house";
    p.capacity = 120;
    cb::Store::create(path, p);
  }
  const auto emptySize = fs::file_size(path);
  const pid_t child = fork();
  ASSERT_GE(child, 0);
  if (child == 0) {
    // A first import that dies halfway: its rows partly written into the store file itself
    // (a page cache of 8 pages spills them), the rollback journal beside it.
    try {
      auto store = cb::Store::open(path);
      cb::Store::DirectWrite direct(*store);
      if (!direct.active())
        _exit(3);
      cb::Store::Transaction tx(*store);
      store->sqliteForTesting().exec("PRAGMA cache_size = 8");
      for (int i = 0; i < 20'000; ++i) {
        cb::Reservation r;
        r.id = fmt::format("R{:06}", i);
        r.status = cb::ReservationStatus::Booked;
        r.arrival = cb::Date::fromYmd(2025, 1, 1) + i % 700;
        r.departure = r.arrival + 2;
        r.bookedOn = r.arrival - 30;
        r.rooms = 1;
        r.segment = "LEIS";
        r.rate = 100;
        store->upsertReservation(r, 0);
      }
      std::error_code ec;
      const bool journal = fs::exists(path.string() + "-journal", ec);
      const bool grown = fs::file_size(path, ec) > 4 * emptySize;
      _exit(journal && grown ? 0 : 4); // no commit, no clean-up: as a crash leaves it
    } catch (...) {
      _exit(5);
    }
  }
  int status = 0;
  ASSERT_EQ(waitpid(child, &status, 0), child);
  ASSERT_TRUE(WIFEXITED(status));
  ASSERT_EQ(WEXITSTATUS(status), 0) << "the child did not leave a half-written store";
  ASSERT_TRUE(fs::exists(path.string() + "-journal"));

  auto store = cb::Store::open(path); // not refused as cut short: SQLite undoes the write
  EXPECT_EQ(store->reservationCount(), 0);
  auto &db = store->sqliteForTesting();
  EXPECT_EQ(db.queryText("PRAGMA journal_mode"), "wal");
  EXPECT_EQ(db.queryText("PRAGMA integrity_check"), "ok");
  EXPECT_FALSE(fs::exists(path.string() + "-journal"));
  // And the import can simply be run again.
  writeRows(dir / "rows.csv", 3'000);
  ASSERT_TRUE(cb::importReservations(*store, dir / "rows.csv").written);
  EXPECT_EQ(store->reservationCount(), 3'000);
}

} // namespace
