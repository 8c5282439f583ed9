#include "core/samplestore.h"

#include "core/keptcube.h"
#include "core/reservationsnapshot.h"

#include <fmt/format.h>

namespace cb {

ImportReport buildSampleStore(const std::filesystem::path &storePath,
                              const std::filesystem::path &filesDir,
                              const SimulatorConfig &config) {
  return buildSampleStore(storePath, filesDir, simulateProperty(config));
}

ImportReport buildSampleStore(const std::filesystem::path &storePath,
                              const std::filesystem::path &filesDir, const SampleProperty &sample) {
  if (std::filesystem::exists(storePath))
    throw StoreError(fmt::format("{} already exists", storePath.string()));
  // Built under a temporary name and renamed at the end, so a build that fails or is killed
  // never leaves a half-filled store where the workbench would take it for the sample.
  std::filesystem::path partial = storePath;
  partial += ".partial";
  for (const char *suffix : {"", "-wal", "-shm", "-journal", ".snapshot", ".cube"})
    std::filesystem::remove(partial.string() + suffix);
  auto store = Store::create(partial, sample.property);
  {
    Store::Transaction tx(*store);
    for (const auto &r : sample.roomTypes)
      store->upsertRoomType(r);
    for (const auto &s : sample.segments)
      store->upsertSegment(s);
    for (const auto &c : sample.channels)
      store->upsertChannel(c);
    for (const auto &e : sample.events)
      store->addEvent(e);
    // With the contract date and room type blocks.csv carries (wash is measured by lead).
    for (std::size_t i = 0; i < sample.blocks.size(); ++i) {
      const BlockDetail detail =
          i < sample.blockDetails.size() ? sample.blockDetails[i] : BlockDetail{};
      store->upsertBlock(
          {sample.blocks[i],
           detail.contractedOn == Date{} ? std::nullopt : std::optional<Date>(detail.contractedOn),
           detail.roomType});
    }
    for (const auto &d : sample.denials)
      store->addDenial(d);
    tx.commit();
  }
  writeSampleFiles(sample, filesDir);
  ImportReport report = importReservations(*store, filesDir / "reservations.csv");
  if (!report.written) {
    std::string first =
        report.findings.empty() ? "unknown error" : report.findings.front().toString();
    throw StoreError(fmt::format("the sample property did not import: {}", first));
  }
  store.reset(); // closes the connection, folding the write-ahead log into the file
  std::filesystem::rename(partial, storePath);
  // The import wrote the reservation snapshot and the kept cube beside the partial store; they
  // go with it (their stamp is in the store, so they stay current under the new name).
  if (const auto snapshot = snapshotPathFor(partial); std::filesystem::exists(snapshot))
    std::filesystem::rename(snapshot, snapshotPathFor(storePath));
  if (const auto cube = keptCubePathFor(partial); std::filesystem::exists(cube))
    std::filesystem::rename(cube, keptCubePathFor(storePath));
  return report;
}

} // namespace cb
