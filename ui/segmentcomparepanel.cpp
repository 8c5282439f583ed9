// Segment Compare's panel: see segmentcomparepanel.h.
#include "ui/segmentcomparepanel.h"

#include "ui/csvexport.h"
#include "ui/segmentcomparechart.h"
#include "ui/segmentcomparemodel.h"
#include "ui/tableexport.h"
#include "ui/tablerows.h"
#include "ui/workbenchsession.h"

#include <QCheckBox>
#include <QComboBox>
#include <QDateEdit>
#include <QFileDialog>
#include <QFileInfo>
#include <QFutureWatcher>
#include <QGridLayout>
#include <QHBoxLayout>
#include <QHeaderView>
#include <QLabel>
#include <QListWidget>
#include <QLocale>
#include <QMenu>
#include <QPixmap>
#include <QProgressBar>
#include <QPushButton>
#include <QSpinBox>
#include <QTableView>
#include <QTimer>
#include <QVBoxLayout>
#include <QtConcurrent/QtConcurrentRun>

#include <memory>
#include <optional>
#include <variant>

namespace cbui {
namespace {

using Result = std::variant<SegmentCompareData, QString>;
const QString kDateFormat = QStringLiteral("ddd d MMM yyyy");

cb::Date fromQDate(const QDate &d) {
  return cb::Date::fromYmd(d.year(), static_cast<unsigned>(d.month()),
                           static_cast<unsigned>(d.day()));
}
QDate toQDate(cb::Date d) {
  return QDate(d.year(), static_cast<int>(d.month()), static_cast<int>(d.day()));
}

QPixmap swatch(const QColor &c) {
  QPixmap p(12, 12);
  p.fill(c);
  return p;
}

} // namespace

struct SegmentComparePanel::Impl {
  WorkbenchSession *session = nullptr;
  QDateEdit *from = new QDateEdit;
  QDateEdit *to = new QDateEdit;
  QSpinBox *maxDba = new QSpinBox;
  QComboBox *unit = new QComboBox;
  QCheckBox *lastYear = new QCheckBox(QStringLiteral("Last year"));
  QListWidget *segments = new QListWidget;
  QLabel *status = new QLabel;
  QProgressBar *busy = new QProgressBar;
  SegmentCompareChart *curves = new SegmentCompareChart(SegmentCompareChart::Curves);
  SegmentCompareChart *window = new SegmentCompareChart(SegmentCompareChart::Window);
  SegmentCompareChart *rate = new SegmentCompareChart(SegmentCompareChart::Rate);
  QTableView *table = new QTableView;
  SegmentCompareTable *model = nullptr;
  QTimer *debounce = nullptr;
  std::optional<SegmentCompareData> data;
  QString what; ///< the status line of the data on screen
  int generation = 0;
};

SegmentComparePanel::SegmentComparePanel(QWidget *parent) : QWidget(parent), d_(new Impl) {
  d_->model = new SegmentCompareTable(this);
  d_->debounce = new QTimer(this);
  d_->debounce->setSingleShot(true);
  d_->debounce->setInterval(250);
  d_->from->setObjectName(QStringLiteral("compareFrom"));
  d_->to->setObjectName(QStringLiteral("compareTo"));
  d_->unit->setObjectName(QStringLiteral("compareUnit"));
  d_->segments->setObjectName(QStringLiteral("compareSegments"));
  d_->status->setObjectName(QStringLiteral("compareStatus"));
  d_->table->setObjectName(QStringLiteral("compareTable"));
  d_->curves->setObjectName(QStringLiteral("compareCurves"));
  d_->window->setObjectName(QStringLiteral("compareWindow"));
  d_->rate->setObjectName(QStringLiteral("compareRate"));

  for (QDateEdit *e : {d_->from, d_->to}) {
    e->setDisplayFormat(kDateFormat);
    e->setCalendarPopup(true);
  }
  d_->from->setToolTip(QStringLiteral("First night of the period (one night: the same date in "
                                      "both fields)"));
  d_->to->setToolTip(QStringLiteral("Last night of the period (at most 92 nights); curves are "
                                    "averages per night"));
  d_->maxDba->setRange(7, 365);
  d_->maxDba->setValue(90);
  d_->maxDba->setSuffix(QStringLiteral(" days"));
  d_->maxDba->setToolTip(QStringLiteral("How far before arrival the curves start"));
  d_->unit->addItem(QStringLiteral("Rooms"));
  d_->unit->addItem(QStringLiteral("% of final"));
  d_->unit->setToolTip(QStringLiteral("Rooms on the books, or their share of the final (OTB on "
                                      "the night): shapes compare across segments of any size"));
  d_->lastYear->setChecked(true);
  d_->lastYear->setToolTip(QStringLiteral("Last year's comparable nights (the property's STLY "
                                          "alignment and event pairs), dashed"));
  d_->segments->setFixedWidth(268);
  d_->segments->setToolTip(QStringLiteral("Segments to draw; their colours are the lines'"));
  // The status may be long: it must not widen the window past 1366 pixels (full text as tooltip).
  d_->status->setSizePolicy(QSizePolicy::Ignored, QSizePolicy::Preferred);
  d_->busy->setRange(0, 0);
  d_->busy->setMaximumWidth(100);
  d_->busy->setMaximumHeight(14);
  d_->busy->hide();

  auto *controls = new QHBoxLayout;
  controls->addWidget(new QLabel(QStringLiteral("Nights")));
  controls->addWidget(d_->from);
  controls->addWidget(new QLabel(QStringLiteral("to")));
  controls->addWidget(d_->to);
  controls->addSpacing(8);
  controls->addWidget(new QLabel(QStringLiteral("From")));
  controls->addWidget(d_->maxDba);
  controls->addWidget(new QLabel(QStringLiteral("out")));
  controls->addSpacing(8);
  controls->addWidget(d_->unit);
  controls->addWidget(d_->lastYear);
  controls->addWidget(d_->busy);
  controls->addWidget(d_->status, 1);
  auto *exportTable = new QPushButton(QStringLiteral("Table CSV…"));
  auto *exportXlsx = new QPushButton(QStringLiteral("XLSX…"));
  exportXlsx->setToolTip(QStringLiteral("Save the this-year-vs-last-year table as an Excel "
                                        "workbook"));
  auto *exportCharts = new QPushButton(QStringLiteral("Charts PNG/PDF…"));
  exportTable->setToolTip(QStringLiteral("Save the this-year-vs-last-year table as CSV"));
  exportCharts->setToolTip(QStringLiteral("Save the three charts (name-curves, name-window, "
                                          "name-rate); right-click a chart to save it alone"));
  controls->addWidget(exportTable);
  controls->addWidget(exportXlsx);
  controls->addWidget(exportCharts);

  d_->table->setModel(d_->model);
  d_->table->verticalHeader()->hide();
  d_->table->setEditTriggers(QAbstractItemView::NoEditTriggers);
  d_->table->setSelectionMode(QAbstractItemView::NoSelection);
  d_->table->horizontalHeader()->setSectionResizeMode(QHeaderView::ResizeToContents);
  // The segment column takes the room the figures leave; long names elide (full name in the
  // tooltip) so every figure column fits at 1366 px.
  d_->table->horizontalHeader()->setSectionResizeMode(SegmentCompareTable::Segment,
                                                      QHeaderView::Stretch);
  d_->table->setWordWrap(false);
  // Elided in the middle, a long name keeps its code at the end: "Advance pu…(ADV)".
  d_->table->setTextElideMode(Qt::ElideMiddle);
  useCompactRows(d_->table);

  auto *grid = new QGridLayout;
  grid->addWidget(d_->curves, 0, 0);
  grid->addWidget(d_->table, 0, 1);
  grid->addWidget(d_->window, 1, 0);
  grid->addWidget(d_->rate, 1, 1);
  grid->setColumnStretch(0, 3);
  grid->setColumnStretch(1, 2);
  grid->setRowStretch(0, 3);
  grid->setRowStretch(1, 2);

  auto *left = new QVBoxLayout;
  left->addWidget(new QLabel(QStringLiteral("Segments")));
  left->addWidget(d_->segments, 1);
  auto *body = new QHBoxLayout;
  body->addLayout(left);
  body->addLayout(grid, 1);
  auto *layout = new QVBoxLayout(this);
  layout->addLayout(controls);
  layout->addLayout(body, 1);

  connect(d_->from, &QDateEdit::dateChanged, this, [this] {
    if (d_->to->date() < d_->from->date())
      d_->to->setDate(d_->from->date());
    d_->debounce->start();
  });
  connect(d_->to, &QDateEdit::dateChanged, this, [this] { d_->debounce->start(); });
  connect(d_->maxDba, &QSpinBox::valueChanged, this, [this] { d_->debounce->start(); });
  connect(d_->debounce, &QTimer::timeout, this, &SegmentComparePanel::recompute);
  connect(d_->unit, &QComboBox::currentIndexChanged, this, &SegmentComparePanel::redraw);
  connect(d_->lastYear, &QCheckBox::toggled, this, &SegmentComparePanel::redraw);
  connect(d_->segments, &QListWidget::itemChanged, this, &SegmentComparePanel::redraw);
  auto exportTableAs = [this](TableFormat format) {
    const QString done = saveTableAs(this, *d_->model, QStringLiteral("segment-compare"), format);
    if (!done.isEmpty())
      d_->status->setText(done);
  };
  connect(exportTable, &QPushButton::clicked, this,
          [exportTableAs] { exportTableAs(TableFormat::Csv); });
  connect(exportXlsx, &QPushButton::clicked, this,
          [exportTableAs] { exportTableAs(TableFormat::Xlsx); });
  connect(exportCharts, &QPushButton::clicked, this, [this] {
    const QString file =
        QFileDialog::getSaveFileName(this, QStringLiteral("Save the Segment Compare charts"),
                                     QStringLiteral("segment-compare.png"),
                                     QStringLiteral("PNG image (*.png);;PDF document (*.pdf)"));
    if (file.isEmpty())
      return;
    const QFileInfo info(file);
    const QString stem = info.path() + QLatin1Char('/') + info.completeBaseName();
    const QString ext = info.suffix().isEmpty() ? QStringLiteral("png") : info.suffix();
    bool ok = d_->curves->exportTo(stem + QStringLiteral("-curves.") + ext);
    ok = d_->window->exportTo(stem + QStringLiteral("-window.") + ext) && ok;
    ok = d_->rate->exportTo(stem + QStringLiteral("-rate.") + ext) && ok;
    d_->status->setText(ok ? QStringLiteral("Saved %1-curves/-window/-rate.%2").arg(stem, ext)
                           : QStringLiteral("Could not write %1").arg(file));
  });
  for (SegmentCompareChart *chart : {d_->curves, d_->window, d_->rate}) {
    chart->setContextMenuPolicy(Qt::CustomContextMenu);
    connect(chart, &QWidget::customContextMenuRequested, this, [this, chart](const QPoint &at) {
      QMenu menu;
      QAction *save = menu.addAction(QStringLiteral("Save this chart as PNG/PDF…"));
      if (menu.exec(chart->mapToGlobal(at)) != save)
        return;
      const QString file = QFileDialog::getSaveFileName(
          this, QStringLiteral("Save the chart"), QStringLiteral("segment-compare-chart.png"),
          QStringLiteral("PNG image (*.png);;PDF document (*.pdf)"));
      if (!file.isEmpty())
        d_->status->setText(chart->exportTo(file) ? QStringLiteral("Saved %1").arg(file)
                                                  : QStringLiteral("Could not write %1").arg(file));
    });
  }
}

SegmentComparePanel::~SegmentComparePanel() { delete d_; }

const SegmentCompareData *SegmentComparePanel::data() const {
  return d_->data ? &*d_->data : nullptr;
}

void SegmentComparePanel::setSession(WorkbenchSession *session) {
  const bool fresh = session != d_->session;
  d_->session = session;
  if (!session) {
    ++d_->generation;
    d_->data.reset();
    d_->busy->hide();
    return;
  }
  if (fresh) {
    // A week of nights from the session's default night (a Saturday two weeks out).
    const QDate first = toQDate(session->defaultNight());
    QSignalBlocker a(d_->from), b(d_->to);
    d_->from->setDate(first);
    d_->to->setDate(first.addDays(6));
    QSignalBlocker c(d_->segments);
    d_->segments->clear();
  }
  recompute();
}

void SegmentComparePanel::setPeriod(const QDate &first, const QDate &last) {
  QSignalBlocker a(d_->from), b(d_->to);
  d_->from->setDate(first);
  d_->to->setDate(last);
  recompute();
}

void SegmentComparePanel::setShare(bool share) { d_->unit->setCurrentIndex(share ? 1 : 0); }

void SegmentComparePanel::setSeriesShown(const QString &code, bool shown) {
  for (int i = 0; i < d_->segments->count(); ++i)
    if (d_->segments->item(i)->data(Qt::UserRole).toString() == code)
      d_->segments->item(i)->setCheckState(shown ? Qt::Checked : Qt::Unchecked);
}

QStringList SegmentComparePanel::shownSeries() const {
  QStringList out;
  for (int i = 0; i < d_->segments->count(); ++i)
    if (d_->segments->item(i)->checkState() == Qt::Checked)
      out << d_->segments->item(i)->data(Qt::UserRole).toString();
  return out;
}

void SegmentComparePanel::recompute() {
  d_->debounce->stop();
  if (!d_->session)
    return;
  const int generation = ++d_->generation;
  const cb::Date first = fromQDate(d_->from->date()), last = fromQDate(d_->to->date());
  const int maxDba = d_->maxDba->value();
  d_->busy->show();
  d_->status->setText(QStringLiteral("Computing …"));
  auto copy = std::make_shared<const WorkbenchSession>(*d_->session);
  auto *watcher = new QFutureWatcher<Result>(this);
  connect(watcher, &QFutureWatcher<Result>::finished, this, [this, watcher, generation] {
    Result r = watcher->result();
    watcher->deleteLater();
    if (generation != d_->generation)
      return;
    d_->busy->hide();
    if (const auto *msg = std::get_if<QString>(&r)) {
      d_->status->setText(QStringLiteral("Not computed: %1").arg(*msg));
      return;
    }
    d_->data = std::move(std::get<SegmentCompareData>(r));
    const SegmentCompareData &data = *d_->data;
    if (d_->segments->count() != static_cast<int>(data.series.size())) {
      // First result: every segment shown, the hotel total unticked (it dwarfs the segments).
      QSignalBlocker block(d_->segments);
      d_->segments->clear();
      for (const auto &s : data.series) {
        auto *item = new QListWidgetItem(swatch(s.colour), s.label, d_->segments);
        item->setData(Qt::UserRole, QString::fromStdString(s.code));
        item->setFlags(item->flags() | Qt::ItemIsUserCheckable);
        item->setCheckState(s.code == "ALL" ? Qt::Unchecked : Qt::Checked);
      }
    }
    d_->model->setData(data);
    // "Final" is blank until every chosen night is past: hide it then, to save room.
    d_->table->setColumnHidden(SegmentCompareTable::FinalNow,
                               data.series.empty() || !data.series.front().finalNow);
    QString what =
        data.nights == 1
            ? QStringLiteral("Night %1").arg(QLocale().toString(toQDate(data.first), kDateFormat))
            : QStringLiteral("%1 nights, averages per night").arg(data.nights);
    what += QStringLiteral(" · as of %1").arg(QLocale().toString(toQDate(data.asOf), kDateFormat));
    if (data.windowFromLastYear)
      what += QStringLiteral(" · booking window and rates: last year's comparable arrivals");
    d_->what = what;
    redraw();
    emit computed();
  });
  watcher->setFuture(QtConcurrent::run([copy, first, last, maxDba]() -> Result {
    try {
      return computeSegmentCompare(*copy, first, last, maxDba);
    } catch (const std::exception &e) {
      return QString::fromStdString(e.what());
    }
  }));
}

void SegmentComparePanel::redraw() {
  if (!d_->data)
    return;
  const bool share = d_->unit->currentIndex() == 1;
  const QStringList shown = shownSeries();
  d_->curves->showData(*d_->data, shown, share, d_->lastYear->isChecked());
  d_->window->showData(*d_->data, shown, share, false);
  d_->rate->showData(*d_->data, shown, share, false);
  // % of final needs finals: nights after the reading date have none yet.
  bool anyFinal = false;
  for (const auto &s : d_->data->series)
    for (const auto &v : s.share)
      anyFinal = anyFinal || v.has_value();
  d_->status->setToolTip(d_->what);
  d_->status->setText(share && !anyFinal ? d_->what + QStringLiteral(" · no finals yet: % of "
                                                                     "final shows last year only")
                                         : d_->what);
}

} // namespace cbui
