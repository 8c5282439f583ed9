// The Data screen: an import in three steps on one page — choose a file (reservations or group
// blocks) and see its first rows; map its columns onto the native fields (starting from a
// shipped or saved profile, matched by header name, savable as a JSON profile the CLI's
// --profile reads); validate (a dry run: findings at file:line:column, rows ok / rejected) and
// commit strict or lenient in the background with progress and cancel. Beside it the store's
// import log (CSV/XLSX export) and the data-health findings by severity.
#pragma once

#include <QString>
#include <QWidget>

#include <filesystem>
#include <vector>

// Forward declarations only: moc of Qt 6.4 cannot parse the C++20 library headers core uses.
namespace cb {
struct Finding;
}

namespace cbui {

class FindingsPanel;
class ImportDraft;
class ImportLogModel;
class MappingModel;

class DataPanel : public QWidget {
  Q_OBJECT
public:
  explicit DataPanel(QWidget *parent = nullptr);
  ~DataPanel() override;

  /// The open store (imports go there; its import log is read again).
  void setStore(const std::filesystem::path &store);
  /// Another window writes this store: validation still works, Commit is refused with `reason`.
  void setReadOnly(bool readOnly, const QString &reason = {});
  /// Where import findings are listed (not owned).
  void setFindingsPanel(FindingsPanel *panel);
  /// The store's data-health findings, as the window's health check found them.
  void setHealthFindings(const std::vector<cb::Finding> &findings);

  // The steps as the buttons run them (for tests and scripts).
  /// 0 = reservations, 1 = group blocks.
  void setKind(int kind);
  /// Reads the file's first rows and matches its columns by name; false on a file-level problem.
  bool chooseFile(const QString &path);
  /// Starts the mapping from a shipped profile name or a JSON profile file.
  bool startFromProfile(const QString &nameOrPath);
  void validate();
  void commit(bool lenient);
  void cancel();
  bool busy() const;

  ImportDraft &draft();
  MappingModel *mappingModel() const;
  ImportLogModel *importLogModel() const;
  /// The line under the step buttons: what the last validation or commit found.
  QString resultText() const;
  QString healthText() const;

signals:
  /// A commit wrote to the store: the window reopens it.
  void storeWritten();
  /// Show the findings dock.
  void findingsRequested();
  /// A validation or commit ended (`written`: the store changed).
  void jobFinished(bool written);

private:
  void startJob(bool dryRun, bool lenient);
  void reloadLog();
  void refreshProfileChoices();
  void draftChanged(const QString &note);
  struct Impl;
  Impl *d_;
};

} // namespace cbui
