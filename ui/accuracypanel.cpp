#include "ui/accuracypanel.h"

#include "core/textformat.h"
#include "ui/accuracychart.h"
#include "ui/accuracymodel.h"
#include "ui/csvexport.h"
#include "ui/tableexport.h"
#include "ui/tablerows.h"

#include <QComboBox>
#include <QFileDialog>
#include <QFutureWatcher>
#include <QHBoxLayout>
#include <QHeaderView>
#include <QLabel>
#include <QLocale>
#include <QProgressBar>
#include <QPushButton>
#include <QSplitter>
#include <QTableWidget>
#include <QTimer>
#include <QVBoxLayout>
#include <QtConcurrent/QtConcurrentRun>

#include <atomic>
#include <memory>

namespace cbui {
namespace {

struct Control {
  std::atomic<bool> cancel{false};
  std::atomic<std::int64_t> done{0}, total{0};
};

bool progressOf(void *context, std::int64_t done, std::int64_t total) {
  auto *c = static_cast<Control *>(context);
  c->done = done;
  c->total = total;
  return !c->cancel;
}

QString q(const std::string &s) { return QString::fromStdString(s); }
QString fixed(double v, int decimals) { return QLocale().toString(v, 'f', decimals); }

QTableWidgetItem *cell(const QString &text, const QVariant &value = {}) {
  auto *item = new QTableWidgetItem(text);
  item->setFlags(item->flags() & ~Qt::ItemIsEditable);
  if (value.isValid()) {
    item->setTextAlignment(Qt::AlignRight | Qt::AlignVCenter);
    item->setData(kCsvValueRole, value);
  }
  return item;
}

QTableWidgetItem *optCell(const std::optional<double> &v, int decimals, double scale = 1) {
  return v ? cell(fixed(*v * scale, decimals), QString::number(*v * scale, 'f', decimals + 2))
           : cell(QStringLiteral("—"), QString());
}

} // namespace

struct AccuracyPanel::Impl {
  WorkbenchSession *session = nullptr;
  AccuracyChart *chart = nullptr;
  QComboBox *weeks = nullptr, *segment = nullptr, *measure = nullptr;
  QPushButton *runButton = nullptr, *cancelButton = nullptr;
  QProgressBar *progress = nullptr;
  QLabel *status = nullptr, *autoPicks = nullptr;
  QTableWidget *table = nullptr;
  QFutureWatcher<AccuracyData> *watcher = nullptr;
  std::shared_ptr<Control> control;
  QTimer *poll = nullptr;
  AccuracyData data;
  bool hasData = false, shownOnce = false;
  int generation = 0;

  void drawChart() {
    if (!hasData)
      return;
    const int m = measure->currentIndex();
    AccuracyChartData c;
    c.measure = measure->currentText();
    std::map<std::string, int> picks;
    for (const AutoPick &p : data.autoPicks)
      for (const auto &[method, n] : p.picks)
        picks[method] += n;
    int best = 0;
    for (const auto &[method, n] : picks)
      if (n > best) {
        best = n;
        c.highlight = q(method);
      }
    for (const std::string &method : data.methods) {
      QVector<double> x, y;
      for (const AccuracyLine &l : data.lines) {
        if (l.method != method || l.accuracy.count == 0)
          continue;
        const cb::Accuracy &a = l.accuracy;
        const std::optional<double> v = m == 0   ? std::optional<double>(a.mae)
                                        : m == 1 ? std::optional<double>(a.rmse)
                                        : m == 2 ? a.wape
                                                 : std::optional<double>(a.bias);
        if (v) {
          x << l.lead;
          y << *v;
        }
      }
      c.methods << q(method);
      c.leads << x;
      c.values << y;
    }
    chart->setData(c);
  }

  void fill() {
    table->setRowCount(static_cast<int>(data.lines.size()));
    int row = 0;
    for (const AccuracyLine &l : data.lines) {
      const cb::Accuracy &a = l.accuracy;
      table->setItem(row, 0, cell(q(l.method)));
      table->setItem(row, 1, cell(QString::number(l.lead), l.lead));
      table->setItem(row, 2, cell(q(cb::formatCount(a.count)), static_cast<qlonglong>(a.count)));
      table->setItem(row, 3, cell(fixed(a.mae, 2), QString::number(a.mae, 'f', 4)));
      table->setItem(row, 4, cell(fixed(a.rmse, 2), QString::number(a.rmse, 'f', 4)));
      table->setItem(row, 5, optCell(a.mape, 1));
      table->setItem(row, 6, optCell(a.wape, 1));
      table->setItem(row, 7, cell(fixed(a.bias, 2), QString::number(a.bias, 'f', 4)));
      table->setItem(row, 8, optCell(a.mase, 2));
      table->setItem(row, 9, optCell(l.coverage, 0, 100));
      table->setItem(row, 10,
                     cell(QString::number(l.overridden), static_cast<qlonglong>(l.overridden)));
      table->setItem(row, 11, optCell(l.valueAdded, 2));
      ++row;
    }
    table->resizeColumnsToContents();
    QStringList lines;
    for (const AutoPick &p : data.autoPicks) {
      int total = 0;
      for (const auto &[method, n] : p.picks)
        total += n;
      QStringList evidence;
      for (const auto &[method, error] : p.latestEvidence) {
        evidence << QStringLiteral("%1 %2").arg(q(method), fixed(error, 1));
        if (evidence.size() == 4)
          break;
      }
      lines << QStringLiteral("<b>Leads %1:</b> %2 (chosen on %3 of %4 reading dates). Lowest %5 "
                              "over the last 8 weeks at the latest: %6")
                   .arg(q(p.bucket), q(p.latest))
                   .arg(p.picks.count(p.latest) ? p.picks.at(p.latest) : 0)
                   .arg(total)
                   .arg(q(p.criterion).toUpper(), evidence.join(QStringLiteral(", ")));
    }
    autoPicks->setText(lines.isEmpty() ? QStringLiteral("Auto-selection made no choice here.")
                                       : lines.join(QStringLiteral("<br>")));
    drawChart();
  }

  void busy(bool on) {
    progress->setVisible(on);
    cancelButton->setVisible(on);
    runButton->setEnabled(!on);
    if (on)
      poll->start(200);
    else
      poll->stop();
  }
};

AccuracyPanel::AccuracyPanel(QWidget *parent) : QWidget(parent), d_(new Impl) {
  auto *outer = new QVBoxLayout(this);
  outer->setContentsMargins(4, 4, 4, 4);
  auto *bar = new QHBoxLayout;
  d_->weeks = new QComboBox;
  for (int w : {4, 8, 13, 26})
    d_->weeks->addItem(QStringLiteral("nights of the last %1 weeks").arg(w), w);
  d_->weeks->setCurrentIndex(1);
  d_->segment = new QComboBox;
  d_->segment->setSizeAdjustPolicy(QComboBox::AdjustToContents);
  d_->measure = new QComboBox;
  d_->measure->addItems({QStringLiteral("MAE (rooms)"), QStringLiteral("RMSE (rooms)"),
                         QStringLiteral("WAPE (%)"), QStringLiteral("Bias (rooms, + = over)")});
  d_->runButton = new QPushButton(QStringLiteral("Run backtest"));
  d_->cancelButton = new QPushButton(QStringLiteral("Cancel"));
  d_->progress = new QProgressBar;
  d_->progress->setMaximumWidth(180);
  auto *csv = new QPushButton(QStringLiteral("Table CSV…"));
  auto *xlsx = new QPushButton(QStringLiteral("XLSX…"));
  auto *img = new QPushButton(QStringLiteral("Chart PNG/PDF…"));
  bar->addWidget(new QLabel(QStringLiteral("Scored")));
  bar->addWidget(d_->weeks);
  bar->addWidget(new QLabel(QStringLiteral("Segment")));
  bar->addWidget(d_->segment);
  bar->addWidget(d_->runButton);
  bar->addWidget(d_->progress);
  bar->addWidget(d_->cancelButton);
  bar->addStretch(1);
  bar->addWidget(new QLabel(QStringLiteral("Chart")));
  bar->addWidget(d_->measure);
  bar->addWidget(csv);
  bar->addWidget(xlsx);
  bar->addWidget(img);
  outer->addLayout(bar);
  d_->status = new QLabel(QStringLiteral("Open a store, then run the backtest."));
  d_->status->setWordWrap(true);
  outer->addWidget(d_->status);

  auto *split = new QSplitter(Qt::Vertical);
  auto *top = new QWidget;
  auto *topLay = new QHBoxLayout(top);
  topLay->setContentsMargins(0, 0, 0, 0);
  d_->chart = new AccuracyChart;
  d_->autoPicks = new QLabel;
  d_->autoPicks->setWordWrap(true);
  d_->autoPicks->setAlignment(Qt::AlignTop | Qt::AlignLeft);
  d_->autoPicks->setMinimumWidth(360);
  d_->autoPicks->setToolTip(QStringLiteral(
      "auto forecasts each series and lead bucket with the method of lowest error over the "
      "8 weeks of nights already final at each reading date"));
  topLay->addWidget(d_->chart, 3);
  topLay->addWidget(d_->autoPicks, 2);
  d_->table = new QTableWidget(0, 12);
  d_->table->setHorizontalHeaderLabels(
      {QStringLiteral("Method"), QStringLiteral("Lead"), QStringLiteral("Forecasts"),
       QStringLiteral("MAE"), QStringLiteral("RMSE"), QStringLiteral("MAPE %"),
       QStringLiteral("WAPE %"), QStringLiteral("Bias"), QStringLiteral("MASE"),
       QStringLiteral("In 80 % band %"), QStringLiteral("Overrides"),
       QStringLiteral("Override value added")});
  d_->table->verticalHeader()->hide();
  useCompactRows(d_->table); // a year's table is 13 methods by 7 leads
  d_->table->setSortingEnabled(false);
  split->addWidget(top);
  split->addWidget(d_->table);
  split->setStretchFactor(0, 3);
  split->setStretchFactor(1, 2);
  outer->addWidget(split, 1);
  d_->progress->hide();
  d_->cancelButton->hide();

  d_->watcher = new QFutureWatcher<AccuracyData>(this);
  d_->poll = new QTimer(this);
  connect(d_->poll, &QTimer::timeout, this, [this] {
    if (d_->control && d_->control->total > 0) {
      d_->progress->setRange(0, static_cast<int>(d_->control->total));
      d_->progress->setValue(static_cast<int>(d_->control->done));
    }
  });
  connect(d_->watcher, &QFutureWatcherBase::finished, this, [this] {
    d_->busy(false);
    const int generation = d_->watcher->property("generation").toInt();
    if (generation != d_->generation || d_->watcher->future().resultCount() == 0)
      return;
    AccuracyData r = d_->watcher->result();
    if (r.cancelled) {
      d_->status->setText(QStringLiteral("Backtest cancelled: the figures below are the last "
                                         "complete run, if any."));
      emit finished();
      return;
    }
    d_->data = std::move(r);
    d_->hasData = true;
    d_->status->setText(
        QStringLiteral("%1 · nights %2 to %3, each forecast at every lead from what was known "
                       "that many days before · trained on unconstrained history (the property's "
                       "setting), scored against the finals as stayed · bias = forecast − final")
            .arg(d_->data.series == "ALL" ? QStringLiteral("Hotel total") : q(d_->data.series),
                 q(d_->data.from.toIso()), q(d_->data.to.toIso())));
    d_->fill();
    emit finished();
  });
  connect(d_->runButton, &QPushButton::clicked, this, &AccuracyPanel::run);
  connect(d_->cancelButton, &QPushButton::clicked, this, &AccuracyPanel::cancel);
  connect(d_->measure, &QComboBox::currentIndexChanged, this, [this] { d_->drawChart(); });
  auto save = [this](TableFormat format) {
    const QString said = saveTableAs(this, *d_->table->model(), QStringLiteral("accuracy"), format);
    if (!said.isEmpty())
      d_->status->setText(said);
  };
  connect(csv, &QPushButton::clicked, this, [save] { save(TableFormat::Csv); });
  connect(xlsx, &QPushButton::clicked, this, [save] { save(TableFormat::Xlsx); });
  connect(img, &QPushButton::clicked, this, [this] {
    const QString f = QFileDialog::getSaveFileName(this, QStringLiteral("Export chart"),
                                                   QStringLiteral("accuracy.png"),
                                                   QStringLiteral("PNG (*.png);;PDF (*.pdf)"));
    if (!f.isEmpty())
      d_->chart->exportTo(f);
  });
}

AccuracyPanel::~AccuracyPanel() {
  cancel();
  d_->watcher->waitForFinished(); // the worker reads the session
  delete d_;
}

void AccuracyPanel::setSession(WorkbenchSession *session) {
  cancel();
  d_->watcher->waitForFinished();
  d_->session = session;
  d_->hasData = false;
  d_->table->setRowCount(0);
  d_->autoPicks->clear();
  d_->chart->setData({});
  d_->segment->clear();
  if (!session) {
    d_->status->setText(QStringLiteral("Open a store, then run the backtest."));
    return;
  }
  d_->segment->addItem(QStringLiteral("Hotel total"), QString());
  for (const auto &s : session->segments())
    d_->segment->addItem(s.name.empty() ? q(s.code)
                                        : QStringLiteral("%1 – %2").arg(q(s.code), q(s.name)),
                         q(s.code));
  d_->status->setText(QStringLiteral("Run the backtest to measure every method on this property "
                                     "(about a minute on the sample property)."));
  if (isVisible())
    run();
}

void AccuracyPanel::showEvent(QShowEvent *event) {
  QWidget::showEvent(event);
  if (d_->session && !d_->hasData && !isRunning())
    run();
}

void AccuracyPanel::run() {
  if (!d_->session)
    return;
  cancel();
  d_->watcher->waitForFinished();
  AccuracyRequest req;
  req.weeks = d_->weeks->currentData().toInt();
  req.segment = d_->segment->currentData().toString().toStdString();
  d_->control = std::make_shared<Control>();
  req.progress = progressOf;
  req.progressContext = d_->control.get();
  d_->progress->setRange(0, 0);
  d_->busy(true);
  d_->status->setText(
      QStringLiteral("Backtesting every method on the %1 …").arg(d_->weeks->currentText()));
  ++d_->generation;
  d_->watcher->setProperty("generation", d_->generation);
  const WorkbenchSession *s = d_->session;
  auto control = d_->control; // kept alive by the worker
  d_->watcher->setFuture(QtConcurrent::run([s, req, control] { return computeAccuracy(*s, req); }));
}

void AccuracyPanel::cancel() {
  if (d_->control)
    d_->control->cancel = true;
}

bool AccuracyPanel::isRunning() const { return d_->watcher->isRunning(); }
QTableWidget *AccuracyPanel::table() const { return d_->table; }
AccuracyChart *AccuracyPanel::chart() const { return d_->chart; }
QComboBox *AccuracyPanel::weeksPicker() const { return d_->weeks; }
QComboBox *AccuracyPanel::segmentPicker() const { return d_->segment; }
QString AccuracyPanel::autoText() const { return d_->autoPicks->text(); }
QString AccuracyPanel::statusText() const { return d_->status->text(); }

} // namespace cbui
