#include "core/reservationwriter.h"

#include "core/store.h"

#include "testsupport.h"

#include <gtest/gtest.h>

#include <fmt/format.h>

#include <string>
#include <vector>

namespace {

std::unique_ptr<cb::Store> newStore(const cbtest::TempDir &dir, const std::string &name) {
  cb::Property p;
  p.name = "Writer test house";
  p.capacity = 40;
  return cb::Store::create(dir / name, p);
}

// More rows than three batches of the writer (4096 each), so hand-overs, the bounded queue and
// the last partial batch are all used; every tenth row segment CORP, the rest LEIS.
std::vector<cb::Reservation> rows(int n, int rateOffset) {
  std::vector<cb::Reservation> out;
  for (int i = 0; i < n; ++i) {
    const std::string id = fmt::format("W{:06}", i);
    cb::Reservation r = cbtest::makeReservation(id.c_str(), "2026-01-05", "2026-03-01",
                                                "2026-03-03", 1 + i % 3, i % 10 ? "LEIS" : "CORP");
    r.rate = 100.0 + i % 50 + rateOffset;
    out.push_back(r);
  }
  return out;
}

struct Written {
  cb::ReservationWriter::Counts counts;
  std::vector<std::string> sinkIds;
  std::vector<cb::Reservation> stored;
};

// Writes `first` into a new store, then `second` (ids already stored flagged as such), each in
// its own transaction, threaded or not.
Written writeTwice(const cbtest::TempDir &dir, const std::string &name, bool threaded,
                   const std::vector<cb::Reservation> &first,
                   const std::vector<cb::Reservation> &second) {
  auto store = newStore(dir, name);
  {
    cb::Store::Transaction tx(*store);
    cb::ReservationWriter w(*store, 0, nullptr, threaded);
    for (auto r : first)
      w.add(std::move(r), false);
    w.finish();
    tx.commit();
  }
  Written out;
  cb::Store::Transaction tx(*store);
  cb::ReservationWriter w(
      *store, 0, [&](cb::Reservation &&r) { out.sinkIds.push_back(r.id); }, threaded);
  EXPECT_EQ(w.threaded(), threaded);
  for (auto r : second) {
    const bool stored = r.id < first.back().id || r.id == first.back().id;
    w.add(std::move(r), stored);
  }
  out.counts = w.finish();
  tx.commit();
  out.stored = store->reservations();
  return out;
}

} // namespace

TEST(ReservationWriter, OnItsOwnThreadWritesExactlyWhatOneThreadWrites) {
  cbtest::TempDir dir;
  const auto first = rows(9000, 0);
  // The second extract: the first 9,000 again with every third rate changed, and 4,000 new.
  auto second = rows(13000, 0);
  for (std::size_t i = 0; i < second.size(); i += 3)
    second[i].rate += 7.5;
  const Written threaded = writeTwice(dir, "a.cbstore", true, first, second);
  const Written single = writeTwice(dir, "b.cbstore", false, first, second);

  // Counted by hand from the two lists: 4,000 new ids; of the 9,000 stored, every third changed
  // (ids 0, 3, …, 8997: 3,000), the other 6,000 the same.
  EXPECT_EQ(threaded.counts.added, 4000);
  EXPECT_EQ(threaded.counts.updated, 3000);
  EXPECT_EQ(threaded.counts.unchanged, 6000);
  EXPECT_EQ(single.counts.added, threaded.counts.added);
  EXPECT_EQ(single.counts.updated, threaded.counts.updated);
  EXPECT_EQ(single.counts.unchanged, threaded.counts.unchanged);
  // The sink sees each written row once, in the order given.
  ASSERT_EQ(threaded.sinkIds.size(), 7000u);
  EXPECT_EQ(threaded.sinkIds, single.sinkIds);
  EXPECT_EQ(threaded.sinkIds.front(), "W000000");
  EXPECT_EQ(threaded.sinkIds.back(), "W012999");
  ASSERT_EQ(threaded.stored.size(), 13000u);
  EXPECT_EQ(threaded.stored, single.stored);
  EXPECT_DOUBLE_EQ(threaded.stored[3].rate, 100.0 + 3 + 7.5);
  EXPECT_DOUBLE_EQ(threaded.stored[4].rate, 100.0 + 4);
}

TEST(ReservationWriter, TheStoresErrorReachesTheCallerAndTheTransactionWritesNothing) {
  cbtest::TempDir dir;
  auto store = newStore(dir, "s.cbstore");
  auto list = rows(10000, 0);
  list[5000].rooms = 0; // the table's CHECK (rooms > 0) refuses it, on the writer's thread
  bool threw = false;
  {
    cb::Store::Transaction tx(*store);
    cb::ReservationWriter w(*store, 0, nullptr, true);
    ASSERT_TRUE(w.threaded());
    try {
      for (auto r : list)
        w.add(std::move(r), false);
      w.finish();
      tx.commit();
    } catch (const cb::StoreError &e) {
      threw = true;
      EXPECT_NE(std::string(e.what()).find("CHECK"), std::string::npos) << e.what();
    }
  } // the writer stops before the transaction rolls back
  EXPECT_TRUE(threw);
  EXPECT_EQ(store->reservationCount(), 0);
  // The store is usable again on this thread.
  cb::Store::Transaction tx(*store);
  EXPECT_EQ(store->upsertReservation(list[0], 0, false), cb::UpsertResult::Added);
  tx.commit();
  EXPECT_EQ(store->reservationCount(), 1);
}

TEST(ReservationWriter, AbandonedItStopsAndTheRollbackLeavesTheStoreAsItWas) {
  cbtest::TempDir dir;
  auto store = newStore(dir, "s.cbstore");
  {
    cb::Store::Transaction tx(*store);
    cb::ReservationWriter w(*store, 0, nullptr, true);
    for (auto r : rows(20000, 0))
      w.add(std::move(r), false);
    w.abandon(); // as a cancelled import does; whatever was written is rolled back
  }
  EXPECT_EQ(store->reservationCount(), 0);
}
