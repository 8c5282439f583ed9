// libFuzzer harness: the reservation and block importers over arbitrary file contents, each
// input into a fresh store (scripts/fuzz.sh). The first byte picks the importer, the profile
// (native or the open dataset's) and the mode (strict or lenient). Promises checked: no crash or
// sanitizer error, every finding located, a strict import with an error writes nothing, a failed
// import writes nothing (cbfuzz::checkImport).
#include "core/blockimporter.h"
#include "core/reservationimporter.h"
#include "fuzzsupport.h"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t *data, std::size_t size) {
  if (size == 0)
    return 0;
  const std::uint8_t pick = data[0];
  const auto file =
      cbfuzz::writeFile("input.csv", {reinterpret_cast<const char *>(data + 1), size - 1});
  auto store = cbfuzz::freshStore();
  cb::ImportOptions options;
  options.mode = (pick & 1) ? cb::ImportMode::Lenient : cb::ImportMode::Strict;
  const bool blocks = (pick & 2) != 0;
  if (!blocks && (pick & 4))
    options.profile = "hotel-bookings-open-data";
  try {
    if (blocks) {
      const auto before = static_cast<std::int64_t>(store->blockRecords().size());
      const cb::ImportReport r = cb::importBlocks(*store, file, options);
      cbfuzz::checkImport(r, options.mode, before,
                          static_cast<std::int64_t>(store->blockRecords().size()));
    } else {
      const std::int64_t before = store->reservationCount();
      const cb::ImportReport r = cb::importReservations(*store, file, options);
      cbfuzz::checkImport(r, options.mode, before, store->reservationCount());
    }
  } catch (const cb::StoreError &) {
    // Only for failures of the store itself (documented); a tmpfs store should not fail.
    cbfuzz::require(false);
  }
  return 0;
}
