#include "core/keptcube.h"
#include "core/reservationsnapshot.h"
#include "core/samplestore.h"

#include "testsupport.h"

TEST(SampleStore, HoldsEverythingTheSimulatorMade) {
  cbtest::TempDir dir;
  cb::SampleProperty sample = cb::simulateProperty();
  cb::ImportReport rep = cb::buildSampleStore(dir / "s.curvebench", dir / "files");
  ASSERT_TRUE(rep.written);
  EXPECT_TRUE(rep.findings.empty());
  auto store = cb::Store::open(dir / "s.curvebench");
  cb::StoreSummary s = store->summary();
  EXPECT_EQ(s.reservations, static_cast<std::int64_t>(sample.reservations.size()));
  EXPECT_EQ(s.blocks, static_cast<std::int64_t>(sample.blocks.size()));
  EXPECT_EQ(s.denials, static_cast<std::int64_t>(sample.denials.size()));
  EXPECT_EQ(s.events, static_cast<std::int64_t>(sample.events.size()));
  EXPECT_EQ(s.lastActivity, sample.readingDate);
  EXPECT_EQ(store->segments().size(), sample.segments.size());
  EXPECT_EQ(store->property().name, sample.property.name);
  EXPECT_EQ(store->property().capacityChanges, sample.property.capacityChanges);
  // The reservations went through the import pipeline, which logged it against the kept file.
  auto log = store->importLog();
  ASSERT_EQ(log.size(), 1u);
  EXPECT_EQ(log[0].added, s.reservations);
  EXPECT_TRUE(std::filesystem::exists(dir / "files" / "reservations.csv"));
  // Built under a temporary name: nothing of it is left beside the store.
  EXPECT_FALSE(std::filesystem::exists(dir / "s.curvebench.partial"));
  EXPECT_FALSE(std::filesystem::exists(dir / "s.curvebench.partial-wal"));
  EXPECT_FALSE(std::filesystem::exists(dir / "s.curvebench.partial.snapshot"));
  // The import's reservation snapshot moved with the store and is current under its new name.
  EXPECT_TRUE(std::filesystem::exists(dir / "s.curvebench.snapshot"));
  const auto snapshot =
      cb::readReservationSnapshot(dir / "s.curvebench.snapshot", store->reservationStamp());
  ASSERT_TRUE(snapshot.has_value());
  EXPECT_EQ(snapshot->size(), sample.reservations.size());
  // So did the kept cube (core/keptcube.h).
  EXPECT_FALSE(std::filesystem::exists(dir / "s.curvebench.partial.cube"));
  const auto kept = cb::readKeptCube(dir / "s.curvebench.cube", store->reservationStamp());
  ASSERT_TRUE(kept.has_value());
  EXPECT_EQ(kept->bounds.newest, cb::boundsOf(sample.reservations).newest);
  // And it refuses to overwrite an existing store.
  EXPECT_THROW(cb::buildSampleStore(dir / "s.curvebench", dir / "files2"), cb::StoreError);
}
