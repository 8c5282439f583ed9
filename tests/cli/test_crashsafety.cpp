// Crash safety (issue 9): `curvebench import` of a large file is killed (SIGKILL) at random
// moments, many times. After every kill the store must open, pass PRAGMA integrity_check, and
// hold exactly the state before the import or exactly the state after it: never a mix.
//
// The seed is printed; CURVEBENCH_CRASH_SEED=<n> repeats a run, CURVEBENCH_CRASH_KILLS=<n>
// changes the number of kills (default 60) and CURVEBENCH_CRASH_ROWS the file size (default
// 50,000 reservations in an optimised build, 25,000 in a debug build, where an import is about
// twice as slow per row: either way a run stays near a minute on an idle 2-core machine).
#include "core/sha256.h"
#include "core/sqlite.h"
#include "core/store.h"

#include "testsupport.h"

#include <gtest/gtest.h>

#include <fmt/format.h>

#include <chrono>
#include <csignal>
#include <cstdlib>
#include <fstream>
#include <random>
#include <thread>

#include <sys/wait.h>
#include <unistd.h>

namespace fs = std::filesystem;
using Clock = std::chrono::steady_clock;

namespace {

long envOr(const char *name, long fallback) {
  const char *v = std::getenv(name);
  return v && *v ? std::strtol(v, nullptr, 10) : fallback;
}

/// A native file of `rows` reservations, ids R0000001…, spread over two years of arrivals.
void writeBigFile(const fs::path &file, long rows, int rateOffset) {
  std::ofstream out(file, std::ios::binary);
  out << "reservation_id,status,booked_on,cancelled_on,arrival,departure,rooms,room_type,"
         "segment,channel,rate,currency,block_id\n";
  const cb::Date first = cb::Date::fromYmd(2025, 1, 1);
  for (long i = 0; i < rows; ++i) {
    const cb::Date arrival = first + static_cast<int>(i % 730);
    const cb::Date booked = arrival - static_cast<int>(i % 90);
    out << fmt::format("R{:07},booked,{},,{},{},{},DBL,{},Web,{},EUR,\n", i, booked.toIso(),
                       arrival.toIso(), (arrival + 1 + static_cast<int>(i % 3)).toIso(), 1 + i % 2,
                       i % 2 ? "LEIS" : "CORP", 80 + rateOffset + i % 50);
  }
}

/// The state that matters: every reservation row and the import log without its clock times
/// (which differ between two runs of one import).
std::string stateHash(cb::SqliteDb &db) {
  cb::Sha256 h;
  auto rows = db.prepare("SELECT id || '|' || status || '|' || booked_on || '|' || "
                         "coalesce(cancelled_on, '') || '|' || arrival || '|' || departure || "
                         "'|' || rooms || '|' || coalesce(segment, '') || '|' || rate || '|' || "
                         "coalesce(import_id, '') FROM reservations ORDER BY id");
  while (rows.step())
    h.update(rows.columnText(0) + "\n");
  auto log = db.prepare("SELECT id || '|' || file || '|' || sha256 || '|' || kind || '|' || "
                        "rows_read || '|' || added || '|' || updated || '|' || unchanged || '|' "
                        "|| rejected || '|' || outcome FROM import_log ORDER BY id");
  while (log.step())
    h.update(log.columnText(0) + "\n");
  return h.hexDigest();
}

/// True when the store file's header says write-ahead log (file format bytes 18 and 19 are 2,
/// SQLite's "Database File Format", section 1.3.3), read without opening it with SQLite (an
/// open switches it to WAL mode itself).
bool headerSaysWal(const fs::path &p) {
  std::ifstream in(p, std::ios::binary);
  char header[20] = {};
  in.read(header, sizeof header);
  return in.gcount() == 20 && header[18] == 2 && header[19] == 2;
}

void removeStore(const fs::path &p) {
  for (const char *suffix : {"", "-wal", "-shm", "-journal"}) {
    fs::path f = p;
    f += suffix;
    fs::remove(f);
  }
}

pid_t startImport(const fs::path &store, const fs::path &file) {
  std::fflush(nullptr); // or the child's freopen() would print the parent's pending output again
  pid_t pid = fork();
  if (pid == 0) {
    // Quiet child: its output is not part of the test.
    std::FILE *null = std::freopen("/dev/null", "w", stdout);
    (void)null;
    null = std::freopen("/dev/null", "w", stderr);
    (void)null;
    execl(CURVEBENCH_CLI, CURVEBENCH_CLI, "import", store.c_str(), file.c_str(),
          static_cast<char *>(nullptr));
    _exit(127);
  }
  return pid;
}

/// Kills `kills` imports of `rows` reservations at random moments (see the file's comment).
/// `intoEmptyStore`: the old state is a new store with no reservations, so the import is a
/// first one, written through SQLite's rollback journal (Store::DirectWrite) instead of its
/// write-ahead log; else the old state holds 5,000 of the rows at other rates. Half the kill
/// moments fall between `nearFrom` and `nearTo` per cent of one import's time, near its commit.
void killImports(long kills, long rows, bool intoEmptyStore, long nearFrom, long nearTo) {
  const auto seed = static_cast<std::uint64_t>(
      envOr("CURVEBENCH_CRASH_SEED",
            static_cast<long>(std::chrono::system_clock::now().time_since_epoch().count() %
                              1'000'000'007L)));
  std::printf("crash-safety seed %llu (CURVEBENCH_CRASH_SEED), %ld kills, %ld rows, %s\n",
              static_cast<unsigned long long>(seed), kills, rows,
              intoEmptyStore ? "into an empty store" : "into a store holding 5,000 of them");
  std::mt19937_64 rng(seed);

  cbtest::TempDir dir;
  const auto pristine = dir / "pristine.curvebench";
  const auto work = dir / "work.curvebench";
  const auto oldFile = dir / "old.csv";
  const auto bigFile = dir / "big.csv";
  // The old state: the first 5,000 rows at other rates, so the import both adds and updates.
  writeBigFile(oldFile, 5'000, 7);
  writeBigFile(bigFile, rows, 0);
  {
    cb::Property p;
    p.name = "Crash house";
    p.capacity = 400;
    cb::Store::create(pristine, p);
  }
  if (!intoEmptyStore) {
    auto first = cbtest::runCli(CURVEBENCH_CLI, "import " + cbtest::quotePath(pristine) + " " +
                                                    cbtest::quotePath(oldFile));
    ASSERT_EQ(first.code, 0) << first.out;
  }
  std::string oldHash, newHash;
  {
    cb::SqliteDb db(pristine, cb::SqliteDb::Mode::OpenExisting);
    oldHash = stateHash(db);
  }
  // The new state, and how long an import takes on this machine.
  fs::copy_file(pristine, work);
  const auto t0 = Clock::now();
  auto full = cbtest::runCli(CURVEBENCH_CLI, "import " + cbtest::quotePath(work) + " " +
                                                 cbtest::quotePath(bigFile));
  const auto importTime = Clock::now() - t0;
  ASSERT_EQ(full.code, 0) << full.out;
  EXPECT_TRUE(headerSaysWal(work)); // a first import too leaves the store in WAL mode
  {
    cb::SqliteDb db(work, cb::SqliteDb::Mode::OpenExisting);
    EXPECT_EQ(db.queryInt64("SELECT count(*) FROM reservations"), rows);
    newHash = stateHash(db);
  }
  ASSERT_NE(oldHash, newHash);
  const auto importMs = std::chrono::duration_cast<std::chrono::milliseconds>(importTime).count();
  std::printf("one full import takes %lld ms\n", static_cast<long long>(importMs));

  // Kill moments: every other one uniform over 110 % of one import (some land after it has
  // finished), the rest over nearFrom … nearTo % of it, where the commit writes. An
  // import's time varies on a busy machine, so the estimate follows the runs that finished.
  // Runs until `kills` processes were killed (at most 3 × kills attempts).
  double estimateMs = static_cast<double>(importMs);
  int killedBeforeOpen = 0, killedOld = 0, killedWhileWriting = 0, killedNew = 0, finished = 0;
  long killed = 0;
  for (long k = 0; killed < kills && k < 3 * kills; ++k) {
    removeStore(work);
    fs::copy_file(pristine, work);
    const auto t = static_cast<long long>(estimateMs);
    const long long waitMs =
        k % 2 == 0
            ? std::uniform_int_distribution<long long>(0, t * 11 / 10)(rng)
            : std::uniform_int_distribution<long long>(t * nearFrom / 100, t * nearTo / 100)(rng);
    const pid_t pid = startImport(work, bigFile);
    ASSERT_GT(pid, 0);
    const auto started = Clock::now();
    int status = 0;
    bool exited = false;
    while (Clock::now() - started < std::chrono::milliseconds(waitMs)) {
      if (waitpid(pid, &status, WNOHANG) == pid) {
        exited = true;
        const auto took =
            std::chrono::duration_cast<std::chrono::milliseconds>(Clock::now() - started);
        estimateMs = (estimateMs + static_cast<double>(took.count())) / 2;
        break;
      }
      std::this_thread::sleep_for(std::chrono::milliseconds(2));
    }
    if (!exited) {
      kill(pid, SIGKILL);
      ASSERT_EQ(waitpid(pid, &status, 0), pid);
      ++killed;
    }
    SCOPED_TRACE(fmt::format("kill {} after {} ms (seed {})", k, waitMs, seed));
    // How far the killed program had got: the shared-memory index appears when it first reads
    // the store, the write-ahead log grows once it writes (at the commit, for an import that
    // fits SQLite's page cache). A first import leaves the log for the rollback journal, which
    // appears at its first write; its commit then writes straight into the store, which grows.
    fs::path wal = work, shm = work, journal = work;
    wal += "-wal";
    shm += "-shm";
    journal += "-journal";
    std::error_code ec;
    const bool journalThere = fs::exists(journal, ec);
    const bool opened = fs::exists(shm, ec) || journalThere;
    const bool walAtEnd = headerSaysWal(work); // before our own open switches it
    const bool walWritten = (fs::exists(wal, ec) && fs::file_size(wal, ec) > 0) ||
                            (journalThere && fs::file_size(work, ec) > fs::file_size(pristine, ec));
    // The store opens as the program opens it, is intact, and holds one whole state.
    std::unique_ptr<cb::Store> store;
    ASSERT_NO_THROW(store = cb::Store::open(work));
    auto &db = store->sqliteForTesting();
    ASSERT_EQ(db.queryText("PRAGMA integrity_check"), "ok");
    const std::string hash = stateHash(db);
    const bool isOld = hash == oldHash, isNew = hash == newHash;
    ASSERT_TRUE(isOld || isNew) << "a mix of the old and the new state";
    if (exited) {
      ++finished;
      EXPECT_TRUE(walAtEnd);
      EXPECT_TRUE(WIFEXITED(status) && WEXITSTATUS(status) == 0);
      EXPECT_TRUE(isNew);
    } else if (isOld && !opened) {
      ++killedBeforeOpen;
    } else if (isOld) {
      ++killedOld;
      if (walWritten)
        ++killedWhileWriting;
    } else {
      ++killedNew;
    }
  }
  std::printf("%ld kills survived: %d before the program had opened the store (old state), %d "
              "mid-import with the old state kept (%d of them while the commit was being "
              "written), %d after the commit but before the program ended (new state); %d more "
              "imports finished before their kill moment (new state); every store intact\n",
              killed, killedBeforeOpen, killedOld, killedWhileWriting, killedNew, finished);
  EXPECT_EQ(killed, kills);
  // Most kills must land mid-import, or the test proves little.
  EXPECT_GE(killedOld, static_cast<int>(kills / 2));
}

#ifdef NDEBUG
constexpr long kDefaultRows = 50'000;
#else
constexpr long kDefaultRows = 25'000;
#endif

} // namespace

TEST(CrashSafety, KilledImportsLeaveTheOldOrTheNewStateNeverAMix) {
  // The commit writes the store's log from about 80 % of the import's time.
  killImports(envOr("CURVEBENCH_CRASH_KILLS", 60), envOr("CURVEBENCH_CRASH_ROWS", kDefaultRows),
              false, 80, 105);
}

TEST(CrashSafety, KilledFirstImportsLeaveAnEmptyStoreOrTheWholeImport) {
  // Faster to write, so the commit comes earlier and the program's end (the snapshot's thread,
  // the switch back to the log) takes a larger share: at 50,000 rows (strace) the rows are
  // written by about 55-70 % of the time and the commit done by about 65-90 %.
  killImports(envOr("CURVEBENCH_CRASH_KILLS", 60) / 2, envOr("CURVEBENCH_CRASH_ROWS", kDefaultRows),
              true, 50, 80);
}
