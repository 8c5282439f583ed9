#include "ui/horizonpanel.h"

#include "core/advice.h"
#include "ui/horizonchart.h"
#include "ui/horizonmodel.h"
#include "ui/tableexport.h"
#include "ui/tablerows.h"
#include "ui/workbenchsession.h"

#include <QComboBox>
#include <QFileDialog>
#include <QFontMetrics>
#include <QFutureWatcher>
#include <QHBoxLayout>
#include <QHeaderView>
#include <QLabel>
#include <QLocale>
#include <QProgressBar>
#include <QPushButton>
#include <QSettings>
#include <QShortcut>
#include <QSortFilterProxyModel>
#include <QSpinBox>
#include <QSplitter>
#include <QTableView>
#include <QTimer>
#include <QVBoxLayout>
#include <QtConcurrent/QtConcurrentRun>

#include <algorithm>
#include <memory>
#include <variant>

namespace cbui {
namespace {

using Result = std::variant<HorizonData, QString>;
constexpr int kPresets[] = {30, 60, 90};

QSettings settings() {
  return QSettings(QStringLiteral("Curvebench"), QStringLiteral("curvebench"));
}

} // namespace

struct HorizonPanel::Impl {
  WorkbenchSession *session = nullptr;
  QComboBox *lengthCombo = new QComboBox;
  QSpinBox *daysSpin = new QSpinBox;
  QComboBox *segmentCombo = new QComboBox;
  QLabel *status = new QLabel;
  QProgressBar *busy = new QProgressBar;
  HorizonChart *chart = new HorizonChart;
  QTableView *table = new QTableView;
  HorizonModel *model = nullptr;
  QSortFilterProxyModel *proxy = nullptr;
  QTimer *debounce = nullptr;
  int generation = 0;
  // The last cubes the forecasts read, for the hotel and by segment, and the data they came
  // from: a segment picked at the same reading date reads the cube by segment instead of
  // building it again (about half of a segment's refresh at a million reservations).
  std::shared_ptr<const void> cubeData;
  std::shared_ptr<const cb::CurveCube> totalCube, segmentCube;
};

HorizonPanel::HorizonPanel(QWidget *parent) : QWidget(parent), d_(new Impl) {
  d_->model = new HorizonModel(this);
  d_->proxy = new QSortFilterProxyModel(this);
  d_->proxy->setSourceModel(d_->model);
  d_->proxy->setSortRole(HorizonModel::kSortRole);
  d_->debounce = new QTimer(this);
  d_->debounce->setSingleShot(true);
  d_->debounce->setInterval(250);
  d_->debounce->setObjectName(QStringLiteral("horizonInputPause"));

  d_->lengthCombo->setObjectName(QStringLiteral("horizonLength"));
  d_->daysSpin->setObjectName(QStringLiteral("horizonDays"));
  d_->segmentCombo->setObjectName(QStringLiteral("horizonSegment"));
  d_->table->setObjectName(QStringLiteral("horizonTable"));
  d_->status->setObjectName(QStringLiteral("horizonStatus"));
  d_->chart->setObjectName(QStringLiteral("horizonChart"));

  for (int n : kPresets)
    d_->lengthCombo->addItem(QStringLiteral("Next %1 nights").arg(n), n);
  d_->lengthCombo->addItem(QStringLiteral("Custom"), 0);
  d_->daysSpin->setRange(1, 365);
  d_->daysSpin->setSuffix(QStringLiteral(" nights"));
  d_->daysSpin->setToolTip(QStringLiteral("Number of nights from the day after the reading date"));
  const int days = settings().value(QStringLiteral("horizon/days"), 90).toInt();
  d_->daysSpin->setValue(days);
  const int preset = d_->lengthCombo->findData(days);
  d_->lengthCombo->setCurrentIndex(preset >= 0 ? preset : d_->lengthCombo->count() - 1);
  d_->segmentCombo->setSizeAdjustPolicy(QComboBox::AdjustToContents);
  d_->segmentCombo->addItem(QStringLiteral("Hotel total"), QString());
  d_->busy->setRange(0, 0);
  d_->busy->setMaximumWidth(120);
  d_->busy->setMaximumHeight(14);
  d_->busy->hide();

  auto *controls = new QHBoxLayout;
  controls->addWidget(new QLabel(QStringLiteral("Show")));
  controls->addWidget(d_->lengthCombo);
  controls->addWidget(d_->daysSpin);
  controls->addSpacing(12);
  controls->addWidget(new QLabel(QStringLiteral("Segment")));
  controls->addWidget(d_->segmentCombo);
  controls->addSpacing(12);
  controls->addWidget(d_->busy);
  controls->addWidget(d_->status, 1);
  auto *exportTable = new QPushButton(QStringLiteral("Table CSV…"));
  auto *exportChart = new QPushButton(QStringLiteral("Chart PNG/PDF…"));
  auto *exportXlsx = new QPushButton(QStringLiteral("XLSX…"));
  exportXlsx->setToolTip(QStringLiteral("Save the table as an Excel workbook"));
  controls->addWidget(exportTable);
  controls->addWidget(exportXlsx);
  controls->addWidget(exportChart);
  connect(exportTable, &QPushButton::clicked, this, [this] {
    const QString done = saveTableAs(this, *d_->model, QStringLiteral("horizon"), TableFormat::Csv,
                                     d_->model->toCsv());
    if (!done.isEmpty())
      d_->status->setText(done);
  });
  connect(exportXlsx, &QPushButton::clicked, this, [this] {
    const QString done =
        saveTableAs(this, *d_->model, QStringLiteral("horizon"), TableFormat::Xlsx);
    if (!done.isEmpty())
      d_->status->setText(done);
  });
  connect(exportChart, &QPushButton::clicked, this, [this] {
    const QString file = QFileDialog::getSaveFileName(
        this, QStringLiteral("Save the Horizon chart"), QStringLiteral("horizon.png"),
        QStringLiteral("PNG image (*.png);;PDF document (*.pdf)"));
    if (file.isEmpty())
      return;
    d_->status->setText(d_->chart->exportTo(file) ? QStringLiteral("Saved %1").arg(file)
                                                  : QStringLiteral("Could not write %1").arg(file));
  });

  d_->table->setModel(d_->proxy);
  d_->table->setSortingEnabled(true);
  d_->table->sortByColumn(HorizonModel::Night, Qt::AscendingOrder);
  d_->table->setSelectionBehavior(QAbstractItemView::SelectRows);
  d_->table->setSelectionMode(QAbstractItemView::SingleSelection);
  d_->table->setAlternatingRowColors(true);
  d_->table->setEditTriggers(QAbstractItemView::NoEditTriggers);
  d_->table->verticalHeader()->hide();
  useCompactRows(d_->table);
  d_->table->horizontalHeader()->setStretchLastSection(true);
  d_->table->horizontalHeader()->setStyleSheet(
      QStringLiteral("QHeaderView::section { padding: 2px 4px; }"));
  d_->table->setWordWrap(false);

  auto *caution = new QLabel(QString::fromUtf8(
      cb::kAdvisoryCaution.data(), static_cast<qsizetype>(cb::kAdvisoryCaution.size())));
  caution->setObjectName(QStringLiteral("horizonCaution"));
  caution->setWordWrap(true);
  QFont small = caution->font();
  small.setPointSizeF(small.pointSizeF() * 0.9);
  caution->setFont(small);
  caution->setStyleSheet(QStringLiteral("color: #555;"));

  auto *split = new QSplitter(Qt::Vertical);
  split->addWidget(d_->chart);
  split->addWidget(d_->table);
  split->setStretchFactor(0, 1);
  split->setStretchFactor(1, 3);

  auto *layout = new QVBoxLayout(this);
  layout->addLayout(controls);
  layout->addWidget(split, 1);
  layout->addWidget(caution);

  auto activate = [this](const QModelIndex &index) {
    if (index.isValid())
      emit nightActivated(index.data(HorizonModel::kNightRole).toDate());
  };
  connect(d_->table, &QTableView::doubleClicked, this, activate);
  for (int key : {Qt::Key_Return, Qt::Key_Enter}) {
    auto *enter = new QShortcut(QKeySequence(key), d_->table);
    enter->setContext(Qt::WidgetShortcut);
    connect(enter, &QShortcut::activated, this,
            [this, activate] { activate(d_->table->currentIndex()); });
  }
  connect(d_->lengthCombo, &QComboBox::currentIndexChanged, this, [this] {
    const int n = d_->lengthCombo->currentData().toInt();
    if (n > 0)
      d_->daysSpin->setValue(n);
    else
      d_->daysSpin->setFocus();
  });
  connect(d_->daysSpin, &QSpinBox::valueChanged, this, [this](int n) {
    const int match = d_->lengthCombo->findData(n);
    QSignalBlocker block(d_->lengthCombo);
    d_->lengthCombo->setCurrentIndex(match >= 0 ? match : d_->lengthCombo->count() - 1);
    settings().setValue(QStringLiteral("horizon/days"), n);
    d_->debounce->start();
  });
  connect(d_->segmentCombo, &QComboBox::currentIndexChanged, this,
          [this] { d_->debounce->start(); });
  connect(d_->debounce, &QTimer::timeout, this, [this] { setSession(d_->session); });
}

// Column widths from the texts (header and cells), tighter than the view's own sizing, so the
// fourteen columns fit 1366 pixels; the night column stops short of long event notes (they are
// in its tooltip).
void HorizonPanel::fitColumns() {
  const QFontMetrics fm = d_->table->fontMetrics();
  const int nightCap = fm.horizontalAdvance(QStringLiteral("Wed 30 Sep 2026  ★ Trade fair"));
  for (int c = 0; c < HorizonModel::ColumnCount; ++c) {
    int w = fm.horizontalAdvance(d_->model->headerData(c, Qt::Horizontal).toString()) + 22;
    for (int r = 0; r < d_->model->rowCount(); ++r)
      w = std::max(w, fm.horizontalAdvance(d_->model->index(r, c).data().toString()) + 12);
    d_->table->setColumnWidth(c, c == HorizonModel::Night ? std::min(w, nightCap) : w);
  }
}

HorizonPanel::~HorizonPanel() { delete d_; }

void HorizonPanel::setSession(WorkbenchSession *session) {
  const bool newSession = session != d_->session;
  d_->session = session;
  d_->debounce->stop();
  const int generation = ++d_->generation;
  if (!session || d_->cubeData != session->dataIdentity()) {
    d_->cubeData = session ? session->dataIdentity() : nullptr;
    d_->totalCube.reset();
    d_->segmentCube.reset();
  }
  if (!session) {
    d_->model->setData({});
    d_->chart->showHorizon({});
    d_->busy->hide();
    d_->status->clear();
    return;
  }
  if (newSession || d_->segmentCombo->count() != static_cast<int>(session->segments().size()) + 1) {
    const QString keep = d_->segmentCombo->currentData().toString();
    QSignalBlocker block(d_->segmentCombo);
    d_->segmentCombo->clear();
    d_->segmentCombo->addItem(QStringLiteral("Hotel total"), QString());
    for (const auto &s : session->segments()) {
      const QString code = QString::fromStdString(s.code);
      d_->segmentCombo->addItem(
          s.name.empty() ? code
                         : QStringLiteral("%1 (%2)").arg(QString::fromStdString(s.name), code),
          code);
    }
    d_->segmentCombo->setCurrentIndex(std::max(0, d_->segmentCombo->findData(keep)));
  }
  const int days = d_->daysSpin->value();
  const std::string segment = d_->segmentCombo->currentData().toString().toStdString();
  d_->busy->show();
  d_->status->setText(QStringLiteral("Computing the outlook for %1 nights …").arg(days));
  // The background job works on its own copy, so the window may change the session meanwhile.
  auto copy = std::make_shared<const WorkbenchSession>(*session);
  auto *watcher = new QFutureWatcher<Result>(this);
  connect(watcher, &QFutureWatcher<Result>::finished, this, [this, watcher, generation] {
    Result r = watcher->result();
    watcher->deleteLater();
    if (generation != d_->generation)
      return; // a newer request is on its way
    d_->busy->hide();
    if (const auto *msg = std::get_if<QString>(&r)) {
      d_->model->setData({});
      d_->chart->showHorizon({});
      d_->status->setText(QStringLiteral("No outlook: %1").arg(*msg));
      return;
    }
    auto &result = std::get<HorizonData>(r);
    if (result.cube) {
      // The cube of the later reading date is kept while it can give this one's: moving the
      // reading date back narrows it (CurveCube::narrowed), moving forward to it reads it as is.
      auto &kept = result.segment.isEmpty() ? d_->totalCube : d_->segmentCube;
      if (!kept || kept->asOf() <= result.cube->asOf() ||
          !kept->canNarrowTo(result.cube->options()))
        kept = result.cube;
    }
    d_->chart->showHorizon(result);
    QString what = QStringLiteral("As of %1 · %2 nights · forecast method %3")
                       .arg(QLocale().toString(result.asOf, QStringLiteral("ddd d MMM yyyy")))
                       .arg(result.rows.size())
                       .arg(result.method);
    if (!result.segment.isEmpty())
      what += QStringLiteral(" · segment %1: occupancy, ADR, sell-out and flags are hotel-level, "
                             "see Hotel total")
                  .arg(result.segment);
    d_->status->setText(what);
    d_->model->setData(std::move(result));
    fitColumns();
    emit outlookShown();
  });
  auto cube = segment.empty() ? d_->totalCube : d_->segmentCube;
  watcher->setFuture(QtConcurrent::run([copy, days, segment, cube]() -> Result {
    try {
      return computeHorizon(*copy, days, segment, cube);
    } catch (const std::exception &e) {
      return QString::fromStdString(e.what());
    }
  }));
}

} // namespace cbui
