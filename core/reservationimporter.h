// Reservation import: file → rows → mapping profile → validation → store, as one transaction.
#pragma once

#include "core/finding.h"
#include "core/store.h"

#include <filesystem>
#include <optional>
#include <string>

namespace cb {

enum class ImportMode { Strict, Lenient };

struct ImportOptions {
  ImportMode mode = ImportMode::Strict;
  /// Profile name (a shipped profile, e.g. "native" or "hotel-bookings-open-data") or a path to
  /// a JSON profile. Empty = native format.
  std::string profile;
  /// The profile's JSON text, e.g. a mapping edited in the workbench and not saved yet. When
  /// set, it is parsed instead of loading `profile`, which then only names it (log, findings).
  std::string profileText;
  /// Dry run (validation): everything is read, mapped, checked and written inside the
  /// transaction, which is then rolled back; nothing is logged. The counts say what a real
  /// import would add, update or leave unchanged. No rejects file is written.
  bool dryRun = false;
  /// Lenient mode: rejected rows are written here (the original line plus a "problem" column).
  std::optional<std::filesystem::path> rejectsFile;
  ProgressFn progress = nullptr; ///< called every few thousand rows; false cancels (rolls back)
  void *progressContext = nullptr;
};

struct ImportReport {
  ImportLogEntry log;   ///< counts as logged (added/updated are 0 when nothing was written)
  Findings findings;    ///< every rejected row and every file-level problem
  bool written = false; ///< true when the transaction committed
  bool cancelled = false;
  /// The file, the profile or the rejects file could not be opened, read or written (as opposed
  /// to problems in the data): the CLI exits 2 rather than 1.
  bool ioOrUsageError = false;
};

/// Imports a reservation extract into the store. Strict: any error → nothing written.
/// Lenient: valid rows written, rejects reported (and copied to rejectsFile). Re-importing a
/// newer extract updates rows by id; an unchanged row counts as unchanged, never duplicated.
/// Streams the file: memory is bounded by the set of ids seen (for duplicate detection).
/// Throws StoreError only for I/O failures of the store itself; problems with the file are
/// findings (file-level ones have line 0 or the line where reading stopped).
ImportReport importReservations(Store &store, const std::filesystem::path &file,
                                const ImportOptions &options = {});

} // namespace cb
