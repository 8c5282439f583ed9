// One import as the workbench runs it off the UI thread: reservations or blocks, a shipped,
// saved or edited mapping profile, strict or lenient, or a dry run (validation). Shared by the
// window's drag-and-drop import and the Data screen.
#pragma once

#include "core/reservationimporter.h"
#include "ui/importcontrol.h"

#include <QString>

#include <filesystem>

namespace cbui {

enum class ImportKind { Reservations, Blocks };

struct ImportJobOutcome {
  cb::ImportReport report;
  bool dryRun = false;
  /// One status line: what was read, written or refused.
  QString summary;
};

/// Opens its own handle on `store` and imports `file` with `options` (progress and cancel
/// through `control`, which may be null). Never throws: a store failure becomes the summary and
/// an error finding.
ImportJobOutcome runImportJob(const std::filesystem::path &store, const std::filesystem::path &file,
                              ImportKind kind, cb::ImportOptions options, ImportControl *control);

/// The status line of a finished import or validation.
QString importSummary(const cb::ImportReport &report, const QString &fileName, bool dryRun);

} // namespace cbui
