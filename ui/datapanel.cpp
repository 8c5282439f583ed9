#include "ui/datapanel.h"

#include "core/finding.h"
#include "core/textformat.h"
#include "ui/dataimportmodel.h"
#include "ui/findingspanel.h"
#include "ui/importjob.h"
#include "ui/tableexport.h"
#include "ui/tablerows.h"

#include <QComboBox>
#include <QFileDialog>
#include <QFileInfo>
#include <QFutureWatcher>
#include <QGroupBox>
#include <QHBoxLayout>
#include <QHeaderView>
#include <QLabel>
#include <QLineEdit>
#include <QProgressBar>
#include <QPushButton>
#include <QSplitter>
#include <QStyledItemDelegate>
#include <QTableView>
#include <QTimer>
#include <QVBoxLayout>
#include <QtConcurrent/QtConcurrentRun>

#include <algorithm>
#include <memory>

namespace cbui {
namespace {

/// The Source cell of the mapping table: a combo of the header's columns.
class ColumnDelegate : public QStyledItemDelegate {
public:
  using QStyledItemDelegate::QStyledItemDelegate;
  QWidget *createEditor(QWidget *parent, const QStyleOptionViewItem &,
                        const QModelIndex &index) const override {
    auto *combo = new QComboBox(parent);
    if (const auto *m = dynamic_cast<const MappingModel *>(index.model()))
      combo->addItems(m->choices(index.row()));
    return combo;
  }
  void setEditorData(QWidget *editor, const QModelIndex &index) const override {
    auto *combo = static_cast<QComboBox *>(editor);
    const int i = combo->findText(index.data(Qt::EditRole).toString());
    combo->setCurrentIndex(std::max(i, 0));
    if (i < 0) // a derived source: nothing picked until the user picks a column
      combo->setCurrentIndex(-1);
  }
  void setModelData(QWidget *editor, QAbstractItemModel *model,
                    const QModelIndex &index) const override {
    auto *combo = static_cast<QComboBox *>(editor);
    if (combo->currentIndex() >= 0)
      model->setData(index, combo->currentText(), Qt::EditRole);
  }
};

QString shippedLabel(const QString &name) {
  if (name == QStringLiteral("native"))
    return QStringLiteral("native (Curvebench CSV)");
  if (name == QStringLiteral("hotel-bookings-open-data"))
    return QStringLiteral("hotel-bookings-open-data (open dataset)");
  return name;
}

QGroupBox *group(const QString &title) {
  auto *g = new QGroupBox(title);
  QFont f = g->font();
  f.setBold(true);
  g->setFont(f);
  return g;
}

/// Group boxes make their children bold too; the content is set back to the normal font.
template <typename W> W *normal(W *w) {
  QFont f = w->font();
  f.setBold(false);
  w->setFont(f);
  return w;
}

} // namespace

struct DataPanel::Impl {
  ImportDraft draft;
  std::filesystem::path store;
  QString readOnly; ///< why the store cannot be written here; empty = writable
  FindingsPanel *findings = nullptr;
  QComboBox *kind = nullptr;
  QLineEdit *file = nullptr;
  QLabel *fileNote = nullptr;
  QComboBox *profile = nullptr;
  QLabel *profileNote = nullptr;
  QComboBox *delimiter = nullptr;
  QPushButton *autoMatch = nullptr, *saveProfile = nullptr, *openProfile = nullptr;
  QPushButton *choose = nullptr;
  PreviewModel *preview = nullptr;
  MappingModel *mapping = nullptr;
  QLabel *mappingNote = nullptr;
  QTableView *previewView = nullptr;
  QPushButton *validate = nullptr, *strict = nullptr, *lenient = nullptr, *cancel = nullptr;
  QProgressBar *progress = nullptr;
  QLabel *result = nullptr;
  QLabel *health = nullptr;
  QLabel *healthList = nullptr;
  QPushButton *showHealth = nullptr;
  QProgressBar *healthBusy = nullptr;
  ImportLogModel *log = nullptr;
  QTableView *logView = nullptr;
  QLabel *logNote = nullptr;
  std::shared_ptr<ImportControl> control;
  QFutureWatcher<ImportJobOutcome> *watcher = nullptr;
  QTimer *poll = nullptr;
};

DataPanel::DataPanel(QWidget *parent) : QWidget(parent), d_(new Impl) {
  d_->preview = new PreviewModel(&d_->draft, this);
  d_->mapping = new MappingModel(&d_->draft, this);
  d_->log = new ImportLogModel(this);

  // ---- Step 1: the file.
  auto *fileBox = group(QStringLiteral("1  Choose a file"));
  d_->kind = normal(new QComboBox);
  d_->kind->addItems({QStringLiteral("Reservations"), QStringLiteral("Group blocks")});
  d_->kind->setToolTip(QStringLiteral("What the file holds"));
  d_->file = normal(new QLineEdit);
  d_->file->setReadOnly(true);
  d_->file->setPlaceholderText(QStringLiteral("a CSV extract from your reservation system"));
  d_->choose = normal(new QPushButton(QStringLiteral("Choose file…")));
  d_->fileNote = normal(new QLabel);
  auto *fileRow = new QHBoxLayout;
  fileRow->addWidget(d_->kind);
  fileRow->addWidget(d_->file, 1);
  fileRow->addWidget(d_->choose);
  auto *fileLayout = new QVBoxLayout(fileBox);
  fileLayout->setContentsMargins(6, 4, 6, 4);
  fileLayout->addLayout(fileRow);

  // ---- Step 2: the columns.
  auto *mapBox = group(QStringLiteral("2  Map the columns"));
  d_->profile = normal(new QComboBox);
  d_->profile->setSizeAdjustPolicy(QComboBox::AdjustToContents);
  d_->profile->setToolTip(QStringLiteral(
      "The mapping to start from: a shipped profile or one saved next to the store"));
  d_->openProfile = normal(new QPushButton(QStringLiteral("Open…")));
  d_->openProfile->setToolTip(QStringLiteral("Start from a profile file kept elsewhere"));
  d_->delimiter = normal(new QComboBox);
  d_->delimiter->addItem(QStringLiteral("comma ,"), QStringLiteral(","));
  d_->delimiter->addItem(QStringLiteral("semicolon ;"), QStringLiteral(";"));
  d_->delimiter->addItem(QStringLiteral("tab"), QStringLiteral("\t"));
  d_->delimiter->addItem(QStringLiteral("pipe |"), QStringLiteral("|"));
  d_->autoMatch = normal(new QPushButton(QStringLiteral("Match by name")));
  d_->autoMatch->setToolTip(QStringLiteral(
      "Pick, for each field whose column the file lacks, a column of the same or a usual name"));
  d_->saveProfile = normal(new QPushButton(QStringLiteral("Save profile as…")));
  d_->saveProfile->setToolTip(QStringLiteral(
      "Save this mapping as a JSON profile (curvebench import --profile FILE reads it too)"));
  auto *profileRow = new QHBoxLayout;
  profileRow->addWidget(normal(new QLabel(QStringLiteral("Start from"))));
  profileRow->addWidget(d_->profile, 1);
  profileRow->addWidget(d_->openProfile);
  profileRow->addWidget(normal(new QLabel(QStringLiteral("Separator"))));
  profileRow->addWidget(d_->delimiter);
  profileRow->addWidget(d_->autoMatch);
  profileRow->addWidget(d_->saveProfile);
  d_->profileNote = normal(new QLabel);

  auto *previewView = normal(new QTableView);
  previewView->setModel(d_->preview);
  previewView->setObjectName(QStringLiteral("previewTable"));
  useCompactRows(previewView);
  previewView->horizontalHeader()->setDefaultSectionSize(96);
  auto *mappingView = normal(new QTableView);
  mappingView->setObjectName(QStringLiteral("mappingTable"));
  mappingView->setModel(d_->mapping);
  mappingView->setItemDelegateForColumn(MappingModel::SourceCol, new ColumnDelegate(mappingView));
  mappingView->setEditTriggers(QAbstractItemView::AllEditTriggers);
  mappingView->verticalHeader()->hide();
  useCompactRows(mappingView);
  mappingView->horizontalHeader()->setStretchLastSection(true);
  mappingView->setColumnWidth(MappingModel::FieldCol, 120);
  mappingView->setColumnWidth(MappingModel::RequiredCol, 64);
  mappingView->setColumnWidth(MappingModel::SourceCol, 250);
  mappingView->setColumnWidth(MappingModel::ValueCol, 110);
  d_->previewView = previewView;
  auto *previewPane = new QWidget;
  auto *pl = new QVBoxLayout(previewPane);
  pl->setContentsMargins(0, 0, 0, 0);
  pl->setSpacing(2);
  pl->addWidget(d_->fileNote);
  pl->addWidget(previewView);
  auto *mapPane = new QWidget;
  auto *ml = new QVBoxLayout(mapPane);
  ml->setContentsMargins(0, 0, 0, 0);
  ml->setSpacing(2);
  d_->mappingNote = normal(new QLabel);
  ml->addWidget(d_->mappingNote);
  ml->addWidget(mappingView);
  auto *split = new QSplitter(Qt::Vertical);
  split->addWidget(previewPane);
  split->addWidget(mapPane);
  split->setStretchFactor(0, 2);
  split->setStretchFactor(1, 5);
  auto *mapLayout = new QVBoxLayout(mapBox);
  mapLayout->setContentsMargins(6, 4, 6, 4);
  mapLayout->setSpacing(4);
  mapLayout->addLayout(profileRow);
  mapLayout->addWidget(d_->profileNote);
  mapLayout->addWidget(split, 1);

  // ---- Step 3: validate, commit.
  auto *runBox = group(QStringLiteral("3  Validate and commit"));
  d_->validate = normal(new QPushButton(QStringLiteral("Validate")));
  d_->validate->setToolTip(QStringLiteral(
      "Dry run: read, map and check every row, write nothing; findings go to the Findings list"));
  d_->strict = normal(new QPushButton(QStringLiteral("Commit strict")));
  d_->strict->setToolTip(
      QStringLiteral("Write the file in one transaction; any rejected row: nothing is written"));
  d_->lenient = normal(new QPushButton(QStringLiteral("Commit lenient")));
  d_->lenient->setToolTip(
      QStringLiteral("Write the valid rows in one transaction; the rejected ones are listed"));
  d_->cancel = normal(new QPushButton(QStringLiteral("Cancel")));
  d_->cancel->hide();
  d_->progress = normal(new QProgressBar);
  d_->progress->setMaximumWidth(180);
  d_->progress->hide();
  d_->result = normal(new QLabel);
  d_->result->setWordWrap(true);
  d_->result->setTextInteractionFlags(Qt::TextSelectableByMouse);
  auto *runRow = new QHBoxLayout;
  runRow->addWidget(d_->validate);
  runRow->addWidget(d_->strict);
  runRow->addWidget(d_->lenient);
  runRow->addWidget(d_->progress);
  runRow->addWidget(d_->cancel);
  runRow->addStretch(1);
  auto *runLayout = new QVBoxLayout(runBox);
  runLayout->setContentsMargins(6, 4, 6, 4);
  runLayout->addLayout(runRow);
  runLayout->addWidget(d_->result);

  auto *left = new QWidget;
  auto *leftLayout = new QVBoxLayout(left);
  leftLayout->setContentsMargins(0, 0, 0, 0);
  leftLayout->addWidget(fileBox);
  leftLayout->addWidget(mapBox, 1);

  // ---- Right: data health and the import log.
  auto *healthBox = group(QStringLiteral("Data health"));
  d_->health = normal(new QLabel(QStringLiteral("Checked once the store is open …")));
  d_->healthList = normal(new QLabel);
  d_->healthList->setWordWrap(true);
  d_->showHealth = normal(new QPushButton(QStringLiteral("Show in Findings")));
  d_->showHealth->setEnabled(false);
  d_->healthBusy = normal(new QProgressBar);
  d_->healthBusy->setRange(0, 0);
  d_->healthBusy->setMaximumWidth(120);
  d_->healthBusy->hide();
  auto *healthLayout = new QVBoxLayout(healthBox);
  healthLayout->setContentsMargins(6, 4, 6, 4);
  auto *healthRow = new QHBoxLayout;
  healthRow->addWidget(d_->health, 1);
  healthRow->addWidget(d_->healthBusy);
  healthRow->addWidget(d_->showHealth);
  healthLayout->addLayout(healthRow);
  healthLayout->addWidget(d_->healthList);

  auto *logBox = group(QStringLiteral("Import log"));
  auto *logView = normal(new QTableView);
  logView->setObjectName(QStringLiteral("importLogTable"));
  logView->setModel(d_->log);
  logView->verticalHeader()->hide();
  useCompactRows(logView);
  logView->setSelectionBehavior(QAbstractItemView::SelectRows);
  d_->logView = logView;
  auto *csv = normal(new QPushButton(QStringLiteral("Table CSV…")));
  auto *xlsx = normal(new QPushButton(QStringLiteral("XLSX…")));
  d_->logNote = normal(new QLabel);
  auto *logButtons = new QHBoxLayout;
  logButtons->addWidget(d_->logNote, 1);
  logButtons->addWidget(csv);
  logButtons->addWidget(xlsx);
  auto *logLayout = new QVBoxLayout(logBox);
  logLayout->setContentsMargins(6, 4, 6, 4);
  logLayout->addWidget(logView, 1);
  logLayout->addLayout(logButtons);

  auto *right = new QWidget;
  auto *rightLayout = new QVBoxLayout(right);
  rightLayout->setContentsMargins(0, 0, 0, 0);
  rightLayout->addWidget(runBox);
  rightLayout->addWidget(healthBox);
  rightLayout->addWidget(logBox, 1);

  auto *columns = new QSplitter(Qt::Horizontal);
  columns->addWidget(left);
  columns->addWidget(right);
  columns->setStretchFactor(0, 1);
  columns->setStretchFactor(1, 1);
  columns->setSizes({760, 600});
  auto *outer = new QVBoxLayout(this);
  outer->addWidget(columns);

  // ---- Wiring.
  connect(d_->choose, &QPushButton::clicked, this, [this] {
    const QString start =
        d_->store.empty() ? QString() : QString::fromStdString(d_->store.parent_path().string());
    const QString path =
        QFileDialog::getOpenFileName(this, QStringLiteral("Choose a file to import"), start,
                                     QStringLiteral("CSV files (*.csv *.txt);;All files (*)"));
    if (!path.isEmpty())
      chooseFile(path);
  });
  connect(d_->kind, &QComboBox::currentIndexChanged, this, [this](int k) {
    d_->draft.setKind(k == 1 ? ImportKind::Blocks : ImportKind::Reservations);
    refreshProfileChoices();
    const int matched = d_->draft.autoMatch();
    draftChanged(matched > 0 ? QStringLiteral("%1 columns matched by name").arg(matched)
                             : QString());
  });
  connect(d_->profile, &QComboBox::activated, this,
          [this](int i) { startFromProfile(d_->profile->itemData(i).toString()); });
  connect(d_->openProfile, &QPushButton::clicked, this, [this] {
    const QString path = QFileDialog::getOpenFileName(
        this, QStringLiteral("Open a mapping profile"),
        d_->store.empty() ? QString() : QString::fromStdString(d_->store.parent_path().string()),
        QStringLiteral("Mapping profiles (*.json)"));
    if (!path.isEmpty())
      startFromProfile(path);
  });
  connect(d_->delimiter, &QComboBox::activated, this, [this](int i) {
    const QString d = d_->delimiter->itemData(i).toString();
    d_->draft.setDelimiter(d.front());
    const int matched = d_->draft.autoMatch();
    draftChanged(matched > 0 ? QStringLiteral("%1 columns matched by name").arg(matched)
                             : QString());
  });
  connect(d_->autoMatch, &QPushButton::clicked, this, [this] {
    const int matched = d_->draft.autoMatch();
    draftChanged(matched > 0 ? QStringLiteral("%1 columns matched by name").arg(matched)
                             : QStringLiteral("No more columns match by name"));
  });
  connect(d_->saveProfile, &QPushButton::clicked, this, [this] {
    QString dir =
        d_->store.empty() ? QString() : QString::fromStdString(d_->store.parent_path().string());
    QString suggested = d_->draft.profileName();
    if (suggested == QStringLiteral("native") || suggested.isEmpty())
      suggested = QStringLiteral("my-extract");
    const QString path = QFileDialog::getSaveFileName(
        this, QStringLiteral("Save the mapping profile"),
        dir.isEmpty() ? suggested + QStringLiteral(".json")
                      : dir + QLatin1Char('/') + suggested + QStringLiteral(".json"),
        QStringLiteral("Mapping profiles (*.json)"));
    if (path.isEmpty())
      return;
    QString error;
    if (!d_->draft.saveProfile(path, &error)) {
      d_->result->setText(QStringLiteral("⚠ Profile not saved: %1").arg(error));
      return;
    }
    refreshProfileChoices();
    draftChanged(QStringLiteral("Saved %1").arg(path));
  });
  // Queued: the mapping table's editor is still committing when its model says it changed.
  connect(
      d_->mapping, &QAbstractItemModel::dataChanged, this, [this] { draftChanged({}); },
      Qt::QueuedConnection);
  connect(d_->validate, &QPushButton::clicked, this, &DataPanel::validate);
  connect(d_->strict, &QPushButton::clicked, this, [this] { commit(false); });
  connect(d_->lenient, &QPushButton::clicked, this, [this] { commit(true); });
  connect(d_->cancel, &QPushButton::clicked, this, &DataPanel::cancel);
  connect(d_->showHealth, &QPushButton::clicked, this, &DataPanel::findingsRequested);
  connect(csv, &QPushButton::clicked, this, [this] {
    const QString done =
        saveTableAs(this, *d_->log, QStringLiteral("import-log"), TableFormat::Csv);
    if (!done.isEmpty())
      d_->logNote->setText(done);
  });
  connect(xlsx, &QPushButton::clicked, this, [this] {
    const QString done =
        saveTableAs(this, *d_->log, QStringLiteral("import-log"), TableFormat::Xlsx);
    if (!done.isEmpty())
      d_->logNote->setText(done);
  });

  refreshProfileChoices();
  draftChanged({});
}

DataPanel::~DataPanel() {
  if (d_->watcher) {
    if (d_->control)
      d_->control->cancel = true;
    d_->watcher->waitForFinished();
  }
  delete d_;
}

ImportDraft &DataPanel::draft() { return d_->draft; }
MappingModel *DataPanel::mappingModel() const { return d_->mapping; }
ImportLogModel *DataPanel::importLogModel() const { return d_->log; }
QString DataPanel::resultText() const { return d_->result->text(); }
QString DataPanel::healthText() const { return d_->health->text(); }
bool DataPanel::busy() const { return d_->watcher != nullptr; }

void DataPanel::setStore(const std::filesystem::path &store) {
  // The window checks the data's health after every load and passes the findings on.
  d_->health->setText(QStringLiteral("Checking the data's health …"));
  d_->healthList->clear();
  d_->healthBusy->show();
  d_->showHealth->setEnabled(false);
  d_->store = store;
  d_->result->clear();
  reloadLog();
  refreshProfileChoices();
  draftChanged({});
}

void DataPanel::setFindingsPanel(FindingsPanel *panel) { d_->findings = panel; }

void DataPanel::setHealthFindings(const std::vector<cb::Finding> &findings) {
  const HealthCounts c = countBySeverity(findings);
  d_->healthBusy->hide();
  d_->health->setText(QStringLiteral("%1: %2").arg(
      QString::fromStdString(d_->store.filename().string()), healthCountsText(c)));
  QStringList shown;
  for (std::size_t i = 0; i < findings.size() && i < 4; ++i)
    shown << QStringLiteral("• %1").arg(QString::fromStdString(findings[i].message));
  if (findings.size() > 4)
    shown << QStringLiteral("… and %1 more in Findings").arg(findings.size() - 4);
  d_->healthList->setText(shown.join(QLatin1Char('\n')));
  d_->showHealth->setEnabled(!findings.empty());
}

void DataPanel::reloadLog() {
  if (d_->store.empty())
    return;
  try {
    d_->log->setEntries(readImportLog(d_->store));
    d_->logNote->setText(d_->log->rowCount() == 1
                             ? QStringLiteral("1 import, newest first")
                             : QStringLiteral("%1 imports, newest first").arg(d_->log->rowCount()));
    d_->logView->resizeColumnsToContents();
  } catch (const std::exception &e) {
    d_->logNote->setText(
        QStringLiteral("Import log not read: %1").arg(QString::fromStdString(e.what())));
  }
}

void DataPanel::refreshProfileChoices() {
  const QString folder =
      d_->store.empty() ? QString() : QString::fromStdString(d_->store.parent_path().string());
  QSignalBlocker block(d_->profile);
  d_->profile->clear();
  QStringList choices = ImportDraft::profileChoices(d_->draft.kind(), folder);
  const QString current = d_->draft.profileSource();
  if (!choices.contains(current))
    choices << current; // a profile opened from elsewhere
  for (const QString &c : choices)
    d_->profile->addItem(c.contains(QLatin1Char('/'))
                             ? QFileInfo(c).fileName() + QStringLiteral(" (saved)")
                             : shippedLabel(c),
                         c);
  d_->profile->setCurrentIndex(static_cast<int>(choices.indexOf(current)));
}

void DataPanel::setKind(int kind) { d_->kind->setCurrentIndex(kind); }

bool DataPanel::chooseFile(const QString &path) {
  const bool ok = d_->draft.setFile(path);
  d_->file->setText(path);
  const int matched = d_->draft.autoMatch();
  draftChanged(matched > 0 ? QStringLiteral("%1 columns matched by name").arg(matched) : QString());
  if (d_->findings) {
    d_->findings->setFindings(QStringLiteral("import"),
                              QStringLiteral("Reading %1").arg(QFileInfo(path).fileName()),
                              d_->draft.previewFindings());
    if (!ok)
      emit findingsRequested();
  }
  return ok;
}

bool DataPanel::startFromProfile(const QString &nameOrPath) {
  QString error;
  if (!d_->draft.startFrom(nameOrPath, &error)) {
    d_->result->setText(QStringLiteral("⚠ %1").arg(error));
    refreshProfileChoices();
    return false;
  }
  refreshProfileChoices();
  const int matched = d_->draft.autoMatch();
  draftChanged(matched > 0 ? QStringLiteral("%1 columns matched by name").arg(matched) : QString());
  return true;
}

void DataPanel::draftChanged(const QString &note) {
  const ImportDraft &dr = d_->draft;
  d_->preview->refresh();
  d_->previewView->resizeColumnsToContents();
  for (int c = 0; c < d_->preview->columnCount(); ++c)
    d_->previewView->setColumnWidth(c, std::min(d_->previewView->columnWidth(c), 220));
  d_->mapping->refresh();
  {
    QSignalBlocker block(d_->delimiter);
    const int i = d_->delimiter->findData(QString(dr.delimiter()));
    d_->delimiter->setCurrentIndex(std::max(i, 0));
  }
  // Step 1's note: what was read.
  if (dr.file().isEmpty())
    d_->fileNote->setText(QStringLiteral("Choose a CSV file; its first rows are shown below "
                                         "before anything is written."));
  else if (!dr.previewFindings().empty())
    d_->fileNote->setText(QStringLiteral("⚠ %1").arg(
        QString::fromStdString(dr.previewFindings().front().toString())));
  else
    d_->fileNote->setText(QStringLiteral("The file's first %1 rows as read (%2 columns)")
                              .arg(dr.previewRows().size())
                              .arg(dr.header().size()));
  d_->profileNote->setText(
      QStringLiteral("Mapping: profile “%1”%2%3")
          .arg(dr.profileName(),
               dr.edited() ? QStringLiteral(", changed here and not saved") : QString(),
               note.isEmpty() ? QString() : QStringLiteral(" · ") + note));
  const QStringList missing = dr.unmapped();
  if (dr.header().isEmpty())
    d_->mappingNote->setText(QStringLiteral("Fields of Curvebench (bold = required) and where "
                                            "each is read from"));
  else if (missing.isEmpty())
    d_->mappingNote->setText(
        QStringLiteral("Every required field is found in the file. Next: Validate."));
  else
    d_->mappingNote->setText(QStringLiteral("⚠ Not found in the file: %1 — pick their columns "
                                            "below")
                                 .arg(missing.join(QStringLiteral(", "))));
  const bool idle = d_->watcher == nullptr;
  const bool canRun = idle && !d_->store.empty() && !dr.file().isEmpty();
  d_->validate->setEnabled(canRun);
  d_->strict->setEnabled(canRun && dr.ready() && d_->readOnly.isEmpty());
  d_->lenient->setEnabled(canRun && dr.ready() && d_->readOnly.isEmpty());
  for (QPushButton *b : {d_->strict, d_->lenient})
    b->setToolTip(d_->readOnly.isEmpty() ? QString()
                                         : QStringLiteral("Read-only: %1").arg(d_->readOnly));
  d_->saveProfile->setEnabled(idle);
  d_->choose->setEnabled(idle);
  if (d_->store.empty())
    d_->result->setText(QStringLiteral("Open a store first: imports go into the open store."));
  else if (dr.file().isEmpty())
    d_->result->setText(QStringLiteral("Choose a file, check where each field is read from, then "
                                       "Validate: nothing is written until you commit."));
}

void DataPanel::validate() { startJob(true, true); }

void DataPanel::commit(bool lenient) { startJob(false, lenient); }

void DataPanel::cancel() {
  if (d_->control)
    d_->control->cancel = true;
}

void DataPanel::setReadOnly(bool readOnly, const QString &reason) {
  d_->readOnly = readOnly ? (reason.isEmpty() ? QStringLiteral("read-only") : reason) : QString();
  draftChanged({});
}

void DataPanel::startJob(bool dryRun, bool lenient) {
  if (d_->watcher || d_->store.empty() || d_->draft.file().isEmpty())
    return;
  if (!dryRun && !d_->readOnly.isEmpty()) {
    d_->result->setText(QStringLiteral("Not written: %1").arg(d_->readOnly));
    return;
  }
  // A validation reads every row as a lenient import would (so the counts cover the good rows
  // too) and writes nothing.
  const cb::ImportOptions options =
      d_->draft.importOptions(lenient ? cb::ImportMode::Lenient : cb::ImportMode::Strict, dryRun);
  const ImportKind kind = d_->draft.kind();
  const std::filesystem::path store = d_->store;
  const std::filesystem::path file(d_->draft.file().toStdString());
  const QString name = QFileInfo(d_->draft.file()).fileName();
  d_->control = std::make_shared<ImportControl>();
  d_->progress->setRange(0, 0);
  d_->progress->show();
  d_->cancel->show();
  d_->result->setText(
      dryRun ? QStringLiteral("Validating %1 …").arg(name)
             : QStringLiteral("Importing %1 (%2) …")
                   .arg(name, lenient ? QStringLiteral("lenient") : QStringLiteral("strict")));
  d_->poll = new QTimer(this);
  connect(d_->poll, &QTimer::timeout, this, [this, control = d_->control] {
    const auto total = control->total.load(), done = control->done.load();
    if (total > 0) {
      d_->progress->setRange(0, 1000);
      d_->progress->setValue(static_cast<int>(std::min<std::int64_t>(1000, done * 1000 / total)));
    }
  });
  d_->poll->start(100);
  d_->watcher = new QFutureWatcher<ImportJobOutcome>(this);
  connect(
      d_->watcher, &QFutureWatcher<ImportJobOutcome>::finished, this,
      [this, name, dryRun, lenient] {
        const ImportJobOutcome o = d_->watcher->result();
        d_->watcher->deleteLater();
        d_->watcher = nullptr;
        d_->poll->deleteLater();
        d_->poll = nullptr;
        d_->control.reset();
        d_->progress->hide();
        d_->cancel->hide();
        const cb::ImportReport &r = o.report;
        QString text = o.summary;
        if (dryRun && !r.cancelled && r.log.rejected > 0)
          text +=
              QStringLiteral(". Commit strict would write nothing; commit lenient writes the %1 "
                             "good rows")
                  .arg(QString::fromStdString(cb::formatCount(r.log.rowsRead - r.log.rejected)));
        else if (dryRun && !r.cancelled && !cb::hasErrors(r.findings))
          text += QStringLiteral(". Ready to commit");
        else if (!dryRun && !lenient && !r.written && r.log.rejected > 0)
          text +=
              QStringLiteral(" (strict: any rejected row writes nothing; fix the rows or commit "
                             "lenient)");
        d_->result->setText(r.written || (dryRun && !cb::hasErrors(r.findings))
                                ? text
                                : QStringLiteral("⚠ ") + text);
        if (d_->findings) {
          d_->findings->setFindings(
              QStringLiteral("import"),
              QStringLiteral("%1 of %2: %3 finding(s)")
                  .arg(dryRun ? QStringLiteral("Validation") : QStringLiteral("Import"), name)
                  .arg(r.findings.size()),
              r.findings);
          if (!r.findings.empty())
            emit findingsRequested();
        }
        reloadLog();
        draftChanged({});
        emit jobFinished(r.written);
        if (r.written)
          emit storeWritten();
      });
  draftChanged({}); // buttons off while it runs
  auto control = d_->control;
  d_->watcher->setFuture(QtConcurrent::run([store, file, kind, options, control] {
    return runImportJob(store, file, kind, options, control.get());
  }));
}

} // namespace cbui
