#include "core/reservationsnapshot.h"

#include "core/cachefile.h"

#include "core/simulator.h"
#include "core/sqlite.h"
#include "core/store.h"
#include "testsupport.h"

#include <fmt/format.h>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstring>
#include <fstream>
#include <map>
#include <random>
#include <sstream>

// The snapshot is a cache of the store's own rows, so every check here compares it with the
// store's table (or with the rows written), not with an outside value.

namespace {

using cb::Date;
using cb::Reservation;
using cb::ReservationStatus;
using cb::Store;
namespace fs = std::filesystem;

Date d(int y, unsigned m, unsigned day) { return Date::fromYmd(y, m, day); }

Reservation booking(std::string id, int rooms = 1) {
  Reservation r;
  r.id = std::move(id);
  r.bookedOn = d(2025, 5, 1);
  r.arrival = d(2025, 6, 10);
  r.departure = d(2025, 6, 12);
  r.rooms = rooms;
  r.roomType = "DBL";
  r.segment = "CORP";
  r.channel = "DIRECT";
  r.rate = 142.25;
  return r;
}

/// Every kind of field: a cancellation, empty codes, a block, another currency, a day use, a
/// long id with non-ASCII bytes.
std::vector<Reservation> varied() {
  std::vector<Reservation> rs;
  rs.push_back(booking("A1", 3));
  Reservation c = booking("A2");
  c.status = ReservationStatus::Cancelled;
  c.cancelledOn = d(2025, 5, 20);
  c.blockId = "WEDDING-1";
  rs.push_back(c);
  Reservation bare = booking("A3");
  bare.roomType.clear();
  bare.channel.clear();
  bare.segment.clear();
  bare.currency = "EUR";
  bare.rate = 0.1 + 0.2; // kept to the last bit
  rs.push_back(bare);
  Reservation dayUse = booking("A4");
  dayUse.departure = dayUse.arrival;
  dayUse.status = ReservationStatus::CheckedOut;
  rs.push_back(dayUse);
  Reservation noShow = booking("Zürich-" + std::string(40, 'x'));
  noShow.status = ReservationStatus::NoShow;
  rs.push_back(noShow);
  return rs;
}

std::string readAll(const fs::path &p) {
  std::ifstream in(p, std::ios::binary);
  std::ostringstream os;
  os << in.rdbuf();
  return os.str();
}

TEST(ReservationSnapshot, EncodeDecodeKeepsEveryFieldAndTheOrder) {
  const auto rows = varied();
  const std::string bytes = cb::encodeReservationSnapshot(42, rows);
  const auto back = cb::decodeReservationSnapshot(bytes, 42);
  ASSERT_TRUE(back.has_value());
  EXPECT_EQ(*back, rows);
  // An empty store has a snapshot too.
  const auto none = cb::decodeReservationSnapshot(cb::encodeReservationSnapshot(7, {}), 7);
  ASSERT_TRUE(none.has_value());
  EXPECT_TRUE(none->empty());
}

// Digests handed over by the caller (an import has them) give the same bytes as those worked
// out here; a list that is not one per row is not used.
TEST(ReservationSnapshot, DigestsHandedOverGiveTheSameBytes) {
  const auto rows = varied();
  std::vector<cb::ReservationDigest> digests;
  for (const auto &r : rows)
    digests.push_back(cb::digestOf(r));
  const std::string own = cb::encodeReservationSnapshot(42, rows);
  EXPECT_EQ(cb::encodeReservationSnapshot(42, rows, &digests), own);
  std::vector<cb::ReservationDigest> short_(digests.begin(), digests.end() - 1);
  EXPECT_EQ(cb::encodeReservationSnapshot(42, rows, &short_), own);
  // Used as given: another digest for the first row shows in the bytes.
  digests.front().a ^= 1;
  EXPECT_NE(cb::encodeReservationSnapshot(42, rows, &digests), own);
}

TEST(ReservationSnapshot, SampleProperty) {
  const auto rows = cb::simulateProperty(cb::SimulatorConfig{}).reservations;
  ASSERT_GT(rows.size(), 50000U);
  const auto back =
      cb::decodeReservationSnapshot(cb::encodeReservationSnapshot(0x1234abcd, rows), 0x1234abcd);
  ASSERT_TRUE(back.has_value());
  EXPECT_TRUE(*back == rows);
}

TEST(ReservationSnapshot, RefusesAnotherStampAndDamagedBytes) {
  const std::string bytes = cb::encodeReservationSnapshot(42, varied());
  EXPECT_FALSE(cb::decodeReservationSnapshot(bytes, 43).has_value());
  // Cut anywhere: never accepted, never read past the end (the sanitizer build checks the last).
  for (std::size_t cut = 0; cut < bytes.size(); ++cut)
    EXPECT_FALSE(cb::decodeReservationSnapshot(std::string_view(bytes).substr(0, cut), 42))
        << "cut at " << cut;
  // One byte changed anywhere: the header checks or the checksum refuse it.
  for (std::size_t at = 0; at < bytes.size(); ++at) {
    std::string bad = bytes;
    bad[at] = static_cast<char>(bad[at] ^ 0x5a);
    EXPECT_FALSE(cb::decodeReservationSnapshot(bad, 42)) << "byte " << at;
  }
  EXPECT_FALSE(cb::decodeReservationSnapshot(bytes + "x", 42));
}

TEST(ReservationSnapshot, UpdateMergesByIdAndTheLastRowOfAnIdWins) {
  cbtest::TempDir dir;
  const fs::path file = dir / "x.snapshot";
  ASSERT_TRUE(cb::writeReservationSnapshot(file, 1, varied()));
  EXPECT_FALSE(cb::updateReservationSnapshot(file, 9, 10, {booking("B1")})); // not stamp 9
  ASSERT_TRUE(cb::updateReservationSnapshot(
      file, 1, 2, {booking("B1", 1), booking("A2", 5), booking("B1", 4)}));
  const auto rows = cb::readReservationSnapshot(file, 2);
  ASSERT_TRUE(rows.has_value());
  std::vector<std::string> ids;
  for (const auto &r : *rows)
    ids.push_back(r.id);
  EXPECT_EQ(ids, (std::vector<std::string>{"A1", "A2", "A3", "A4", "B1", varied()[4].id}));
  EXPECT_EQ((*rows)[1], booking("A2", 5)); // replaced whole
  EXPECT_EQ((*rows)[4].rooms, 4);          // the later of the two B1 rows
  EXPECT_FALSE(cb::readReservationSnapshot(file, 1).has_value());
}

TEST(ReservationSnapshot, UpdateGivesWhatAMergeByIdGives) {
  // The update merges the old columns with the changed rows. Against a map by id (the last row of
  // an id wins), over random change sets, three updates in a row on each file (so an update reads
  // one an update wrote, with the texts it appended): ids of varied lengths before the first,
  // between and after the last stored id, replacements, repeats, none at all. The digests
  // written must be each row's own, and the facts handed over each row's.
  cbtest::TempDir dir;
  const fs::path file = dir / "u.snapshot";
  std::mt19937 rng(20261205);
  // Keys as ids of 2 to 5 characters ("R7", "R1234"), in byte order unlike their numbers.
  auto idOf = [](int k) { return fmt::format("R{}", k); };
  // Every field varied, so a column copied from the wrong row shows.
  auto vary = [&](Reservation r) {
    r.bookedOn = d(2025, 5, 1) + static_cast<int>(rng() % 30);
    r.arrival = r.bookedOn + static_cast<int>(rng() % 60);
    r.departure = r.arrival + static_cast<int>(rng() % 4);
    if (rng() % 3 == 0) {
      r.status = ReservationStatus::Cancelled;
      r.cancelledOn = r.bookedOn + 1;
    }
    r.rate = 50.0 + static_cast<double>(rng() % 20000) / 100.0;
    r.roomType = rng() % 2 ? "DBL" : "TWN";
    r.channel = rng() % 2 ? "DIRECT" : "";
    r.currency = rng() % 4 ? "" : "EUR";
    r.blockId = rng() % 5 ? "" : "GRP-" + std::to_string(rng() % 3);
    return r;
  };
  for (int round = 0; round < 100; ++round) {
    std::map<std::string, Reservation> want;
    const int stored = static_cast<int>(rng() % 40);
    for (int k = 0; k < stored; ++k) {
      const int key = 2 * k + 1; // odd keys: the even ones between them are new
      Reservation r = vary(booking(idOf(key), 1 + static_cast<int>(rng() % 5)));
      want[r.id] = r;
    }
    std::vector<Reservation> base;
    for (auto &[id, r] : want)
      base.push_back(r);
    std::uint64_t stamp = 1;
    ASSERT_TRUE(cb::writeReservationSnapshot(file, stamp, base));
    for (int update = 0; update < 3; ++update, ++stamp) {
      std::vector<Reservation> changed;
      const int changes = static_cast<int>(rng() % 12);
      for (int j = 0; j < changes; ++j) {
        // Keys 0 … 2·stored + 2: even ones are new, odd ones stored; now and then a long one.
        const int key = rng() % 8 ? static_cast<int>(rng() % (2 * stored + 3))
                                  : 100000 + static_cast<int>(rng() % 1000);
        Reservation r = vary(booking(idOf(key)));
        r.rooms = 10 + j; // tells repeats of an id apart: the later one wins
        r.segment = fmt::format("S{}", update * 10 + static_cast<int>(rng() % 3)); // new codes
        changed.push_back(r);
        want[r.id] = r;
      }
      const std::string where = fmt::format("round {} update {}", round, update);
      std::vector<cb::ReservationFacts> facts;
      ASSERT_TRUE(cb::updateReservationSnapshot(
          file, stamp, stamp + 1, changed,
          [&](std::span<const cb::ReservationFacts> f) { facts.assign(f.begin(), f.end()); }))
          << where;
      const auto rows = cb::readReservationSnapshot(file, stamp + 1);
      ASSERT_TRUE(rows.has_value()) << where;
      std::vector<Reservation> expected;
      for (auto &[id, r] : want)
        expected.push_back(r);
      ASSERT_EQ(*rows, expected) << where;
      ASSERT_EQ(facts.size(), expected.size());
      for (std::size_t i = 0; i < facts.size(); ++i) {
        const cb::ReservationFacts f = cb::ReservationFacts::of(expected[i]);
        EXPECT_TRUE(facts[i].bookedOn == f.bookedOn && facts[i].cancelledOn == f.cancelledOn &&
                    facts[i].arrival == f.arrival && facts[i].departure == f.departure &&
                    facts[i].rooms == f.rooms && facts[i].rate == f.rate &&
                    facts[i].status == f.status)
            << where << " row " << i;
      }
      std::size_t at = 0;
      ASSERT_TRUE(cb::visitSnapshotDigests(
          file, stamp + 1, [&](std::string &&id, const cb::ReservationDigest &dg) {
            ASSERT_LT(at, expected.size());
            EXPECT_EQ(id, expected[at].id);
            EXPECT_TRUE(dg == cb::digestOf(expected[at])) << where << " row " << at;
            ++at;
          }));
      EXPECT_EQ(at, expected.size());
    }
  }
}

TEST(ReservationSnapshot, UpdateRefusesAFileOutOfOrderOrWithARowOutOfRange) {
  cbtest::TempDir dir;
  const fs::path file = dir / "o.snapshot";
  // Out of id order (no snapshot Curvebench writes is): a merge by id would misplace rows.
  ASSERT_TRUE(cb::writeReservationSnapshot(file, 1, {booking("B1"), booking("A1")}));
  EXPECT_FALSE(cb::updateReservationSnapshot(file, 1, 2, {booking("A5")}));
  EXPECT_TRUE(cb::readReservationSnapshot(file, 1).has_value()); // left as it was
  // A status no row can have, behind a checksum that matches (a bug, not damage): the copied
  // row is checked as a decoded one would be.
  std::string bytes = cb::encodeReservationSnapshot(3, {booking("A1"), booking("A2")});
  const std::size_t payload = cb::kCacheHeaderBytes;
  const std::size_t status = payload + 4 * 2 + 4; // after two id lengths and "A1A2"
  ASSERT_EQ(bytes[status], 0);
  bytes[status] = 9;
  const std::uint64_t sum = cb::cacheChecksum(std::string_view(bytes).substr(payload));
  std::memcpy(bytes.data() + 40, &sum, 8);
  cbtest::writeFile(file, bytes);
  EXPECT_FALSE(cb::readReservationSnapshot(file, 3).has_value());
  EXPECT_FALSE(cb::updateReservationSnapshot(file, 3, 4, {booking("A5")}));
  EXPECT_FALSE(cb::readReservationSnapshot(file, 4).has_value());
}

TEST(ReservationSnapshot, DigestsLookedUpInPlaceFindEveryStoredIdAndNoOther) {
  cbtest::TempDir dir;
  const fs::path file = dir / "d.snapshot";
  std::vector<Reservation> rows = varied();
  std::sort(rows.begin(), rows.end(),
            [](const Reservation &a, const Reservation &b) { return a.id < b.id; });
  ASSERT_TRUE(cb::writeReservationSnapshot(file, 5, rows));
  const auto digests = cb::SnapshotDigests::open(file, 5);
  ASSERT_TRUE(digests);
  EXPECT_EQ(digests->size(), rows.size());
  for (const Reservation &r : rows) {
    const auto found = digests->find(r.id);
    ASSERT_TRUE(found) << r.id;
    EXPECT_TRUE(*found == cb::digestOf(r)) << r.id;
  }
  // Before the first id, between two, after the last, a prefix, a longer id, the empty id.
  for (const std::string &id :
       std::vector<std::string>{"A0", "A15", "A1\x01", "ZZZ", "A", rows.back().id + "x", ""})
    EXPECT_FALSE(digests->find(id)) << id;
  EXPECT_FALSE(cb::SnapshotDigests::open(file, 6)); // another stamp
  EXPECT_FALSE(cb::SnapshotDigests::open(dir / "none.snapshot", 5));
  // Not in id order (no snapshot Curvebench writes): refused, as a binary search would miss.
  std::reverse(rows.begin(), rows.end());
  ASSERT_TRUE(cb::writeReservationSnapshot(file, 5, rows));
  EXPECT_FALSE(cb::SnapshotDigests::open(file, 5));
  // An empty snapshot finds nothing.
  ASSERT_TRUE(cb::writeReservationSnapshot(file, 7, {}));
  const auto none = cb::SnapshotDigests::open(file, 7);
  ASSERT_TRUE(none);
  EXPECT_EQ(none->size(), 0u);
  EXPECT_FALSE(none->find("A1"));
}

TEST(ReservationSnapshot, NegativeZeroRateIsStoredAsZeroAsSqliteDoes) {
  Reservation r = booking("Z1");
  r.rate = -0.0;
  const auto back = cb::decodeReservationSnapshot(cb::encodeReservationSnapshot(3, {r}), 3);
  ASSERT_TRUE(back.has_value());
  EXPECT_EQ((*back)[0].rate, 0.0);
  EXPECT_FALSE(std::signbit((*back)[0].rate));
}

TEST(ReservationSnapshot, WriteRemovesTemporariesAKilledWriterLeftOnlyWhenOld) {
  cbtest::TempDir dir;
  const fs::path file = dir / "s.snapshot";
  const fs::path stale = dir / "s.snapshot.0badf00d.tmp";
  const fs::path young = dir / "s.snapshot.1234abcd.tmp";
  const fs::path other = dir / "t.snapshot.0badf00d.tmp";
  for (const auto &p : {stale, young, other})
    std::ofstream(p) << "partial";
  const auto twoHoursAgo = fs::file_time_type::clock::now() - std::chrono::hours(2);
  fs::last_write_time(stale, twoHoursAgo);
  fs::last_write_time(other, twoHoursAgo);
  ASSERT_TRUE(cb::writeReservationSnapshot(file, 7, {booking("A1")}));
  EXPECT_FALSE(fs::exists(stale));
  EXPECT_TRUE(fs::exists(young)); // may be another program's write in progress
  EXPECT_TRUE(fs::exists(other)); // another store's
  ASSERT_TRUE(cb::readReservationSnapshot(file, 7).has_value());
}

class SnapshotStoreTest : public ::testing::Test {
protected:
  cbtest::TempDir dir;
  fs::path path = dir / "snapshot.cbstore";
  fs::path snapshot = cb::snapshotPathFor(path);

  std::unique_ptr<Store> makeStore(const std::vector<Reservation> &rows) {
    cb::Property p;
    p.name = "Snapshot Lodge";
    p.currency = "CHF";
    p.capacity = 40;
    auto store = Store::create(path, p);
    Store::Transaction t(*store);
    for (const auto &r : rows)
      store->upsertReservation(r, 0);
    t.commit();
    return store;
  }
};

TEST_F(SnapshotStoreTest, FirstReadWritesTheSnapshotAndLaterReadsUseIt) {
  auto store = makeStore(varied());
  EXPECT_EQ(cb::snapshotPathFor(path).filename(), "snapshot.cbstore.snapshot");
  ASSERT_FALSE(fs::exists(snapshot));
  const auto first = store->reservations();
  ASSERT_EQ(first.size(), 5U);
  ASSERT_TRUE(fs::exists(snapshot));
  EXPECT_EQ(cb::readReservationSnapshot(snapshot, store->reservationStamp()), first);

  // A change made behind the store's back (no stamp change) is not seen: proof that the second
  // read came from the snapshot. Only a program other than Curvebench can do this.
  store->sqliteForTesting().exec("UPDATE reservations SET rooms = 9 WHERE id = 'A1'");
  EXPECT_EQ(store->reservations(), first);

  // A change through the store replaces the stamp, so the table is read (and A1's 9 rooms with
  // it) and the snapshot is written again.
  const std::uint64_t before = store->reservationStamp();
  {
    Store::Transaction t(*store);
    EXPECT_EQ(store->upsertReservation(booking("B1"), 0), cb::UpsertResult::Added);
    t.commit();
  }
  EXPECT_NE(store->reservationStamp(), before);
  const auto after = store->reservations();
  ASSERT_EQ(after.size(), 6U);
  EXPECT_EQ(after[0].rooms, 9);
  EXPECT_EQ(after[4].id, "B1"); // in id order, before "Zürich-…"
  EXPECT_EQ(cb::readReservationSnapshot(snapshot, store->reservationStamp()), after);
}

TEST_F(SnapshotStoreTest, StampChangesOnlyWhenRowsDoAndSurvivesReopening) {
  auto store = makeStore(varied());
  const std::uint64_t stamp = store->reservationStamp();
  {
    // Unchanged rows: no new stamp.
    Store::Transaction t(*store);
    for (const auto &r : varied())
      EXPECT_EQ(store->upsertReservation(r, 0), cb::UpsertResult::Unchanged);
    t.commit();
  }
  EXPECT_EQ(store->reservationStamp(), stamp);
  {
    // A rolled-back change: the stamp goes back with the rows.
    Store::Transaction t(*store);
    EXPECT_EQ(store->upsertReservation(booking("A1", 7), 0), cb::UpsertResult::Updated);
  }
  EXPECT_EQ(store->reservationStamp(), stamp);
  {
    Store::Transaction t(*store);
    EXPECT_EQ(store->upsertReservation(booking("A1", 7), 0), cb::UpsertResult::Updated);
    t.commit();
  }
  const std::uint64_t changed = store->reservationStamp();
  EXPECT_NE(changed, stamp);
  store.reset();
  EXPECT_EQ(Store::open(path)->reservationStamp(), changed);
}

TEST_F(SnapshotStoreTest, DamagedOrForeignSnapshotIsRebuiltFromTheTable) {
  auto store = makeStore(varied());
  const auto rows = store->reservations();
  // Garbage, and a whole snapshot written for another stamp (a store copied over this one).
  for (const std::string &bytes :
       {std::string("not a snapshot"),
        cb::encodeReservationSnapshot(store->reservationStamp() + 1, {booking("GHOST")})}) {
    {
      std::ofstream out(snapshot, std::ios::binary | std::ios::trunc);
      out << bytes;
    }
    EXPECT_EQ(store->reservations(), rows);
    EXPECT_EQ(readAll(snapshot), cb::encodeReservationSnapshot(store->reservationStamp(), rows));
  }
}

TEST_F(SnapshotStoreTest, ReadOnlyStoreReadsButNeverWritesTheSnapshot) {
  const auto rows = varied();
  makeStore(rows).reset();
  {
    auto reader = Store::open(path, Store::Access::ReadOnly);
    EXPECT_EQ(reader->reservations().size(), rows.size());
  }
  EXPECT_FALSE(fs::exists(snapshot));
  const auto written = Store::open(path)->reservations();
  ASSERT_TRUE(fs::exists(snapshot));
  auto reader = Store::open(path, Store::Access::ReadOnly);
  EXPECT_EQ(reader->reservations(), written);
}

TEST_F(SnapshotStoreTest, InsideAWriteTransactionTheTableIsRead) {
  auto store = makeStore(varied());
  store->reservations(); // snapshot written
  Store::Transaction t(*store);
  store->upsertReservation(booking("C1"), 0);
  EXPECT_EQ(store->reservations().size(), 6U); // the open transaction's own rows
}

TEST_F(SnapshotStoreTest, OlderStoreGetsAStampWhenMigrated) {
  cb::Property p;
  p.name = "Old Lodge";
  p.currency = "CHF";
  p.capacity = 10;
  Store::createAtVersionForTesting(path, p, 7);
  auto store = Store::open(path);
  EXPECT_EQ(store->schemaVersion(), Store::kSchemaVersion);
  const std::uint64_t stamp = store->reservationStamp();
  {
    Store::Transaction t(*store);
    store->upsertReservation(booking("M1"), 0);
    t.commit();
  }
  EXPECT_NE(store->reservationStamp(), stamp);
  EXPECT_EQ(store->reservations().size(), 1U);
}

// The summary from the table, from the snapshot and from rows in memory are the same counts.
TEST_F(SnapshotStoreTest, SummaryIsTheSameFromTableSnapshotAndRows) {
  auto rows = cb::simulateProperty(cb::SimulatorConfig{}).reservations;
  rows.push_back(varied()[1]); // a block id, a cancellation
  rows.push_back(varied()[2]); // empty codes
  rows.push_back(varied()[3]); // a day use
  auto store = makeStore(rows);
  store->addEvent({d(2025, 6, 1), d(2025, 6, 3), "Lake festival"});
  const cb::StoreSummary fromTable = store->summary(); // no snapshot yet
  ASSERT_FALSE(fs::exists(snapshot));
  EXPECT_EQ(fromTable.reservations, static_cast<std::int64_t>(rows.size()));
  EXPECT_EQ(fromTable.dayUse, 1 + std::count_if(rows.begin(), rows.end() - 3,
                                                [](const Reservation &r) { return r.isDayUse(); }));
  EXPECT_EQ(fromTable.bySegment.at(""), 1);
  EXPECT_EQ(fromTable.events, 1);
  const auto loaded = store->reservations(); // writes the snapshot
  ASSERT_TRUE(fs::exists(snapshot));
  EXPECT_EQ(store->summary(), fromTable);
  EXPECT_EQ(store->summary(loaded), fromTable);
}

} // namespace
