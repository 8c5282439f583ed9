#include "core/store.h"

#include "core/propertysettings.h"
#include "core/sqlite.h"
#include "testsupport.h"

#include <functional>
#include <stdexcept>
#include <string>

namespace {

using cb::Date;
using cb::Reservation;
using cb::ReservationStatus;
using cb::Store;
using cb::UpsertResult;
namespace fs = std::filesystem;

Date d(int y, unsigned m, unsigned day) { return Date::fromYmd(y, m, day); }

cb::Property sampleProperty() {
  cb::Property p;
  p.name = "Gullwing Rest";
  p.currency = "CHF";
  p.capacity = 120;
  p.capacityChanges = {{d(2025, 1, 10), 100, "east wing renovation"}, {d(2025, 3, 1), 120, ""}};
  p.stly = cb::StlyAlignment::CalendarDate;
  p.selloutMargin = 0.05;
  return p;
}

bool sameProperty(const cb::Property &a, const cb::Property &b) {
  return a.name == b.name && a.currency == b.currency && a.capacity == b.capacity &&
         a.capacityChanges == b.capacityChanges && a.stly == b.stly &&
         a.selloutMargin == b.selloutMargin && a.settings == b.settings;
}

Reservation makeReservation(std::string id) {
  Reservation r;
  r.id = std::move(id);
  r.status = ReservationStatus::Booked;
  r.bookedOn = d(2025, 5, 1);
  r.arrival = d(2025, 6, 10);
  r.departure = d(2025, 6, 13);
  r.rooms = 2;
  r.roomType = "DBL";
  r.segment = "CORP";
  r.channel = "DIRECT";
  r.rate = 142.5;
  r.currency = "CHF";
  return r;
}

std::string errorOf(const std::function<void()> &f) {
  try {
    f();
  } catch (const cb::StoreError &e) {
    return e.what();
  }
  return "(no StoreError)";
}

class StoreTest : public ::testing::Test {
protected:
  cbtest::TempDir dir;
  fs::path path = dir / "larkspur.cbstore";
};

// ---- create / open -----------------------------------------------------------------------------

TEST_F(StoreTest, CreateOpenRoundTripsEveryRecordType) {
  std::vector<Reservation> rs;
  rs.push_back(makeReservation("A1"));
  Reservation cancelled = makeReservation("A2");
  cancelled.status = ReservationStatus::Cancelled;
  cancelled.cancelledOn = d(2025, 5, 20);
  cancelled.blockId = "WEDDING-1";
  rs.push_back(cancelled);
  Reservation bare = makeReservation("A3"); // no room type, channel or currency
  bare.status = ReservationStatus::NoShow;
  bare.roomType.clear();
  bare.channel.clear();
  bare.currency.clear();
  bare.rate = 0.0;
  rs.push_back(bare);
  Reservation dayUse = makeReservation("A4");
  dayUse.status = ReservationStatus::CheckedOut;
  dayUse.departure = dayUse.arrival;
  rs.push_back(dayUse);

  cb::GroupBlock block{
      "WEDDING-1",    "Keller wedding",          "GRP", d(2025, 6, 20), d(2025, 6, 22), 15,
      d(2025, 5, 20), cb::BlockStatus::Tentative};
  cb::GroupBlock block2{
      "CONF-7",      "Pharma congress",        "GRP", d(2025, 9, 1), d(2025, 9, 4), 40,
      d(2025, 8, 1), cb::BlockStatus::Definite};
  cb::Denial denial{d(2025, 5, 3), d(2025, 6, 10),        d(2025, 6, 12), 3,
                    "LEIS",        cb::DenialKind::Denial};
  cb::Denial regret{d(2025, 5, 4), d(2025, 6, 11), d(2025, 6, 11), 1, "", cb::DenialKind::Regret};
  cb::EventNote later{d(2025, 7, 1), d(2025, 7, 3), "Lake festival"};
  cb::EventNote earlier{d(2025, 6, 1), d(2025, 6, 1), "Marathon"};
  cb::ImportLogEntry log;
  log.file = "/data/extract.csv";
  log.sha256 = std::string(64, 'a');
  log.kind = "reservations";
  log.profile = "native";
  log.mode = "strict";
  log.startedAt = "2025-06-01T08:00:00Z";
  {
    auto store = Store::create(path, sampleProperty());
    store->upsertRoomType({"DBL", "Double", 80});
    store->upsertSegment({"CORP", "Corporate", 1, "#0072b2"});
    store->upsertChannel({"DIRECT", "Direct"});
    Store::Transaction tx(*store);
    log.id = store->beginImport(log);
    for (const auto &r : rs)
      EXPECT_EQ(store->upsertReservation(r, log.id), UpsertResult::Added) << r.id;
    log.rowsRead = 4;
    log.added = 4;
    log.finishedAt = "2025-06-01T08:00:02Z";
    store->finishImport(log);
    store->addGroupBlock(block);
    store->addGroupBlock(block2);
    store->addDenial(denial);
    store->addDenial(regret);
    store->addEvent(later);
    store->addEvent(earlier);
    tx.commit();
  }
  auto store = Store::open(path);
  EXPECT_EQ(store->schemaVersion(), Store::kSchemaVersion);
  EXPECT_TRUE(sameProperty(store->property(), sampleProperty()));
  EXPECT_EQ(store->reservations(), rs); // ordered by id
  EXPECT_EQ(store->reservation("A2"), cancelled);
  EXPECT_EQ(store->reservation("missing"), std::nullopt);
  EXPECT_EQ(store->reservationCount(), 4);
  EXPECT_EQ(store->roomTypes(), (std::vector<cb::RoomType>{{"DBL", "Double", 80}}));
  // GRP and LEIS came in code-only, from the block and the denial.
  EXPECT_EQ(store->segments(),
            (std::vector<cb::Segment>{
                {"CORP", "Corporate", 1, "#0072b2"}, {"GRP", "", 0, ""}, {"LEIS", "", 0, ""}}));
  EXPECT_EQ(store->channels(), (std::vector<cb::Channel>{{"DIRECT", "Direct"}}));
  EXPECT_EQ(store->groupBlocks(), (std::vector<cb::GroupBlock>{block2, block}));
  EXPECT_EQ(store->denials(), (std::vector<cb::Denial>{denial, regret}));
  EXPECT_EQ(store->events(), (std::vector<cb::EventNote>{earlier, later}));
  auto logs = store->importLog();
  ASSERT_EQ(logs.size(), 1U);
  EXPECT_EQ(logs[0].id, log.id);
  EXPECT_EQ(logs[0].file, log.file);
  EXPECT_EQ(logs[0].sha256, log.sha256);
  EXPECT_EQ(logs[0].kind, "reservations");
  EXPECT_EQ(logs[0].profile, "native");
  EXPECT_EQ(logs[0].mode, "strict");
  EXPECT_EQ(logs[0].rowsRead, 4);
  EXPECT_EQ(logs[0].added, 4);
  EXPECT_EQ(logs[0].updated, 0);
  EXPECT_EQ(logs[0].startedAt, "2025-06-01T08:00:00Z");
  EXPECT_EQ(logs[0].finishedAt, "2025-06-01T08:00:02Z");
}

// A new store is made with 16 KB pages (a shallower b-tree for a million reservations); the
// page size of an existing file never changes.
TEST_F(StoreTest, NewStoresUse16KbPages) {
  cb::Property p;
  p.name = "Larkspur";
  p.capacity = 12;
  cb::Store::create(path, p).reset();
  cb::SqliteDb db(path, cb::SqliteDb::Mode::ReadOnly);
  EXPECT_EQ(db.queryInt64("PRAGMA page_size"), 16384);
}

TEST_F(StoreTest, EmptyCodesAreStoredAsNull) {
  auto store = Store::create(path, sampleProperty());
  Reservation r = makeReservation("N1");
  r.roomType.clear();
  r.channel.clear();
  Store::Transaction tx(*store);
  store->upsertReservation(r, 0);
  tx.commit();
  auto &db = store->sqliteForTesting();
  EXPECT_EQ(db.queryInt64("SELECT count(*) FROM reservations WHERE room_type IS NULL AND "
                          "channel IS NULL AND block_id IS NULL AND import_id IS NULL"),
            1);
  EXPECT_EQ(db.queryText("SELECT arrival FROM reservations"), "2025-06-10"); // ISO text
  EXPECT_EQ(db.queryInt64("SELECT count(*) FROM channels"), 0);
}

TEST_F(StoreTest, SetPropertyReplacesCapacityChangesAndSettings) {
  auto store = Store::create(path, sampleProperty());
  cb::Property p = sampleProperty();
  p.name = "Gullwing Rest & Annex";
  p.capacity = 150;
  p.capacityChanges = {{d(2026, 2, 1), 140, "lift works"}};
  p.stly = cb::StlyAlignment::Weekday364;
  p.selloutMargin = 0.0;
  store->setProperty(p);
  store.reset();
  EXPECT_TRUE(sameProperty(Store::open(path)->property(), p));
}

TEST_F(StoreTest, DuplicateCapacityChangeDateIsRefusedAndNothingWritten) {
  auto store = Store::create(path, sampleProperty());
  cb::Property p = sampleProperty();
  p.name = "changed";
  p.capacityChanges.push_back({d(2025, 1, 10), 90, "again"});
  EXPECT_EQ(errorOf([&] { store->setProperty(p); }), "two capacity changes dated 2025-01-10");
  EXPECT_TRUE(sameProperty(store->property(), sampleProperty()));
}

TEST_F(StoreTest, ReferenceDataUpsertsReplaceNames) {
  auto store = Store::create(path, sampleProperty());
  {
    Store::Transaction tx(*store);
    store->upsertReservation(makeReservation("R1"), 0); // creates CORP, DBL, DIRECT code-only
    tx.commit();
  }
  EXPECT_EQ(store->segments(), (std::vector<cb::Segment>{{"CORP", "", 0, ""}}));
  store->upsertSegment({"CORP", "Corporate", 2, "#e69f00"});
  store->upsertRoomType({"DBL", "Double", 60});
  store->upsertChannel({"DIRECT", "Own website"});
  EXPECT_EQ(store->segments(), (std::vector<cb::Segment>{{"CORP", "Corporate", 2, "#e69f00"}}));
  EXPECT_EQ(store->roomTypes(), (std::vector<cb::RoomType>{{"DBL", "Double", 60}}));
  EXPECT_EQ(store->channels(), (std::vector<cb::Channel>{{"DIRECT", "Own website"}}));
}

TEST_F(StoreTest, CreateRefusesExistingPath) {
  cbtest::writeFile(path, "keep me");
  EXPECT_EQ(errorOf([&] { Store::create(path, sampleProperty()); }),
            path.string() + " already exists; a new store needs a new file");
  EXPECT_EQ(cbtest::readFile(path), "keep me");
}

TEST_F(StoreTest, OpenRefusesMissingFile) {
  EXPECT_EQ(errorOf([&] { Store::open(path); }), path.string() + " does not exist");
  EXPECT_FALSE(fs::exists(path));
}

TEST_F(StoreTest, OpenRefusesFilesThatAreNotStores) {
  const std::string expected = " is not a Curvebench store";
  fs::path text = dir / "notes.txt";
  cbtest::writeFile(text, "id,status\n1,booked\n");
  EXPECT_EQ(errorOf([&] { Store::open(text); }), text.string() + expected);
  EXPECT_EQ(cbtest::readFile(text), "id,status\n1,booked\n");

  fs::path empty = dir / "empty.cbstore";
  cbtest::writeFile(empty, "");
  EXPECT_EQ(errorOf([&] { Store::open(empty); }), empty.string() + expected);

  fs::path other = dir / "other.sqlite"; // SQLite, but someone else's
  {
    cb::SqliteDb db(other, cb::SqliteDb::Mode::Create);
    db.exec("CREATE TABLE t (x)");
  }
  EXPECT_EQ(errorOf([&] { Store::open(other); }), other.string() + expected);

  EXPECT_EQ(errorOf([&] { Store::open(dir.path()); }), dir.path().string() + expected);
}

TEST_F(StoreTest, NewerSchemaIsRefusedAndLeftUntouched) {
  Store::create(path, sampleProperty()).reset();
  {
    cb::SqliteDb db(path, cb::SqliteDb::Mode::OpenExisting);
    db.exec("PRAGMA user_version = " + std::to_string(Store::kSchemaVersion + 1));
  }
  std::string before = cbtest::readFile(path);
  EXPECT_EQ(errorOf([&] { Store::open(path); }),
            path.string() + " was written by a newer Curvebench (schema " +
                std::to_string(Store::kSchemaVersion + 1) + "; this build reads up to " +
                std::to_string(Store::kSchemaVersion) + "); update Curvebench to open it");
  EXPECT_EQ(cbtest::readFile(path), before);
  EXPECT_FALSE(
      fs::exists(path.string() + ".v" + std::to_string(Store::kSchemaVersion + 1) + ".bak"));
}

TEST_F(StoreTest, OlderSchemaIsBackedUpThenMigrated) {
  Store::createAtVersionForTesting(path, sampleProperty(), 1);
  {
    // Data written at schema 1 must survive the migration.
    cb::SqliteDb db(path, cb::SqliteDb::Mode::OpenExisting);
    EXPECT_EQ(db.queryInt64("PRAGMA user_version"), 1);
    EXPECT_EQ(db.queryInt64("SELECT count(*) FROM sqlite_master WHERE name = 'competitor_rates'"),
              0);
    db.exec("INSERT INTO segments (code) VALUES ('CORP');"
            "INSERT INTO reservations (id, status, booked_on, arrival, departure, rooms, segment, "
            "rate) VALUES ('OLD1', 'booked', '2024-01-02', '2024-02-01', '2024-02-03', 1, 'CORP', "
            "99.5);"
            // Two log rows from before the outcome column: one wrote rows, one wrote none.
            "INSERT INTO import_log (file, sha256, kind, profile, mode, rows_read, added, updated, "
            "unchanged, rejected, started_at, finished_at) VALUES "
            "('ok.csv', '', 'reservations', 'native', 'strict', 1, 1, 0, 0, 0, '', ''),"
            "('bad.csv', '', 'reservations', 'native', 'strict', 3, 0, 0, 0, 3, '', '')");
  }
  const std::string original = cbtest::readFile(path);
  ASSERT_FALSE(original.empty());
  const fs::path backup = path.string() + ".v1.bak";
  ASSERT_FALSE(fs::exists(backup));

  auto store = Store::open(path);
  EXPECT_EQ(store->schemaVersion(), Store::kSchemaVersion);
  // Migration 3 infers the outcome of older log rows from their counts.
  auto migratedLog = store->importLog();
  ASSERT_EQ(migratedLog.size(), 2U);
  EXPECT_EQ(migratedLog[0].outcome, "written");
  EXPECT_EQ(migratedLog[1].outcome, "failed");
  ASSERT_TRUE(fs::exists(backup));
  EXPECT_EQ(cbtest::readFile(backup), original); // byte for byte
  EXPECT_TRUE(sameProperty(store->property(), sampleProperty()));
  ASSERT_EQ(store->reservationCount(), 1);
  EXPECT_EQ(store->reservation("OLD1")->rate, 99.5);
  auto &db = store->sqliteForTesting();
  EXPECT_EQ(db.queryInt64("SELECT count(*) FROM sqlite_master WHERE name IN "
                          "('competitor_rates', 'sales_closures')"),
            2);
  EXPECT_EQ(db.queryInt64("PRAGMA foreign_keys"), 1);
  store.reset();

  // The backup is itself a schema-1 store that this build can open (and would migrate).
  cb::SqliteDb old(backup, cb::SqliteDb::Mode::OpenExisting);
  EXPECT_EQ(old.queryInt64("PRAGMA user_version"), 1);
  EXPECT_EQ(old.queryInt64("SELECT count(*) FROM reservations"), 1);
}

TEST_F(StoreTest, MigrationNeverOverwritesADifferentBackup) {
  Store::createAtVersionForTesting(path, sampleProperty(), 1);
  const fs::path backup = path.string() + ".v1.bak";
  cbtest::writeFile(backup, "an older backup the user kept");
  EXPECT_EQ(errorOf([&] { Store::open(path); }),
            "cannot back up " + path.string() + " before upgrading it: " + backup.string() +
                " already exists; move it away and open the store again");
  EXPECT_EQ(cbtest::readFile(backup), "an older backup the user kept");
  cb::SqliteDb db(path, cb::SqliteDb::Mode::OpenExisting);
  EXPECT_EQ(db.queryInt64("PRAGMA user_version"), 1); // not migrated
}

TEST_F(StoreTest, ConnectionHasWalForeignKeysAndNormalSync) {
  auto store = Store::create(path, sampleProperty());
  store.reset();
  store = Store::open(path);
  auto &db = store->sqliteForTesting();
  EXPECT_EQ(db.queryText("PRAGMA journal_mode"), "wal");
  EXPECT_EQ(db.queryInt64("PRAGMA foreign_keys"), 1);
  EXPECT_EQ(db.queryInt64("PRAGMA synchronous"), 1); // 1 = NORMAL (SQLite PRAGMA docs)
  // A raw insert naming an unknown segment is refused by the foreign key.
  EXPECT_NE(errorOf([&] {
              db.exec("INSERT INTO reservations (id, status, booked_on, arrival, departure, "
                      "rooms, segment, rate) VALUES ('X', 'booked', '2025-01-01', '2025-01-02', "
                      "'2025-01-03', 1, 'NOSUCH', 10)");
            }).find("FOREIGN KEY constraint failed"),
            std::string::npos);
  EXPECT_EQ(store->reservationCount(), 0);
  // And the status CHECK holds.
  EXPECT_NE(errorOf([&] {
              db.exec("INSERT INTO reservations (id, status, booked_on, arrival, departure, "
                      "rooms, rate) VALUES ('X', 'tentative', '2025-01-01', '2025-01-02', "
                      "'2025-01-03', 1, 10)");
            }).find("CHECK constraint failed"),
            std::string::npos);
}

// ---- upsert ------------------------------------------------------------------------------------

TEST_F(StoreTest, UpsertReportsAddedUpdatedUnchangedExactly) {
  auto store = Store::create(path, sampleProperty());
  auto &db = store->sqliteForTesting();
  std::int64_t first = store->logFailedImport({}); // any two log rows will do as import ids
  std::int64_t second = store->logFailedImport({});
  const Reservation base = makeReservation("R1");
  auto storedImportId = [&] {
    return db.queryInt64("SELECT coalesce(import_id, 0) FROM reservations WHERE id = 'R1'");
  };

  Store::Transaction tx(*store);
  EXPECT_EQ(store->upsertReservation(base, first), UpsertResult::Added);
  EXPECT_EQ(store->upsertReservation(base, second), UpsertResult::Unchanged);
  EXPECT_EQ(storedImportId(), first); // unchanged: nothing written

  // Every stored field, changed on its own, makes the row Updated and is then stored.
  std::vector<std::pair<std::string, std::function<void(Reservation &)>>> edits = {
      {"status", [](Reservation &r) { r.status = ReservationStatus::CheckedOut; }},
      {"cancelled",
       [](Reservation &r) {
         r.status = ReservationStatus::Cancelled;
         r.cancelledOn = d(2025, 5, 9);
       }},
      {"cancelled_on", [](Reservation &r) { r.cancelledOn = d(2025, 5, 10); }},
      {"booked_on", [](Reservation &r) { r.bookedOn = d(2025, 4, 30); }},
      {"arrival", [](Reservation &r) { r.arrival = d(2025, 6, 11); }},
      {"departure", [](Reservation &r) { r.departure = d(2025, 6, 14); }},
      {"rooms", [](Reservation &r) { r.rooms = 3; }},
      {"room_type", [](Reservation &r) { r.roomType = "SGL"; }},
      {"room_type empty", [](Reservation &r) { r.roomType.clear(); }},
      {"segment", [](Reservation &r) { r.segment = "LEIS"; }},
      {"channel", [](Reservation &r) { r.channel = "OTA"; }},
      {"channel empty", [](Reservation &r) { r.channel.clear(); }},
      {"rate", [](Reservation &r) { r.rate = 142.51; }},
      {"currency", [](Reservation &r) { r.currency = "EUR"; }},
      {"block_id", [](Reservation &r) { r.blockId = "B7"; }},
      {"block_id empty", [](Reservation &r) { r.blockId.clear(); }},
  };
  Reservation current = base;
  std::int64_t importId = first;
  for (const auto &[name, edit] : edits) {
    edit(current);
    importId = importId == first ? second : first;
    EXPECT_EQ(store->upsertReservation(current, importId), UpsertResult::Updated) << name;
    EXPECT_EQ(store->reservation("R1"), current) << name;
    EXPECT_EQ(storedImportId(), importId) << name; // the newer extract's import id
    EXPECT_EQ(store->upsertReservation(current, importId), UpsertResult::Unchanged) << name;
  }
  EXPECT_EQ(store->upsertReservation(makeReservation("R2"), 0), UpsertResult::Added);
  tx.commit();
  EXPECT_EQ(store->reservationCount(), 2);
}

TEST_F(StoreTest, UpsertOutsideTransactionIsAProgrammingError) {
  auto store = Store::create(path, sampleProperty());
  EXPECT_THROW(store->upsertReservation(makeReservation("R1"), 0), std::logic_error);
  EXPECT_EQ(store->reservationCount(), 0);
}

TEST_F(StoreTest, UpsertOfAnInvalidRowThrowsInsteadOfCountingUnchanged) {
  auto store = Store::create(path, sampleProperty());
  Reservation bad = makeReservation("R1");
  bad.rooms = 0; // the schema's CHECK, behind validateReservation
  Store::Transaction tx(*store);
  EXPECT_NE(errorOf([&] { store->upsertReservation(bad, 0); }).find("CHECK constraint failed"),
            std::string::npos);
}

// ---- transactions ------------------------------------------------------------------------------

TEST_F(StoreTest, RolledBackTransactionLeavesStoreUnchanged) {
  auto store = Store::create(path, sampleProperty());
  {
    Store::Transaction tx(*store);
    store->upsertReservation(makeReservation("R1"), 0);
    store->upsertReservation(makeReservation("R2"), 0);
    tx.commit();
  }
  const auto before = store->reservations();
  const auto segmentsBefore = store->segments();
  {
    Store::Transaction tx(*store);
    Reservation changed = makeReservation("R1");
    changed.rate = 1.0;
    EXPECT_EQ(store->upsertReservation(changed, 0), UpsertResult::Updated);
    Reservation added = makeReservation("R3");
    added.segment = "NEWSEG";
    EXPECT_EQ(store->upsertReservation(added, 0), UpsertResult::Added);
    store->beginImport({});
    store->addEvent({d(2025, 1, 1), d(2025, 1, 1), "gone"});
    EXPECT_EQ(store->reservationCount(), 3);
    // no commit: destroyed → rolled back
  }
  EXPECT_EQ(store->reservationCount(), 2);
  EXPECT_EQ(store->reservations(), before);
  EXPECT_EQ(store->segments(), segmentsBefore);
  EXPECT_TRUE(store->importLog().empty());
  EXPECT_TRUE(store->events().empty());
  store.reset();
  EXPECT_EQ(Store::open(path)->reservations(), before); // and on disk
}

TEST_F(StoreTest, CodesUndoneByARollbackAreCreatedAgain) {
  auto store = Store::create(path, sampleProperty());
  Reservation r = makeReservation("R1");
  r.segment = "NEWSEG";
  {
    Store::Transaction tx(*store);
    store->upsertReservation(r, 0);
  } // rolled back: NEWSEG is gone again
  EXPECT_TRUE(store->segments().empty());
  Store::Transaction tx(*store);
  EXPECT_EQ(store->upsertReservation(r, 0), UpsertResult::Added); // foreign key still holds
  tx.commit();
  EXPECT_EQ(store->segments(), (std::vector<cb::Segment>{{"NEWSEG", "", 0, ""}}));
}

TEST_F(StoreTest, ExceptionInsideTransactionRollsBack) {
  auto store = Store::create(path, sampleProperty());
  try {
    Store::Transaction tx(*store);
    store->upsertReservation(makeReservation("R1"), 0);
    throw std::runtime_error("import cancelled");
  } catch (const std::runtime_error &) {
  }
  EXPECT_EQ(store->reservationCount(), 0);
  EXPECT_FALSE(store->sqliteForTesting().inTransaction());
}

TEST_F(StoreTest, NestedTransactionIsAProgrammingError) {
  auto store = Store::create(path, sampleProperty());
  Store::Transaction outer(*store);
  EXPECT_THROW(Store::Transaction inner(*store), std::logic_error);
  store->upsertReservation(makeReservation("R1"), 0); // the outer one is still usable
  outer.commit();
  EXPECT_THROW(outer.commit(), std::logic_error);
  EXPECT_EQ(store->reservationCount(), 1);
}

TEST_F(StoreTest, FailedWriteInsideTransactionUndoesOnlyItself) {
  auto store = Store::create(path, sampleProperty());
  Store::Transaction tx(*store);
  store->upsertReservation(makeReservation("R1"), 0);
  cb::Property p = sampleProperty();
  p.name = "should not stick";
  p.capacityChanges.push_back({d(2025, 1, 10), 1, "duplicate date"});
  EXPECT_THROW(store->setProperty(p), cb::StoreError);
  tx.commit();
  EXPECT_EQ(store->reservationCount(), 1);
  EXPECT_TRUE(sameProperty(store->property(), sampleProperty()));
}

// ---- import log --------------------------------------------------------------------------------

TEST_F(StoreTest, ImportLogLifecycle) {
  auto store = Store::create(path, sampleProperty());
  cb::ImportLogEntry e;
  e.file = "a.csv";
  e.sha256 = "00";
  e.kind = "reservations";
  e.profile = "native";
  e.mode = "lenient";
  e.startedAt = "2025-01-01T00:00:00Z";
  {
    Store::Transaction tx(*store);
    e.id = store->beginImport(e);
    e.rowsRead = 10;
    e.added = 6;
    e.updated = 2;
    e.unchanged = 1;
    e.rejected = 1;
    e.finishedAt = "2025-01-01T00:00:05Z";
    store->finishImport(e);
    tx.commit();
  }
  cb::ImportLogEntry failed = e;
  failed.file = "b.csv";
  failed.mode = "strict";
  failed.added = failed.updated = failed.unchanged = 0;
  std::int64_t failedId = store->logFailedImport(failed);
  EXPECT_GT(failedId, e.id);
  {
    Store::Transaction tx(*store);
    EXPECT_THROW(store->logFailedImport(failed), std::logic_error);
  }
  auto log = store->importLog();
  ASSERT_EQ(log.size(), 2U);
  EXPECT_EQ(log[0].file, "a.csv");
  EXPECT_EQ(log[0].rowsRead, 10);
  EXPECT_EQ(log[0].added, 6);
  EXPECT_EQ(log[0].updated, 2);
  EXPECT_EQ(log[0].unchanged, 1);
  EXPECT_EQ(log[0].rejected, 1);
  EXPECT_EQ(log[0].mode, "lenient");
  EXPECT_EQ(log[0].outcome, "written");
  EXPECT_EQ(log[1].id, failedId);
  EXPECT_EQ(log[1].outcome, "failed");
  EXPECT_EQ(log[1].file, "b.csv");
  EXPECT_EQ(log[1].mode, "strict");
  EXPECT_EQ(log[1].added, 0);

  cb::ImportLogEntry ghost;
  ghost.id = 999;
  EXPECT_EQ(errorOf([&] { store->finishImport(ghost); }),
            path.string() + ": the import log has no entry 999");
}

// ---- summary -----------------------------------------------------------------------------------

TEST_F(StoreTest, SummaryCountsAHandMadeSet) {
  auto store = Store::create(path, sampleProperty());
  EXPECT_EQ(store->summary().reservations, 0);
  EXPECT_EQ(store->summary().lastActivity, std::nullopt);

  auto r = [](std::string id, ReservationStatus st, Date booked, Date arr, Date dep,
              std::string seg, std::string ch) {
    Reservation x = makeReservation(std::move(id));
    x.status = st;
    x.bookedOn = booked;
    x.arrival = arr;
    x.departure = dep;
    x.segment = std::move(seg);
    x.channel = std::move(ch);
    return x;
  };
  Reservation c1 = r("1", ReservationStatus::Cancelled, d(2025, 1, 5), d(2025, 3, 1), d(2025, 3, 3),
                     "CORP", "OTA");
  c1.cancelledOn = d(2025, 2, 20); // newest activity: later than any booked_on
  std::vector<Reservation> set = {
      c1,
      r("2", ReservationStatus::Booked, d(2025, 2, 1), d(2025, 3, 10), d(2025, 3, 12), "CORP",
        "DIRECT"),
      r("3", ReservationStatus::CheckedOut, d(2024, 12, 1), d(2025, 1, 2), d(2025, 1, 2), "LEIS",
        "DIRECT"), // day use
      r("4", ReservationStatus::NoShow, d(2025, 1, 10), d(2025, 2, 1), d(2025, 2, 2), "LEIS", ""),
      r("5", ReservationStatus::CheckedOut, d(2024, 11, 15), d(2025, 1, 20), d(2025, 1, 20), "",
        "OTA"), // day use, no segment
  };
  {
    Store::Transaction tx(*store);
    for (const auto &x : set)
      store->upsertReservation(x, 0);
    store->addGroupBlock({"B1", "", "GRP", d(2025, 3, 1), d(2025, 3, 2), 5, d(2025, 2, 1),
                          cb::BlockStatus::Definite});
    store->addDenial({d(2025, 1, 1), d(2025, 3, 1), d(2025, 3, 2), 1, "", cb::DenialKind::Denial});
    store->addDenial({d(2025, 1, 2), d(2025, 3, 1), d(2025, 3, 2), 1, "", cb::DenialKind::Regret});
    store->addEvent({d(2025, 3, 1), d(2025, 3, 1), "fair"});
    tx.commit();
  }
  auto s = store->summary();
  EXPECT_EQ(s.reservations, 5);
  EXPECT_EQ(s.byStatus, (std::map<std::string, std::int64_t>{
                            {"booked", 1}, {"cancelled", 1}, {"checked-out", 2}, {"no-show", 1}}));
  EXPECT_EQ(s.bySegment, (std::map<std::string, std::int64_t>{{"", 1}, {"CORP", 2}, {"LEIS", 2}}));
  EXPECT_EQ(s.byChannel, (std::map<std::string, std::int64_t>{{"", 1}, {"DIRECT", 2}, {"OTA", 2}}));
  EXPECT_EQ(s.dayUse, 2);
  EXPECT_EQ(s.firstArrival, d(2025, 1, 2));
  EXPECT_EQ(s.lastArrival, d(2025, 3, 10));
  EXPECT_EQ(s.firstBooked, d(2024, 11, 15));
  EXPECT_EQ(s.lastBooked, d(2025, 2, 1));
  EXPECT_EQ(s.lastActivity, d(2025, 2, 20));
  EXPECT_EQ(s.blocks, 1);
  EXPECT_EQ(s.denials, 2);
  EXPECT_EQ(s.events, 1);
}

} // namespace

namespace {

TEST_F(StoreTest, SettingsAreKeptWithTheProperty) {
  cb::Property p = sampleProperty();
  p.settings.seasons = {0.65, 0.88};
  p.settings.unconstrainHistory = false;
  p.settings.unconstrainMethod = "pd";
  p.settings.walkCost = 240.5;
  p.settings.lateCancelDays = 3;
  auto store = Store::create(path, p);
  store.reset();
  store = Store::open(path);
  EXPECT_EQ(store->property().settings, p.settings);
  // Invalid settings are refused before anything is written.
  cb::Property bad = p;
  bad.settings.seasons = {0.9, 0.7};
  EXPECT_EQ(errorOf([&] { store->setProperty(bad); }),
            "property settings: season_peak_from must be at least season_shoulder_from");
  EXPECT_EQ(store->property().settings, p.settings);
}

TEST_F(StoreTest, SettingsJsonIgnoresUnknownKeysAndKeepsDefaults) {
  const cb::PropertySettings s = cb::settingsFromJson(R"({"walk_cost": 180, "colour": "blue"})");
  EXPECT_EQ(s.walkCost, 180);
  EXPECT_EQ(s.seasons, cb::SeasonBands{}); // default 0.70 / 0.90
  EXPECT_TRUE(s.unconstrainHistory);
  EXPECT_EQ(cb::settingsFromJson(cb::settingsToJson(s)), s);
  EXPECT_THROW(cb::settingsFromJson("[1, 2]"), cb::SettingsError);
  EXPECT_THROW(cb::settingsFromJson(R"({"walk_cost": "lots"})"), cb::SettingsError);
  EXPECT_THROW(cb::settingsFromJson(R"({"unconstrain_method": "guess"})"), cb::SettingsError);
}

TEST_F(StoreTest, HistoryOptionsFollowTheSettings) {
  cb::Property p;
  EXPECT_EQ(cb::historyOptions(p)->method, cb::UnconstrainMethod::Em); // default on, EM
  EXPECT_FALSE(cb::historyOptions(p, true));                           // --naive-history
  p.settings.unconstrainMethod = "pd";
  p.settings.seasons = {0.5, 0.8};
  EXPECT_EQ(cb::historyOptions(p)->method, cb::UnconstrainMethod::ProjectionDetruncation);
  EXPECT_EQ(cb::historyOptions(p)->seasons, p.settings.seasons);
  p.settings.unconstrainMethod = "naive";
  EXPECT_FALSE(cb::historyOptions(p));
  p.settings.unconstrainMethod = "em";
  p.settings.unconstrainHistory = false;
  EXPECT_FALSE(cb::historyOptions(p));
}

TEST_F(StoreTest, ClosuresRoundTripOrderedByNight) {
  auto store = Store::create(path, sampleProperty());
  const cb::SalesClosure whole{d(2025, 7, 12), "", d(2025, 7, 1), std::nullopt};
  const cb::SalesClosure wholesale{d(2025, 7, 11), "WHL", d(2025, 6, 20), d(2025, 6, 25)};
  store->addClosure(whole);
  store->addClosure(wholesale);
  const auto all = store->closures();
  ASSERT_EQ(all.size(), 2U);
  EXPECT_EQ(all[0], wholesale);
  EXPECT_EQ(all[1], whole);
  EXPECT_EQ(store->segments().size(), 1U); // WHL created so the foreign key holds
  EXPECT_EQ(errorOf([&] {
              store->addClosure({d(2025, 7, 12), "", d(2025, 7, 5), d(2025, 7, 4)});
            }),
            "closure of 2025-07-12: reopened 2025-07-04 before closed 2025-07-05");
  EXPECT_EQ(store->closures().size(), 2U);
}

TEST_F(StoreTest, SchemaFourStoreGainsTheSpreadColumn) {
  Store::createAtVersionForTesting(path, sampleProperty(), 4);
  auto store = Store::open(path);
  EXPECT_EQ(store->schemaVersion(), Store::kSchemaVersion);
  EXPECT_EQ(store->property().settings, cb::PropertySettings{}); // the column's '{}' default
  auto &db = store->sqliteForTesting();
  EXPECT_EQ(db.queryInt64("SELECT count(*) FROM pragma_table_info('forecast_values') "
                          "WHERE name = 'sd'"),
            1);
  EXPECT_TRUE(fs::exists(path.string() + ".v4.bak"));
}

// ---- editing reference data (the Property screen) ----------------------------------------------

TEST_F(StoreTest, EventNotesCanBeEditedDeletedAndPutBackUnderTheirId) {
  auto store = Store::create(path, sampleProperty());
  const cb::EventNote fair{d(2025, 3, 12), d(2025, 3, 15), "Boat Fair"};
  const cb::EventNote gala{d(2025, 3, 12), d(2025, 3, 12), "Gala"};
  const cb::EventNote early{d(2025, 1, 5), d(2025, 1, 6), "Ice race"};
  const auto fairId = store->addEvent(fair);
  const auto galaId = store->addEvent(gala);
  const auto earlyId = store->addEvent(early);
  EXPECT_NE(fairId, galaId);
  // First day, then the order added: the two notes of 12 March keep their order.
  EXPECT_EQ(store->storedEvents(),
            (std::vector<cb::StoredEvent>{{earlyId, early}, {fairId, fair}, {galaId, gala}}));
  const cb::EventNote longer{d(2025, 3, 11), d(2025, 3, 16), "Boat Fair"};
  store->putEvent(fairId, longer);
  EXPECT_EQ(store->events(), (std::vector<cb::EventNote>{early, longer, gala}));
  store->deleteEvent(fairId);
  EXPECT_EQ(store->events(), (std::vector<cb::EventNote>{early, gala}));
  // Put back under its id after a later note of the same day: it sorts before it again.
  store->putEvent(fairId, fair);
  EXPECT_EQ(store->storedEvents(),
            (std::vector<cb::StoredEvent>{{earlyId, early}, {fairId, fair}, {galaId, gala}}));
  EXPECT_EQ(errorOf([&] { store->deleteEvent(999); }), "no event note with id 999");
  EXPECT_EQ(errorOf([&] {
              store->putEvent(galaId, {d(2025, 3, 12), d(2025, 3, 11), "Gala"});
            }),
            "event \"Gala\" ends (2025-03-11) before it starts (2025-03-12)");
  EXPECT_EQ(store->events(), (std::vector<cb::EventNote>{early, fair, gala}));
}

TEST_F(StoreTest, ReferenceCodesAreDeletedOnlyWhenNothingUsesThem) {
  auto store = Store::create(path, sampleProperty());
  store->upsertSegment({"SPARE", "Unused segment", 5, "#009E73"});
  store->upsertRoomType({"SUITE", "Suite", 4});
  store->upsertChannel({"FAX", "Fax"});
  {
    Store::Transaction tx(*store);
    store->upsertReservation(makeReservation("A1"), 0); // DBL, CORP, DIRECT
    store->upsertReservation(makeReservation("A2"), 0);
    tx.commit();
  }
  store->addGroupBlock({"B1", "", "CORP", d(2025, 3, 1), d(2025, 3, 2), 5, d(2025, 2, 1),
                        cb::BlockStatus::Definite});
  store->addDenial(
      {d(2025, 1, 1), d(2025, 3, 1), d(2025, 3, 2), 1, "CORP", cb::DenialKind::Denial});
  EXPECT_EQ(errorOf([&] { store->deleteSegment("CORP"); }),
            "segment CORP is still used (2 reservations, 1 group block, 1 denial); it cannot be "
            "deleted");
  EXPECT_EQ(errorOf([&] { store->deleteRoomType("DBL"); }),
            "room type DBL is still used (2 reservations); it cannot be deleted");
  EXPECT_EQ(errorOf([&] { store->deleteChannel("DIRECT"); }),
            "channel DIRECT is still used (2 reservations); it cannot be deleted");
  EXPECT_EQ(errorOf([&] { store->deleteChannel("TELEX"); }), "there is no channel TELEX");
  store->deleteSegment("SPARE");
  store->deleteRoomType("SUITE");
  store->deleteChannel("FAX");
  EXPECT_EQ(store->segments(), (std::vector<cb::Segment>{{"CORP", "", 0, ""}}));
  EXPECT_EQ(store->roomTypes(), (std::vector<cb::RoomType>{{"DBL", "", 0}}));
  EXPECT_EQ(store->channels(), (std::vector<cb::Channel>{{"DIRECT", ""}}));
}

TEST_F(StoreTest, ReservationsHaveNoIndexOnTheSegmentFromSchema9) {
  auto indexCount = [](cb::SqliteDb &db) {
    return db.queryInt64("SELECT count(*) FROM sqlite_master WHERE type = 'index' AND name = "
                         "'reservations_segment'");
  };
  {
    auto store = Store::create(path, sampleProperty());
    EXPECT_EQ(indexCount(store->sqliteForTesting()), 0);
  }
  fs::remove(path);
  Store::createAtVersionForTesting(path, sampleProperty(), 8);
  {
    cb::SqliteDb db(path, cb::SqliteDb::Mode::OpenExisting);
    EXPECT_EQ(indexCount(db), 1); // schema 8 had it
  }
  auto store = Store::open(path);
  EXPECT_EQ(store->schemaVersion(), 9);
  EXPECT_EQ(indexCount(store->sqliteForTesting()), 0);
  EXPECT_EQ(store->sqliteForTesting().queryText("PRAGMA integrity_check"), "ok");
}

} // namespace
