#include "ui/importjob.h"

#include "core/blockimporter.h"
#include "core/store.h"
#include "core/textformat.h"

#include <exception>

namespace cbui {
namespace {

bool importProgress(void *context, std::int64_t done, std::int64_t total) {
  auto *control = static_cast<ImportControl *>(context);
  control->done = done;
  control->total = total;
  return !control->cancel;
}

QString count(std::int64_t n) { return QString::fromStdString(cb::formatCount(n)); }

} // namespace

QString importSummary(const cb::ImportReport &report, const QString &fileName, bool dryRun) {
  const cb::ImportLogEntry &l = report.log;
  if (report.cancelled)
    return QStringLiteral("%1 of %2 cancelled: nothing written, the store is as it was")
        .arg(dryRun ? QStringLiteral("Validation") : QStringLiteral("Import"), fileName);
  if (dryRun) {
    const bool fileLevel = l.rowsRead == 0 || (cb::hasErrors(report.findings) && l.rejected == 0);
    if (fileLevel)
      return QStringLiteral("Validated %1: the file cannot be imported as it is, see Findings")
          .arg(fileName);
    return QStringLiteral("Validated %1 (nothing written): %2 rows read, %3 ok, %4 rejected; "
                          "a commit would add %5, update %6, leave %7 unchanged")
        .arg(fileName, count(l.rowsRead), count(l.rowsRead - l.rejected), count(l.rejected),
             count(l.added), count(l.updated), count(l.unchanged));
  }
  if (report.written)
    return QStringLiteral("Imported %1: %2 rows read, %3 added, %4 updated, %5 unchanged%6")
        .arg(fileName, count(l.rowsRead), count(l.added), count(l.updated), count(l.unchanged),
             l.rejected > 0 ? QStringLiteral(", %1 rejected").arg(count(l.rejected)) : QString());
  return QStringLiteral("Nothing imported from %1: %2 finding(s), see Findings")
      .arg(fileName)
      .arg(report.findings.size());
}

ImportJobOutcome runImportJob(const std::filesystem::path &store, const std::filesystem::path &file,
                              ImportKind kind, cb::ImportOptions options, ImportControl *control) {
  ImportJobOutcome out;
  out.dryRun = options.dryRun;
  if (control) {
    options.progress = importProgress;
    options.progressContext = control;
  }
  const QString name = QString::fromStdString(file.filename().string());
  try {
    auto db = cb::Store::open(store);
    out.report = kind == ImportKind::Blocks ? cb::importBlocks(*db, file, options)
                                            : cb::importReservations(*db, file, options);
    out.summary = importSummary(out.report, name, options.dryRun);
  } catch (const std::exception &e) {
    out.summary = QStringLiteral("Import failed: %1").arg(QString::fromStdString(e.what()));
    out.report.findings.push_back(
        cb::Finding{cb::Severity::Error, store.string(), 0, 0,
                    std::string("the store could not be written: ") + e.what()});
  }
  return out;
}

} // namespace cbui
