// The Data screen's model layer, without widgets: an import draft (file, kind, first rows,
// mapping profile being edited), the table models the screen shows (preview, mapping, import
// log) and the data-health summary. Tests drive these directly.
#pragma once

#include "core/finding.h"
#include "core/reservationimporter.h"
#include "core/store.h"
#include "ui/importjob.h"

#include <QAbstractTableModel>
#include <QByteArray>
#include <QJsonObject>
#include <QList>
#include <QString>
#include <QStringList>

#include <filesystem>
#include <vector>

namespace cbui {

/// One target field of the mapping as the mapping table shows it.
struct MappingRow {
  enum class Source { NotImported, Column, Constant, LineNumber, Derived };
  QString field; ///< native field ("arrival", "rooms_per_night", …)
  bool required = false;
  Source source = Source::NotImported;
  QString column;              ///< Column: the header name it is read from
  bool optionalColumn = false; ///< Column: a file without it leaves the field empty
  QString description;         ///< how the value is made, in words
  QStringList columnsUsed;     ///< every header column the source reads
  QStringList missing; ///< of those, the ones the file's header lacks (optional ones excluded)
};

/// An import being prepared: which file, which kind, and the mapping profile (a shipped one, a
/// saved JSON file, or an edit of either) that turns its columns into native fields.
class ImportDraft {
public:
  static constexpr int kPreviewRows = 20;

  ImportDraft();

  ImportKind kind() const { return kind_; }
  /// Switches reservations / blocks; the profile starts again from that kind's native one.
  void setKind(ImportKind kind);

  /// What the "Start from" list offers: the shipped profiles of the kind ("native" first), then
  /// the profile files of that kind found in `folder` (full paths, sorted).
  static QStringList profileChoices(ImportKind kind, const QString &folder);
  /// Starts the mapping from a shipped profile name or a JSON profile file. False (draft
  /// unchanged) with the reason in `error` when it cannot be read or is of the other kind.
  bool startFrom(const QString &nameOrPath, QString *error = nullptr);
  /// The profile's "name"; its source (shipped name or file) and whether it was changed since.
  QString profileName() const;
  QString profileSource() const { return source_; }
  bool edited() const { return edited_; }
  const QJsonObject &profileJson() const { return profile_; }
  /// The profile as the JSON text the CLI's --profile reads.
  QByteArray profileText() const;
  QChar delimiter() const;
  /// Sets the profile's delimiter and reads the preview again.
  void setDelimiter(QChar delimiter);

  /// Reads the header and the first kPreviewRows rows. False when the file cannot be read or
  /// stops at a file-level problem (see previewFindings(); the rows read before it are kept).
  bool setFile(const QString &path);
  QString file() const { return file_; }
  const QStringList &header() const { return header_; }
  const QList<QStringList> &previewRows() const { return rows_; }
  const QList<qint64> &previewLines() const { return lines_; }
  const cb::Findings &previewFindings() const { return previewFindings_; }

  /// The target fields of the kind, in native column order.
  QStringList fields() const;
  std::vector<MappingRow> mapping() const;
  MappingRow row(const QString &field) const;
  /// Reads `field` from header column `column`; empty = not imported (refused for a required
  /// field). Refused when a header is read and has no such column. True when it changed.
  bool setColumn(const QString &field, const QString &column);
  /// For each field read from a column the header lacks (or not imported), picks the unused
  /// header column whose name matches the field, its profile column or a common alias
  /// (case, spaces and punctuation ignored). Returns how many fields it changed.
  int autoMatch();
  /// Required fields the file cannot provide with this mapping (their columns are missing).
  QStringList unmapped() const;
  /// A file is read and every required field has its columns.
  bool ready() const;

  /// Writes the profile as JSON (its "name" becomes the file's base name); the draft then
  /// starts from that file. The written file is read back with the importer's own profile
  /// parser: false with the reason in `error` when writing or that check fails.
  bool saveProfile(const QString &path, QString *error = nullptr);

  /// The options a validation (dry run) or commit of this draft uses: an unchanged profile by
  /// its name or path, an edited one as JSON text named "<name> (edited, not saved)".
  cb::ImportOptions importOptions(cb::ImportMode mode, bool dryRun) const;

private:
  void readPreview();
  QJsonObject fieldsObject() const;
  void setFieldsObject(const QJsonObject &fields);

  ImportKind kind_ = ImportKind::Reservations;
  QJsonObject profile_;
  QString source_ = QStringLiteral("native");
  bool edited_ = false;
  QString file_;
  QStringList header_;
  QList<QStringList> rows_;
  QList<qint64> lines_;
  cb::Findings previewFindings_;
};

/// The first rows of the file as read (header as column titles, line numbers as row titles).
class PreviewModel : public QAbstractTableModel {
public:
  explicit PreviewModel(const ImportDraft *draft, QObject *parent = nullptr);
  /// Call after the draft's file or delimiter changed.
  void refresh();
  int rowCount(const QModelIndex &parent = {}) const override;
  int columnCount(const QModelIndex &parent = {}) const override;
  QVariant data(const QModelIndex &index, int role = Qt::DisplayRole) const override;
  QVariant headerData(int section, Qt::Orientation o, int role = Qt::DisplayRole) const override;

private:
  const ImportDraft *draft_;
};

/// One row per target field: field, required, source (editable: a header column or "not
/// imported"), the first row's value, and whether the file provides it.
class MappingModel : public QAbstractTableModel {
public:
  enum Column { FieldCol, RequiredCol, SourceCol, ValueCol, CheckCol, ColumnCount };
  /// The source-column choice that leaves an optional field out.
  static QString notImported();

  explicit MappingModel(ImportDraft *draft, QObject *parent = nullptr);
  void refresh();
  /// What the Source cell of `row` can be set to: "not imported" for optional fields, then the
  /// header columns.
  QStringList choices(int row) const;
  int rowCount(const QModelIndex &parent = {}) const override;
  int columnCount(const QModelIndex &parent = {}) const override;
  QVariant data(const QModelIndex &index, int role = Qt::DisplayRole) const override;
  QVariant headerData(int section, Qt::Orientation o, int role = Qt::DisplayRole) const override;
  Qt::ItemFlags flags(const QModelIndex &index) const override;
  bool setData(const QModelIndex &index, const QVariant &value, int role = Qt::EditRole) override;

private:
  ImportDraft *draft_;
  std::vector<MappingRow> rows_;
};

/// Store::importLog(), newest first: when, file, kind, profile, mode, counts, outcome.
class ImportLogModel : public QAbstractTableModel {
public:
  enum Column {
    WhenCol,
    FileCol,
    KindCol,
    ProfileCol,
    ModeCol,
    ReadCol,
    AddedCol,
    UpdatedCol,
    UnchangedCol,
    RejectedCol,
    OutcomeCol,
    ColumnCount
  };
  explicit ImportLogModel(QObject *parent = nullptr);
  /// Entries as Store::importLog() returns them (oldest first).
  void setEntries(std::vector<cb::ImportLogEntry> entries);
  const std::vector<cb::ImportLogEntry> &entries() const { return entries_; }
  int rowCount(const QModelIndex &parent = {}) const override;
  int columnCount(const QModelIndex &parent = {}) const override;
  QVariant data(const QModelIndex &index, int role = Qt::DisplayRole) const override;
  QVariant headerData(int section, Qt::Orientation o, int role = Qt::DisplayRole) const override;

private:
  std::vector<cb::ImportLogEntry> entries_; ///< newest first
};

/// Reads a store's import log (its own handle; throws cb::StoreError).
std::vector<cb::ImportLogEntry> readImportLog(const std::filesystem::path &store);

/// The data-health findings counted by severity.
struct HealthCounts {
  int errors = 0, warnings = 0, notes = 0;
  int total() const { return errors + warnings + notes; }
};
HealthCounts countBySeverity(const cb::Findings &findings);
/// "2 warnings, 1 note" / "no findings".
QString healthCountsText(const HealthCounts &counts);

} // namespace cbui
