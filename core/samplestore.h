// Builds a ready-to-use store from the simulated sample property.
#pragma once

#include "core/reservationimporter.h"
#include "core/simulator.h"

#include <filesystem>

namespace cb {

/// Simulates the sample property, writes its files into `filesDir` (kept, so the import log
/// points at a real file) and loads them into a new store at `storePath` — reservations through
/// the ordinary import pipeline, so the sample exercises the same code as a user's extract.
/// Throws StoreError if the store exists or the import fails.
ImportReport buildSampleStore(const std::filesystem::path &storePath,
                              const std::filesystem::path &filesDir,
                              const SimulatorConfig &config = {});
/// The same for a sample already simulated (so a caller that needs it too simulates once).
ImportReport buildSampleStore(const std::filesystem::path &storePath,
                              const std::filesystem::path &filesDir, const SampleProperty &sample);

} // namespace cb
