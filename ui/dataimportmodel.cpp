#include "ui/dataimportmodel.h"

#include "core/blockprofile.h"
#include "core/csvreader.h"
#include "core/mappingprofile.h"
#include "core/nativeformat.h"
#include "core/textformat.h"
#include "ui/csvexport.h"

#include <QBrush>
#include <QColor>
#include <QDir>
#include <QFile>
#include <QFileInfo>
#include <QFont>
#include <QJsonArray>
#include <QJsonDocument>
#include <QSaveFile>
#include <QSet>

#include <algorithm>
#include <fstream>

namespace cbui {
namespace {

const QString kFields = QStringLiteral("fields");
const QString kColumn = QStringLiteral("column");

QString qs(std::string_view s) {
  return QString::fromUtf8(s.data(), static_cast<qsizetype>(s.size()));
}

/// Problems are marked with ⚠ in the text as well, so colour is never the only sign.
QColor problemColour() { return QColor(0xD5, 0x5E, 0x00); } // Okabe–Ito vermillion

QJsonObject nativeBlocksProfile() {
  QJsonObject fields;
  for (auto f : cb::kBlockColumns) {
    QJsonObject spec{{kColumn, qs(f)}};
    if (!cb::isRequiredBlockField(f))
      spec.insert(QStringLiteral("optional"), true);
    fields.insert(qs(f), spec);
  }
  return QJsonObject{
      {QStringLiteral("kind"), QStringLiteral("blocks")},
      {QStringLiteral("name"), QStringLiteral("native")},
      {QStringLiteral("description"),
       QStringLiteral(
           "Curvebench's own group-blocks CSV: every field from the column of its name")},
      {QStringLiteral("warn_unused_columns"), true},
      {kFields, fields}};
}

QJsonObject shippedReservationProfile(const QString &name) {
  const std::string_view text = cb::MappingProfile::shippedText(name.toStdString());
  if (text.empty())
    return {};
  return QJsonDocument::fromJson(QByteArray(text.data(), static_cast<qsizetype>(text.size())))
      .object();
}

bool isBlocksProfile(const QJsonObject &p) {
  return p.value(QStringLiteral("kind")).toString() == QStringLiteral("blocks");
}

/// Checks profile JSON with the importer's own parser; the first finding when it refuses it.
bool coreAccepts(ImportKind kind, const QByteArray &text, const QString &label, QString *error) {
  cb::Findings findings;
  const std::string_view json(text.constData(), static_cast<std::size_t>(text.size()));
  const bool ok = kind == ImportKind::Blocks
                      ? cb::BlockProfile::parse(json, label.toStdString(), findings).has_value()
                      : cb::MappingProfile::parse(json, label.toStdString(), findings).has_value();
  if (!ok && error)
    *error = findings.empty() ? QStringLiteral("the profile cannot be read")
                              : QString::fromStdString(findings.front().toString());
  return ok;
}

QString normalised(const QString &name) {
  QString out;
  for (QChar c : name.toLower())
    if (c.isLetterOrNumber())
      out += c;
  return out;
}

/// Other names a column of that field often has in extracts (our own list, no source).
QStringList aliases(ImportKind kind, const QString &field) {
  static const QHash<QString, QStringList> reservations = {
      {QStringLiteral("reservation_id"),
       {QStringLiteral("id"), QStringLiteral("booking_id"), QStringLiteral("booking_number"),
        QStringLiteral("reservation_number"), QStringLiteral("confirmation_number"),
        QStringLiteral("res_id"), QStringLiteral("booking_reference")}},
      {QStringLiteral("status"),
       {QStringLiteral("reservation_status"), QStringLiteral("booking_status")}},
      {QStringLiteral("booked_on"),
       {QStringLiteral("booking_date"), QStringLiteral("booked_date"), QStringLiteral("created_on"),
        QStringLiteral("creation_date"), QStringLiteral("reservation_date"),
        QStringLiteral("date_booked")}},
      {QStringLiteral("cancelled_on"),
       {QStringLiteral("cancellation_date"), QStringLiteral("cancel_date"),
        QStringLiteral("canceled_on"), QStringLiteral("cancelled_date"),
        QStringLiteral("canceled_date")}},
      {QStringLiteral("arrival"),
       {QStringLiteral("arrival_date"), QStringLiteral("check_in"),
        QStringLiteral("check_in_date")}},
      {QStringLiteral("departure"),
       {QStringLiteral("departure_date"), QStringLiteral("check_out"),
        QStringLiteral("check_out_date")}},
      {QStringLiteral("rooms"),
       {QStringLiteral("room_count"), QStringLiteral("number_of_rooms"),
        QStringLiteral("rooms_booked")}},
      {QStringLiteral("room_type"),
       {QStringLiteral("room_category"), QStringLiteral("reserved_room_type")}},
      {QStringLiteral("segment"), {QStringLiteral("market_segment"), QStringLiteral("market")}},
      {QStringLiteral("channel"),
       {QStringLiteral("distribution_channel"), QStringLiteral("booking_channel"),
        QStringLiteral("source")}},
      {QStringLiteral("rate"),
       {QStringLiteral("adr"), QStringLiteral("room_rate"), QStringLiteral("average_rate"),
        QStringLiteral("daily_rate"), QStringLiteral("rate_per_night")}},
      {QStringLiteral("currency"), {QStringLiteral("currency_code")}},
      {QStringLiteral("block_id"),
       {QStringLiteral("group_id"), QStringLiteral("group_code"), QStringLiteral("block_code")}}};
  static const QHash<QString, QStringList> blocks = {
      {QStringLiteral("block_id"),
       {QStringLiteral("id"), QStringLiteral("group_id"), QStringLiteral("block_code"),
        QStringLiteral("group_code")}},
      {QStringLiteral("name"), {QStringLiteral("group_name"), QStringLiteral("block_name")}},
      {QStringLiteral("segment"), {QStringLiteral("market_segment")}},
      {QStringLiteral("arrival"), {QStringLiteral("arrival_date"), QStringLiteral("from")}},
      {QStringLiteral("departure"), {QStringLiteral("departure_date"), QStringLiteral("to")}},
      {QStringLiteral("rooms_per_night"),
       {QStringLiteral("rooms"), QStringLiteral("rooms_blocked"), QStringLiteral("block_size")}},
      {QStringLiteral("cutoff"),
       {QStringLiteral("cutoff_date"), QStringLiteral("release_date"), QStringLiteral("release")}},
      {QStringLiteral("status"), {QStringLiteral("block_status")}},
      {QStringLiteral("contracted_on"),
       {QStringLiteral("contract_date"), QStringLiteral("signed_on")}},
      {QStringLiteral("room_type"), {QStringLiteral("room_category")}}};
  return (kind == ImportKind::Blocks ? blocks : reservations).value(field);
}

QString quoted(const QString &s) { return QStringLiteral("“%1”").arg(s); }

QString count(std::int64_t n) { return QString::fromStdString(cb::formatCount(n)); }

} // namespace

// ---- ImportDraft ----

ImportDraft::ImportDraft() { setKind(ImportKind::Reservations); }

void ImportDraft::setKind(ImportKind kind) {
  kind_ = kind;
  profile_ = kind == ImportKind::Blocks ? nativeBlocksProfile()
                                        : shippedReservationProfile(QStringLiteral("native"));
  source_ = QStringLiteral("native");
  edited_ = false;
  readPreview();
}

QStringList ImportDraft::profileChoices(ImportKind kind, const QString &folder) {
  QStringList out;
  if (kind == ImportKind::Blocks) {
    out << QStringLiteral("native");
  } else {
    out << QStringLiteral("native");
    for (const auto &name : cb::MappingProfile::shippedNames())
      if (name != "native")
        out << QString::fromStdString(name);
  }
  if (folder.isEmpty())
    return out;
  const QDir dir(folder);
  const QStringList files =
      dir.entryList({QStringLiteral("*.json")}, QDir::Files | QDir::Readable, QDir::Name);
  for (const QString &name : files) {
    QFile f(dir.filePath(name));
    if (f.size() > 256 * 1024 || !f.open(QIODevice::ReadOnly))
      continue;
    const QJsonObject p = QJsonDocument::fromJson(f.readAll()).object();
    if (p.value(kFields).isObject() && isBlocksProfile(p) == (kind == ImportKind::Blocks))
      out << dir.filePath(name);
  }
  return out;
}

bool ImportDraft::startFrom(const QString &nameOrPath, QString *error) {
  QJsonObject p;
  if (nameOrPath == QStringLiteral("native") || nameOrPath.isEmpty()) {
    p = kind_ == ImportKind::Blocks ? nativeBlocksProfile()
                                    : shippedReservationProfile(QStringLiteral("native"));
  } else if (kind_ == ImportKind::Reservations &&
             !cb::MappingProfile::shippedText(nameOrPath.toStdString()).empty()) {
    p = shippedReservationProfile(nameOrPath);
  } else {
    QFile f(nameOrPath);
    if (!f.open(QIODevice::ReadOnly)) {
      if (error)
        *error = QStringLiteral("cannot read %1: %2").arg(nameOrPath, f.errorString());
      return false;
    }
    const QByteArray text = f.readAll();
    p = QJsonDocument::fromJson(text).object();
    // The kind first: the other kind's parser would only list the keys it does not know.
    if (!p.isEmpty() && isBlocksProfile(p) != (kind_ == ImportKind::Blocks)) {
      if (error)
        *error =
            kind_ == ImportKind::Blocks
                ? QStringLiteral("%1 is a reservations profile, not a blocks one").arg(nameOrPath)
                : QStringLiteral("%1 is a blocks profile, not a reservations one").arg(nameOrPath);
      return false;
    }
    if (!coreAccepts(kind_, text, nameOrPath, error))
      return false;
  }
  if (isBlocksProfile(p) != (kind_ == ImportKind::Blocks)) {
    if (error)
      *error =
          kind_ == ImportKind::Blocks
              ? QStringLiteral("%1 is a reservations profile, not a blocks one").arg(nameOrPath)
              : QStringLiteral("%1 is a blocks profile, not a reservations one").arg(nameOrPath);
    return false;
  }
  profile_ = p;
  source_ = nameOrPath.isEmpty() ? QStringLiteral("native") : nameOrPath;
  edited_ = false;
  readPreview();
  return true;
}

QString ImportDraft::profileName() const {
  const QString name = profile_.value(QStringLiteral("name")).toString();
  return name.isEmpty() ? QFileInfo(source_).completeBaseName() : name;
}

QByteArray ImportDraft::profileText() const {
  return QJsonDocument(profile_).toJson(QJsonDocument::Indented);
}

QChar ImportDraft::delimiter() const {
  const QString d = profile_.value(QStringLiteral("delimiter")).toString();
  return d.size() == 1 ? d.front() : QLatin1Char(',');
}

void ImportDraft::setDelimiter(QChar delimiter) {
  if (delimiter == this->delimiter())
    return;
  profile_.insert(QStringLiteral("delimiter"), QString(delimiter));
  edited_ = true;
  readPreview();
}

bool ImportDraft::setFile(const QString &path) {
  file_ = path;
  readPreview();
  return previewFindings_.empty() && !header_.isEmpty();
}

void ImportDraft::readPreview() {
  header_.clear();
  rows_.clear();
  lines_.clear();
  previewFindings_.clear();
  if (file_.isEmpty())
    return;
  std::ifstream in(std::filesystem::path(file_.toStdString()), std::ios::binary);
  if (!in || QFileInfo(file_).isDir()) {
    previewFindings_.push_back(
        cb::Finding{cb::Severity::Error, file_.toStdString(), 0, 0, "cannot open the file"});
    return;
  }
  cb::CsvReader::Options options;
  options.delimiter = delimiter().toLatin1();
  cb::CsvReader reader(in, file_.toStdString(), options);
  cb::CsvRecord rec;
  auto texts = [](const cb::CsvRecord &r) {
    QStringList out;
    for (const auto &f : r.fields)
      out << QString::fromStdString(f.text);
    return out;
  };
  if (reader.next(rec)) {
    header_ = texts(rec);
    while (rows_.size() < kPreviewRows && reader.next(rec)) {
      rows_ << texts(rec);
      lines_ << rec.line;
    }
  }
  if (reader.fatal())
    previewFindings_.push_back(*reader.fatal());
}

QStringList ImportDraft::fields() const {
  QStringList out;
  if (kind_ == ImportKind::Blocks)
    for (auto f : cb::kBlockColumns)
      out << qs(f);
  else
    for (auto f : cb::kNativeColumns)
      out << qs(f);
  return out;
}

QJsonObject ImportDraft::fieldsObject() const { return profile_.value(kFields).toObject(); }

void ImportDraft::setFieldsObject(const QJsonObject &fields) {
  profile_.insert(kFields, fields);
  edited_ = true;
}

MappingRow ImportDraft::row(const QString &field) const {
  MappingRow r;
  r.field = field;
  r.required = kind_ == ImportKind::Blocks ? cb::isRequiredBlockField(field.toStdString())
                                           : cb::isRequiredNativeColumn(field.toStdString());
  const QJsonObject fields = fieldsObject();
  if (!fields.contains(field)) {
    r.description = QStringLiteral("not imported (left empty)");
    return r;
  }
  const QJsonObject spec = fields.value(field).toObject();
  QStringList notes;
  if (spec.contains(kColumn)) {
    r.source = MappingRow::Source::Column;
    r.column = spec.value(kColumn).toString();
    r.optionalColumn = spec.value(QStringLiteral("optional")).toBool();
    r.columnsUsed << r.column;
    notes << QStringLiteral("column %1").arg(quoted(r.column));
    if (spec.contains(QStringLiteral("date_format")))
      notes << QStringLiteral("date format %1")
                   .arg(spec.value(QStringLiteral("date_format")).toString());
    if (spec.contains(QStringLiteral("values")))
      notes << QStringLiteral("%1 values translated")
                   .arg(spec.value(QStringLiteral("values")).toObject().size());
  } else if (spec.contains(QStringLiteral("constant"))) {
    r.source = MappingRow::Source::Constant;
    notes << QStringLiteral("always %1")
                 .arg(spec.value(QStringLiteral("constant")).toVariant().toString());
  } else if (spec.contains(QStringLiteral("line_number"))) {
    r.source = MappingRow::Source::LineNumber;
    const QString prefix = spec.value(QStringLiteral("prefix")).toString();
    notes << (prefix.isEmpty() ? QStringLiteral("the row's line number")
                               : QStringLiteral("%1 + the row's line number").arg(quoted(prefix)));
  } else if (spec.contains(QStringLiteral("date_parts"))) {
    r.source = MappingRow::Source::Derived;
    const QJsonObject parts = spec.value(QStringLiteral("date_parts")).toObject();
    for (const char *part : {"year", "month", "day"})
      r.columnsUsed << parts.value(QString::fromLatin1(part)).toString();
    notes << QStringLiteral("year, month, day from %1, %2, %3")
                 .arg(quoted(r.columnsUsed[0]), quoted(r.columnsUsed[1]), quoted(r.columnsUsed[2]));
  } else if (spec.contains(QStringLiteral("from_field"))) {
    r.source = MappingRow::Source::Derived;
    QString text = spec.value(QStringLiteral("from_field")).toString();
    for (const auto &v : spec.value(QStringLiteral("plus_days")).toArray()) {
      r.columnsUsed << v.toString();
      text += QStringLiteral(" + %1").arg(quoted(v.toString()));
    }
    for (const auto &v : spec.value(QStringLiteral("minus_days")).toArray()) {
      r.columnsUsed << v.toString();
      text += QStringLiteral(" − %1").arg(quoted(v.toString()));
    }
    notes << text + QStringLiteral(" days");
  }
  if (spec.contains(QStringLiteral("only_when_status")))
    notes << QStringLiteral("only when status is %1")
                 .arg(spec.value(QStringLiteral("only_when_status")).toString());
  r.description = notes.join(QStringLiteral(", "));
  if (!header_.isEmpty() && !r.optionalColumn)
    for (const QString &c : r.columnsUsed)
      if (!header_.contains(c))
        r.missing << c;
  return r;
}

std::vector<MappingRow> ImportDraft::mapping() const {
  std::vector<MappingRow> out;
  for (const QString &f : fields())
    out.push_back(row(f));
  return out;
}

bool ImportDraft::setColumn(const QString &field, const QString &column) {
  if (!fields().contains(field))
    return false;
  QJsonObject fields = fieldsObject();
  if (column.isEmpty()) {
    if (row(field).required || !fields.contains(field))
      return false;
    fields.remove(field);
  } else {
    if (!header_.isEmpty() && !header_.contains(column))
      return false;
    QJsonObject spec = fields.value(field).toObject();
    if (spec.contains(kColumn)) {
      if (spec.value(kColumn).toString() == column)
        return false;
      spec.insert(kColumn, column);
    } else {
      QJsonObject plain{{kColumn, column}};
      if (spec.contains(QStringLiteral("only_when_status")))
        plain.insert(QStringLiteral("only_when_status"),
                     spec.value(QStringLiteral("only_when_status")));
      spec = plain;
    }
    fields.insert(field, spec);
  }
  setFieldsObject(fields);
  return true;
}

int ImportDraft::autoMatch() {
  if (header_.isEmpty())
    return 0;
  QSet<QString> used;
  for (const MappingRow &r : mapping())
    for (const QString &c : r.columnsUsed)
      if (header_.contains(c))
        used.insert(c);
  int changed = 0;
  for (const QString &field : fields()) {
    const MappingRow r = row(field);
    const bool needsColumn =
        (r.source == MappingRow::Source::Column && !header_.contains(r.column)) ||
        r.source == MappingRow::Source::NotImported;
    if (!needsColumn)
      continue;
    QStringList names{normalised(field)};
    if (!r.column.isEmpty())
      names << normalised(r.column);
    for (const QString &a : aliases(kind_, field))
      names << normalised(a);
    bool matched = false;
    for (const QString &name : names) {
      for (const QString &h : header_)
        if (!used.contains(h) && normalised(h) == name && setColumn(field, h)) {
          used.insert(h);
          ++changed;
          matched = true;
          break;
        }
      if (matched)
        break;
    }
  }
  return changed;
}

QStringList ImportDraft::unmapped() const {
  QStringList out;
  for (const MappingRow &r : mapping())
    if ((r.required && r.source == MappingRow::Source::NotImported) || !r.missing.isEmpty())
      out << r.field;
  return out;
}

bool ImportDraft::ready() const { return !header_.isEmpty() && unmapped().isEmpty(); }

bool ImportDraft::saveProfile(const QString &path, QString *error) {
  QJsonObject p = profile_;
  p.insert(QStringLiteral("name"), QFileInfo(path).completeBaseName());
  p.insert(QStringLiteral("description"),
           QStringLiteral("Saved in the Curvebench workbench (Data screen), started from %1")
               .arg(source_ == path ? profileName() : QFileInfo(source_).fileName()));
  if (kind_ == ImportKind::Reservations)
    p.insert(QStringLiteral("version"), 1);
  const QByteArray text = QJsonDocument(p).toJson(QJsonDocument::Indented);
  if (!coreAccepts(kind_, text, path, error))
    return false;
  QSaveFile out(path);
  if (!out.open(QIODevice::WriteOnly) || out.write(text) != text.size() || !out.commit()) {
    if (error)
      *error = QStringLiteral("cannot write %1: %2").arg(path, out.errorString());
    return false;
  }
  profile_ = p;
  source_ = path;
  edited_ = false;
  return true;
}

cb::ImportOptions ImportDraft::importOptions(cb::ImportMode mode, bool dryRun) const {
  cb::ImportOptions o;
  o.mode = mode;
  o.dryRun = dryRun;
  if (!edited_) {
    o.profile = source_.toStdString();
  } else {
    o.profile = QStringLiteral("%1 (edited, not saved)").arg(profileName()).toStdString();
    o.profileText = profileText().toStdString();
  }
  return o;
}

// ---- PreviewModel ----

PreviewModel::PreviewModel(const ImportDraft *draft, QObject *parent)
    : QAbstractTableModel(parent), draft_(draft) {}

void PreviewModel::refresh() {
  beginResetModel();
  endResetModel();
}

int PreviewModel::rowCount(const QModelIndex &parent) const {
  return parent.isValid() ? 0 : static_cast<int>(draft_->previewRows().size());
}

int PreviewModel::columnCount(const QModelIndex &parent) const {
  if (parent.isValid())
    return 0;
  qsizetype n = draft_->header().size();
  for (const QStringList &r : draft_->previewRows())
    n = std::max(n, r.size());
  return static_cast<int>(n);
}

QVariant PreviewModel::data(const QModelIndex &index, int role) const {
  if (!index.isValid() || (role != Qt::DisplayRole && role != Qt::ToolTipRole))
    return {};
  const QStringList &r = draft_->previewRows().at(index.row());
  return index.column() < r.size() ? r.at(index.column()) : QString();
}

QVariant PreviewModel::headerData(int section, Qt::Orientation o, int role) const {
  if (role != Qt::DisplayRole)
    return {};
  if (o == Qt::Horizontal)
    return section < draft_->header().size() ? draft_->header().at(section)
                                             : QStringLiteral("(no header)");
  return section < draft_->previewLines().size()
             ? QStringLiteral("line %1").arg(draft_->previewLines().at(section))
             : QVariant();
}

// ---- MappingModel ----

QString MappingModel::notImported() { return QStringLiteral("(not imported)"); }

MappingModel::MappingModel(ImportDraft *draft, QObject *parent)
    : QAbstractTableModel(parent), draft_(draft), rows_(draft->mapping()) {}

void MappingModel::refresh() {
  beginResetModel();
  rows_ = draft_->mapping();
  endResetModel();
}

QStringList MappingModel::choices(int row) const {
  QStringList out;
  if (row < 0 || row >= rowCount())
    return out;
  if (!rows_[static_cast<std::size_t>(row)].required)
    out << notImported();
  out << draft_->header();
  return out;
}

int MappingModel::rowCount(const QModelIndex &parent) const {
  return parent.isValid() ? 0 : static_cast<int>(rows_.size());
}

int MappingModel::columnCount(const QModelIndex &parent) const {
  return parent.isValid() ? 0 : ColumnCount;
}

QVariant MappingModel::data(const QModelIndex &index, int role) const {
  if (!index.isValid())
    return {};
  const MappingRow &r = rows_[static_cast<std::size_t>(index.row())];
  const bool hasFile = !draft_->header().isEmpty();
  const bool columnAbsent =
      r.source == MappingRow::Source::Column && hasFile && !draft_->header().contains(r.column);
  const bool problem = hasFile && ((r.required && r.source == MappingRow::Source::NotImported) ||
                                   !r.missing.isEmpty());
  if (role == Qt::DisplayRole || role == Qt::EditRole) {
    switch (index.column()) {
    case FieldCol: return r.field;
    case RequiredCol: return r.required ? QStringLiteral("required") : QStringLiteral("optional");
    case SourceCol:
      if (r.source == MappingRow::Source::Column)
        return r.column;
      if (r.source == MappingRow::Source::NotImported)
        return notImported();
      return r.description;
    case ValueCol: {
      if (r.source != MappingRow::Source::Column || draft_->previewRows().isEmpty())
        return QString();
      const auto c = draft_->header().indexOf(r.column);
      const QStringList &first = draft_->previewRows().front();
      return c >= 0 && c < first.size() ? first.at(c) : QString();
    }
    case CheckCol:
      if (!hasFile)
        return QString();
      if (!r.missing.isEmpty())
        return QStringLiteral("⚠ not in the file: %1").arg(r.missing.join(QStringLiteral(", ")));
      if (problem)
        return QStringLiteral("⚠ required: pick a column");
      if (r.source == MappingRow::Source::NotImported || columnAbsent)
        return QStringLiteral("left empty");
      return QStringLiteral("ok");
    default: return {};
    }
  }
  if (role == Qt::ToolTipRole) {
    if (index.column() == SourceCol)
      return r.description;
    if (index.column() == FieldCol)
      return r.required ? QStringLiteral("%1 is required").arg(r.field)
                        : QStringLiteral("%1 may be left empty").arg(r.field);
  }
  if (role == Qt::FontRole && index.column() == FieldCol && r.required) {
    QFont f;
    f.setBold(true);
    return f;
  }
  if (role == Qt::ForegroundRole && index.column() == CheckCol && problem)
    return QBrush(problemColour());
  return {};
}

QVariant MappingModel::headerData(int section, Qt::Orientation o, int role) const {
  if (o != Qt::Horizontal || role != Qt::DisplayRole)
    return {};
  switch (section) {
  case FieldCol: return QStringLiteral("Field");
  case RequiredCol: return QStringLiteral("Needed");
  case SourceCol: return QStringLiteral("Read from (click to change)");
  case ValueCol: return QStringLiteral("First row");
  case CheckCol: return QStringLiteral("Check");
  default: return {};
  }
}

Qt::ItemFlags MappingModel::flags(const QModelIndex &index) const {
  Qt::ItemFlags f = QAbstractTableModel::flags(index);
  if (index.isValid() && index.column() == SourceCol && !draft_->header().isEmpty())
    f |= Qt::ItemIsEditable;
  return f;
}

bool MappingModel::setData(const QModelIndex &index, const QVariant &value, int role) {
  if (!index.isValid() || index.column() != SourceCol || role != Qt::EditRole)
    return false;
  const QString text = value.toString();
  const QString &field = rows_[static_cast<std::size_t>(index.row())].field;
  if (!draft_->setColumn(field, text == notImported() ? QString() : text))
    return false;
  rows_ = draft_->mapping();
  emit dataChanged(this->index(0, 0), this->index(rowCount() - 1, ColumnCount - 1));
  return true;
}

// ---- ImportLogModel ----

ImportLogModel::ImportLogModel(QObject *parent) : QAbstractTableModel(parent) {}

void ImportLogModel::setEntries(std::vector<cb::ImportLogEntry> entries) {
  beginResetModel();
  entries_ = std::move(entries);
  std::reverse(entries_.begin(), entries_.end());
  endResetModel();
}

int ImportLogModel::rowCount(const QModelIndex &parent) const {
  return parent.isValid() ? 0 : static_cast<int>(entries_.size());
}

int ImportLogModel::columnCount(const QModelIndex &parent) const {
  return parent.isValid() ? 0 : ColumnCount;
}

QVariant ImportLogModel::data(const QModelIndex &index, int role) const {
  if (!index.isValid())
    return {};
  const cb::ImportLogEntry &e = entries_[static_cast<std::size_t>(index.row())];
  const int c = index.column();
  const bool number = c >= ReadCol && c <= RejectedCol;
  const std::int64_t n = c == ReadCol        ? e.rowsRead
                         : c == AddedCol     ? e.added
                         : c == UpdatedCol   ? e.updated
                         : c == UnchangedCol ? e.unchanged
                                             : e.rejected;
  if (role == Qt::DisplayRole) {
    switch (c) {
    case WhenCol: {
      // "2026-12-02T07:31:39Z" → "2026-12-02 07:31 UTC"
      QString t = QString::fromStdString(e.startedAt);
      return t.size() >= 16 ? t.left(10) + QLatin1Char(' ') + t.mid(11, 5) + QStringLiteral(" UTC")
                            : t;
    }
    case FileCol: return QFileInfo(QString::fromStdString(e.file)).fileName();
    case KindCol: return QString::fromStdString(e.kind);
    case ProfileCol: {
      const QString p = QString::fromStdString(e.profile);
      return p.contains(QLatin1Char('/')) ? QFileInfo(p).fileName() : p;
    }
    case ModeCol: return QString::fromStdString(e.mode);
    case OutcomeCol:
      return e.outcome == "failed"      ? QStringLiteral("nothing written")
             : e.outcome == "cancelled" ? QStringLiteral("cancelled")
                                        : QStringLiteral("written");
    default: return number ? count(n) : QVariant();
    }
  }
  if (role == kCsvValueRole) {
    if (number)
      return QString::number(n);
    if (c == FileCol)
      return QString::fromStdString(e.file);
    if (c == ProfileCol)
      return QString::fromStdString(e.profile);
    if (c == WhenCol)
      return QString::fromStdString(e.startedAt);
    return {};
  }
  if (role == Qt::TextAlignmentRole && number)
    return QVariant((Qt::AlignRight | Qt::AlignVCenter).toInt());
  if (role == Qt::ToolTipRole) {
    if (c == FileCol)
      return QStringLiteral("%1\nSHA-256 %2")
          .arg(QString::fromStdString(e.file), QString::fromStdString(e.sha256));
    if (c == ProfileCol)
      return QString::fromStdString(e.profile);
    if (c == WhenCol)
      return QStringLiteral("started %1, finished %2")
          .arg(QString::fromStdString(e.startedAt), QString::fromStdString(e.finishedAt));
  }
  if (role == Qt::ForegroundRole && c == OutcomeCol && e.outcome == "failed")
    return QBrush(problemColour());
  return {};
}

QVariant ImportLogModel::headerData(int section, Qt::Orientation o, int role) const {
  if (o != Qt::Horizontal || role != Qt::DisplayRole)
    return {};
  static const char *names[] = {"When (UTC)", "File",    "Kind",      "Profile",  "Mode",   "Read",
                                "Added",      "Updated", "Unchanged", "Rejected", "Outcome"};
  return section >= 0 && section < ColumnCount ? QString::fromUtf8(names[section]) : QVariant();
}

std::vector<cb::ImportLogEntry> readImportLog(const std::filesystem::path &store) {
  return cb::Store::open(store)->importLog();
}

HealthCounts countBySeverity(const cb::Findings &findings) {
  HealthCounts c;
  for (const auto &f : findings)
    (f.severity == cb::Severity::Error     ? c.errors
     : f.severity == cb::Severity::Warning ? c.warnings
                                           : c.notes)++;
  return c;
}

QString healthCountsText(const HealthCounts &c) {
  if (c.total() == 0)
    return QStringLiteral("no findings");
  QStringList parts;
  auto add = [&](int n, const char *one, const char *many) {
    if (n > 0)
      parts << QStringLiteral("%1 %2").arg(n).arg(QString::fromLatin1(n == 1 ? one : many));
  };
  add(c.errors, "error", "errors");
  add(c.warnings, "warning", "warnings");
  add(c.notes, "note", "notes");
  return parts.join(QStringLiteral(", "));
}

} // namespace cbui
