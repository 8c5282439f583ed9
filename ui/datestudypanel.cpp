#include "ui/datestudypanel.h"

#include "core/advice.h"
#include "core/forecastmethod.h"
#include "core/textformat.h"
#include "ui/datestudychart.h"
#include "ui/datestudyjobs.h"
#include "ui/datestudymodel.h"
#include "ui/workbenchsession.h"

#include <QComboBox>
#include <QDate>
#include <QDoubleSpinBox>
#include <QElapsedTimer>
#include <QFileDialog>
#include <QFormLayout>
#include <QGridLayout>
#include <QGroupBox>
#include <QHBoxLayout>
#include <QHeaderView>
#include <QLabel>
#include <QLineEdit>
#include <QListWidget>
#include <QLocale>
#include <QProgressBar>
#include <QPushButton>
#include <QScrollArea>
#include <QShortcut>
#include <QSplitter>
#include <QTabWidget>
#include <QTableWidget>
#include <QTimer>
#include <QVBoxLayout>

#include <deque>
#include <memory>

namespace cbui {
namespace {

const QString kStacked = QStringLiteral("__stacked__");
const std::string kDefaultMethod = "pickup-adv"; // the outlook's default (core/outlook.h)

QString q(const std::string &s) { return QString::fromStdString(s); }
QString q(std::string_view s) {
  return QString::fromUtf8(s.data(), static_cast<qsizetype>(s.size()));
}
QString count(double v) { return q(cb::formatCount(static_cast<std::int64_t>(std::llround(v)))); }
QString rooms1(double v) { return QLocale(QLocale::English).toString(v, 'f', 1); }

QString dayText(cb::Date d) {
  const QDate qd(d.year(), static_cast<int>(d.month()), static_cast<int>(d.day()));
  return QLocale().toString(qd, QStringLiteral("ddd d MMM yyyy"));
}

// Okabe–Ito, in the order of the palette (Okabe & Ito 2008), for segments without a colour.
QColor segmentColour(const cb::Segment &s, int i) {
  if (!s.colour.empty())
    return QColor(q(s.colour));
  static const QColor okabeIto[] = {QColor(0x00, 0x72, 0xB2), QColor(0xE6, 0x9F, 0x00),
                                    QColor(0x00, 0x9E, 0x73), QColor(0xCC, 0x79, 0xA7),
                                    QColor(0x56, 0xB4, 0xE9), QColor(0xD5, 0x5E, 0x00),
                                    QColor(0xF0, 0xE4, 0x42), QColor(0x00, 0x00, 0x00)};
  return okabeIto[i % 8];
}

QTableWidgetItem *cell(const QString &text, bool number = false) {
  auto *item = new QTableWidgetItem(text);
  item->setFlags(item->flags() & ~Qt::ItemIsEditable);
  if (number)
    item->setTextAlignment(Qt::AlignRight | Qt::AlignVCenter);
  return item;
}

} // namespace

struct DateStudyPanel::Impl {
  DateStudyPanel *self = nullptr;
  WorkbenchSession *session = nullptr;
  std::unique_ptr<DateStudyModel> model;
  DateStudyChart *chart = nullptr;
  DateStudyChartData base; // curves and band of the night; the forecast is added on top
  QLabel *title = nullptr, *status = nullptr;
  QComboBox *segment = nullptr, *method = nullptr;
  QPushButton *drill = nullptr, *cancel = nullptr;
  QProgressBar *progress = nullptr;
  QLabel *fcValue = nullptr, *fcMae = nullptr, *fcDesc = nullptr, *fcFormula = nullptr;
  QLabel *uncDemand = nullptr, *uncBand = nullptr, *capRooms = nullptr, *conRooms = nullptr,
         *spill = nullptr, *sellout = nullptr, *occupancy = nullptr;
  QTabWidget *tabs = nullptr;
  QTableWidget *segTable = nullptr, *resTable = nullptr;
  QLabel *segNotes = nullptr, *resSummary = nullptr;
  QDoubleSpinBox *ovValue = nullptr;
  QLineEdit *ovReason = nullptr;
  QListWidget *ovHistory = nullptr;
  std::vector<double> overrideValues;
  std::vector<cb::ForecastOverride> allOverrides; // read when the session opens and after a save
  std::string overrideError;
  qint64 nightMicros = 0, methodMicros = 0;

  DateStudyJobs *jobs = nullptr;
  QTimer *poll = nullptr;

  std::string methodName() const { return method->currentData().toString().toStdString(); }
  bool stacked() const { return segment->currentData().toString() == kStacked; }

  std::string protectionMethod() const {
    return DateStudyJobs::isSlow(methodName()) ? kDefaultMethod : methodName();
  }

  void updateProgress() {
    const bool busy = jobs->forecasting() || jobs->protecting();
    progress->setVisible(busy);
    cancel->setVisible(jobs->forecasting());
    if (jobs->total() > 0) {
      progress->setRange(0, jobs->total());
      progress->setValue(jobs->done());
    } else {
      progress->setRange(0, 0);
    }
    if (!busy)
      poll->stop();
    else if (!poll->isActive())
      poll->start(200);
  }

  void cacheGrew() {
    model->setCache(jobs->cache());
    applyForecast();
    requestProtection();
  }

  void requestProtection() {
    if (!model || model->lead() < 1)
      return;
    if (!jobs->protecting()) {
      segTable->setRowCount(0);
      segNotes->setText(tr("Computing protection…"));
    }
    jobs->requestProtection(model->night(), protectionMethod());
  }

  void protectionFinished(const ProtectionOut &out) {
    updateProgress();
    if (!model || out.night != model->night() || out.asOf != session->readingDate() ||
        out.method != protectionMethod()) {
      requestProtection(); // stale: the user moved on
      return;
    }
    fillSegments(out);
  }

  void fillSegments(const ProtectionOut &out) {
    segTable->setRowCount(0);
    if (!out.protection) {
      segNotes->setText(tr("No protection for this night: %1").arg(q(out.error)));
      return;
    }
    const auto &p = *out.protection;
    segTable->setRowCount(static_cast<int>(p.result.lines.size()));
    for (std::size_t i = 0; i < p.result.lines.size(); ++i) {
      const auto &l = p.result.lines[i];
      const int row = static_cast<int>(i);
      const int otb = i < p.segmentOtb.size() ? p.segmentOtb[i] : 0;
      segTable->setItem(row, 0, cell(q(l.demand.code)));
      segTable->setItem(row, 1, cell(count(otb), true));
      segTable->setItem(row, 2, cell(rooms1(otb + std::max(0.0, l.demand.mean)), true));
      segTable->setItem(
          row, 3, cell(q(cb::formatMoney(l.demand.rate, session->property().currency)), true));
      segTable->setItem(row, 4, cell(l.protectedRooms ? count(*l.protectedRooms) : tr("—"), true));
      segTable->setItem(row, 5, cell(count(l.bookingLimit), true));
      segTable->setItem(row, 6, cell(l.open ? tr("open") : tr("closed")));
    }
    QStringList notes;
    notes << tr("EMSR-b with %1 forecasts; %2 of %3 rooms left.")
                 .arg(q(out.method), count(p.result.remaining), count(p.capacity));
    for (const auto &n : p.notes)
      notes << q(n);
    segNotes->setText(notes.join(QLatin1Char(' ')));
  }

  void redraw() {
    const NightCurves c = model->curves();
    DateStudyChartData d;
    auto toQ = [](const std::vector<double> &v) { return QVector<double>(v.begin(), v.end()); };
    d.thisYearLabel = tr("This year %1").arg(dayText(c.night));
    d.lastYearLabel = tr("Last year %1").arg(dayText(c.lastYearNight));
    d.thisYearX = toQ(c.thisYear.x);
    d.thisYearY = toQ(c.thisYear.y);
    d.lastYearX = toQ(c.lastYear.x);
    d.lastYearY = toQ(c.lastYear.y);
    d.capacity = c.capacity;
    d.hasReading = c.readingLead.has_value();
    d.readingX = c.readingLead ? -*c.readingLead : 0;
    d.xMin = -model->maxLead();
    if (stacked()) {
      int i = 0;
      for (const auto &s : model->segmentCurves()) {
        d.stackNames << q(s.label);
        d.stackY << toQ(s.y);
        d.stackColours << segmentColour(session->segments()[static_cast<std::size_t>(i)], i);
        ++i;
      }
    }
    try {
      const cb::ComparableNights band = model->comparable();
      d.bandNights = static_cast<int>(band.references().size());
      for (const auto &b : band.band())
        if (b.low && b.high) {
          d.bandX << -b.dba;
          d.bandLow << *b.low;
          d.bandHigh << *b.high;
        }
    } catch (const std::exception &) {
      // No comparable nights (e.g. a reading date at the start of the data): no band.
    }
    base = d;
    const int otb = model->roomsOnBooks();
    drill->setText(tr("Reservations behind OTB (%1 rooms)").arg(count(otb)));
    title->setText(
        tr("<b>%1</b> · %2 · reading date %3")
            .arg(dayText(model->night()),
                 model->lead() >= 1 ? tr("%1 days ahead").arg(model->lead()) : tr("already stayed"),
                 dayText(session->readingDate())));
  }

  void applyForecast() {
    DateStudyChartData d = base;
    const std::string m = methodName();
    if (m != "auto") {
      auto made = cb::makeMethod(m);
      fcDesc->setText(q(made->description()));
      fcFormula->setText(q(made->formula()));
    } else {
      fcDesc->setText(tr("Per series and lead bucket, the method with the lowest error over the "
                         "last 8 weeks of nights already final at the reading date."));
      fcFormula->setText(tr("F = F_m*, m* = argmin_m MAE_m (lead bucket, 8 weeks)"));
    }
    const auto fv = model->forecast(m);
    if (fv) {
      d.hasForecast = true;
      d.otb = fv->otb;
      d.forecast = fv->forecast;
      d.hasForecastBand = fv->lo && fv->hi;
      d.forecastLow = fv->lo.value_or(0);
      d.forecastHigh = fv->hi.value_or(0);
      d.forecastLabel = tr("Forecast (%1) %2").arg(q(fv->method), rooms1(fv->forecast));
      QString text = tr("Forecast <b>%1</b> rooms").arg(rooms1(fv->forecast));
      if (d.hasForecastBand)
        text += tr(" (80 % band %1–%2)").arg(rooms1(*fv->lo), rooms1(*fv->hi));
      text += tr(" · OTB %1").arg(count(fv->otb));
      if (m == "auto")
        text += tr(" · chosen: %1").arg(q(fv->method));
      fcValue->setText(text);
    } else if (model->lead() < 1) {
      fcValue->setText(
          tr("Night already stayed: final %1 rooms").arg(count(model->roomsOnBooks())));
    } else {
      fcValue->setText(DateStudyJobs::isSlow(m) && !jobs->forecasting()
                           ? tr("%1 not computed (cancelled)").arg(q(m))
                           : tr("Forecast being computed…"));
    }
    int lead = 0;
    if (auto mae = model->mae(m == "auto" && fv ? fv->method : m, &lead))
      fcMae->setText(tr("Backtest MAE at lead %1, %2, last 8 weeks: <b>%3</b> rooms")
                         .arg(lead)
                         .arg(q(model->series()), rooms1(*mae)));
    else
      fcMae->setText(tr("Backtest MAE: not available yet"));

    const auto cap = model->capacityFigures(m);
    auto set = [](QLabel *l, const QString &t) { l->setText(t); };
    set(capRooms, count(session->property().capacityOn(model->night())));
    if (cap) {
      set(uncDemand, rooms1(cap->forecast));
      set(uncBand,
          cap->lo && cap->hi ? tr("%1–%2").arg(rooms1(*cap->lo), rooms1(*cap->hi)) : tr("—"));
      set(conRooms, rooms1(cap->constrained));
      set(spill, rooms1(cap->spill));
      set(sellout, q(cb::formatPercent(cap->pSellout)));
      set(occupancy, q(cb::formatPercent(cap->occupancy)));
    } else {
      for (QLabel *l : {uncDemand, uncBand, conRooms, spill, sellout, occupancy})
        set(l, tr("—"));
    }
    d.overrides = QVector<double>(overrideValues.begin(), overrideValues.end());
    QElapsedTimer t;
    t.start();
    chart->setData(d);
    if (qEnvironmentVariableIsSet("CURVEBENCH_TRACE_DATESTUDY"))
      qInfo("chart %lld us", static_cast<long long>(t.nsecsElapsed() / 1000));
  }

  void loadOverrides() {
    ovHistory->clear();
    overrideValues.clear();
    if (!overrideError.empty())
      ovHistory->addItem(tr("Overrides cannot be read: %1").arg(q(overrideError)));
    for (const auto &o : allOverrides) {
      if (o.night != model->night())
        continue;
      {
        const QString seg = o.segment.empty() ? tr("hotel") : q(o.segment);
        ovHistory->addItem(tr("%1 · %2 · %3 rooms · %4%5")
                               .arg(q(o.createdAt), seg, rooms1(o.value), q(o.reason),
                                    o.author.empty() ? QString() : tr(" (%1)").arg(q(o.author))));
        if (o.segment == model->segment())
          overrideValues.push_back(o.value);
      }
    }
  }

  void readOverrides() {
    overrideError.clear();
    allOverrides.clear();
    try {
      allOverrides = model->allOverrides();
    } catch (const std::exception &e) {
      overrideError = e.what();
    }
  }

  void fillReservations() {
    const auto rows = model->reservationsOnBooks();
    resTable->setRowCount(static_cast<int>(rows.size()));
    int total = 0;
    for (std::size_t i = 0; i < rows.size(); ++i) {
      const auto &r = rows[i];
      const int row = static_cast<int>(i);
      total += r.rooms;
      QString st = q(cb::statusName(r.status));
      if (r.cancelledOn)
        st = tr("booked (cancelled %1, after the reading date)").arg(q(r.cancelledOn->toIso()));
      resTable->setItem(row, 0, cell(q(r.id)));
      resTable->setItem(row, 1, cell(q(r.bookedOn.toIso())));
      resTable->setItem(row, 2, cell(st));
      resTable->setItem(row, 3, cell(q(r.segment)));
      resTable->setItem(row, 4, cell(count(r.rooms), true));
      resTable->setItem(row, 5, cell(q(r.arrival.toIso())));
      resTable->setItem(row, 6, cell(count(r.nights()), true));
      resTable->setItem(
          row, 7,
          cell(q(cb::formatMoney(r.rate,
                                 r.currency.empty() ? session->property().currency : r.currency)),
               true));
    }
    resTable->resizeColumnsToContents();
    resSummary->setText(tr("%1 reservations, %2 rooms on the books for %3 (%4) as of %5")
                            .arg(count(static_cast<double>(rows.size())), count(total),
                                 dayText(model->night()),
                                 model->segment().empty() ? tr("hotel") : q(model->segment()),
                                 dayText(session->readingDate())));
  }
};

DateStudyPanel::DateStudyPanel(QWidget *parent) : QWidget(parent), d_(new Impl) {
  d_->self = this;
  auto *outer = new QVBoxLayout(this);
  outer->setContentsMargins(4, 4, 4, 4);

  // Top bar: night, segment, method, view.
  auto *bar = new QHBoxLayout;
  auto *prev = new QPushButton(tr("◀"));
  auto *next = new QPushButton(tr("▶"));
  prev->setToolTip(tr("Previous night (Alt+Left or Page Up)"));
  next->setToolTip(tr("Next night (Alt+Right or Page Down)"));
  prev->setFixedWidth(32);
  next->setFixedWidth(32);
  d_->title = new QLabel(tr("No store open"));
  d_->segment = new QComboBox;
  d_->method = new QComboBox;
  for (const auto &m : cb::methodNames())
    d_->method->addItem(m == "mlp" ? tr("mlp (slow, computed on demand)") : q(m), q(m));
  d_->method->addItem(tr("auto (slow, computed on demand)"), QStringLiteral("auto"));
  d_->method->setCurrentIndex(d_->method->findData(q(kDefaultMethod)));
  auto *reset = new QPushButton(tr("Reset view"));
  auto *png = new QPushButton(tr("PNG…"));
  auto *pdf = new QPushButton(tr("PDF…"));
  bar->addWidget(prev);
  bar->addWidget(d_->title);
  bar->addWidget(next);
  bar->addStretch(1);
  bar->addWidget(new QLabel(tr("Segment")));
  bar->addWidget(d_->segment);
  bar->addWidget(new QLabel(tr("Method")));
  bar->addWidget(d_->method);
  bar->addWidget(reset);
  bar->addWidget(png);
  bar->addWidget(pdf);
  outer->addLayout(bar);

  auto *split = new QSplitter(Qt::Horizontal);
  d_->chart = new DateStudyChart;
  split->addWidget(d_->chart);

  // Right column: forecast, demand against capacity, then tabs.
  auto *right = new QWidget;
  auto *col = new QVBoxLayout(right);
  col->setContentsMargins(4, 0, 0, 0);
  auto *fcBox = new QGroupBox(tr("Forecast to arrival"));
  auto *fcLay = new QVBoxLayout(fcBox);
  d_->fcValue = new QLabel;
  d_->fcMae = new QLabel;
  d_->fcDesc = new QLabel;
  d_->fcFormula = new QLabel;
  d_->fcDesc->setWordWrap(true);
  d_->fcFormula->setWordWrap(true);
  d_->fcFormula->setStyleSheet(QStringLiteral("font-family: monospace; color: #333;"));
  d_->fcValue->setWordWrap(true);
  d_->fcMae->setWordWrap(true);
  d_->fcValue->setStyleSheet(QStringLiteral("font-size: 13pt;"));
  for (QLabel *l : {d_->fcValue, d_->fcMae, d_->fcDesc, d_->fcFormula})
    fcLay->addWidget(l);
  col->addWidget(fcBox);

  auto *capBox = new QGroupBox(tr("Demand against capacity (hotel)"));
  auto *grid = new QGridLayout(capBox);
  auto mk = [] {
    auto *l = new QLabel;
    l->setAlignment(Qt::AlignRight | Qt::AlignVCenter);
    return l;
  };
  d_->uncDemand = mk();
  d_->uncBand = mk();
  d_->capRooms = mk();
  d_->conRooms = mk();
  d_->spill = mk();
  d_->sellout = mk();
  d_->occupancy = mk();
  grid->addWidget(new QLabel(tr("<b>Unconstrained</b>")), 0, 0, 1, 2);
  grid->addWidget(new QLabel(tr("<b>Constrained</b>")), 0, 2, 1, 2);
  grid->addWidget(new QLabel(tr("Demand")), 1, 0);
  grid->addWidget(d_->uncDemand, 1, 1);
  grid->addWidget(new QLabel(tr("80 % band")), 2, 0);
  grid->addWidget(d_->uncBand, 2, 1);
  grid->addWidget(new QLabel(tr("Spill")), 3, 0);
  grid->addWidget(d_->spill, 3, 1);
  grid->addWidget(new QLabel(tr("Capacity")), 1, 2);
  grid->addWidget(d_->capRooms, 1, 3);
  grid->addWidget(new QLabel(tr("Rooms sold (expected)")), 2, 2);
  grid->addWidget(d_->conRooms, 2, 3);
  grid->addWidget(new QLabel(tr("Occupancy")), 3, 2);
  grid->addWidget(d_->occupancy, 3, 3);
  grid->addWidget(new QLabel(tr("Sell-out probability")), 4, 0, 1, 3);
  grid->addWidget(d_->sellout, 4, 3);
  grid->setColumnStretch(1, 1);
  grid->setColumnStretch(3, 1);
  col->addWidget(capBox);

  d_->tabs = new QTabWidget;
  // Segments and protection, with the caution.
  auto *segPage = new QWidget;
  auto *segLay = new QVBoxLayout(segPage);
  d_->segTable = new QTableWidget(0, 7);
  d_->segTable->setHorizontalHeaderLabels({tr("Segment"), tr("OTB"), tr("Forecast"), tr("Rate"),
                                           tr("Protect"), tr("Limit"), tr("Status")});
  d_->segTable->verticalHeader()->hide();
  d_->segTable->horizontalHeader()->setSectionResizeMode(QHeaderView::ResizeToContents);
  d_->segTable->setToolTip(tr("Double-click a segment to see its reservations"));
  d_->segNotes = new QLabel;
  d_->segNotes->setWordWrap(true);
  auto *caution = new QLabel(q(cb::kAdvisoryCaution));
  caution->setWordWrap(true);
  caution->setStyleSheet(QStringLiteral("color: #7a4a00; font-style: italic;"));
  segLay->addWidget(d_->segTable, 1);
  segLay->addWidget(d_->segNotes);
  segLay->addWidget(caution);
  d_->tabs->addTab(segPage, tr("Segments && protection"));

  // Expert override.
  auto *ovPage = new QWidget;
  auto *ovLay = new QVBoxLayout(ovPage);
  auto *form = new QFormLayout;
  d_->ovValue = new QDoubleSpinBox;
  d_->ovValue->setRange(0, 100000);
  d_->ovValue->setDecimals(0);
  d_->ovReason = new QLineEdit;
  d_->ovReason->setPlaceholderText(tr("Why (e.g. city marathon announced)"));
  auto *save = new QPushButton(tr("Save override"));
  form->addRow(tr("Final rooms"), d_->ovValue);
  form->addRow(tr("Reason"), d_->ovReason);
  ovLay->addLayout(form);
  ovLay->addWidget(save);
  ovLay->addWidget(new QLabel(tr("History of this night")));
  d_->ovHistory = new QListWidget;
  ovLay->addWidget(d_->ovHistory, 1);
  d_->tabs->addTab(ovPage, tr("Override"));

  // Drill-down.
  auto *resPage = new QWidget;
  auto *resLay = new QVBoxLayout(resPage);
  d_->resSummary = new QLabel;
  d_->resSummary->setWordWrap(true);
  d_->resTable = new QTableWidget(0, 8);
  d_->resTable->setHorizontalHeaderLabels({tr("Id"), tr("Booked on"), tr("Status"), tr("Segment"),
                                           tr("Rooms"), tr("Arrival"), tr("Nights"), tr("Rate")});
  d_->resTable->verticalHeader()->hide();
  d_->resTable->setSortingEnabled(false);
  resLay->addWidget(d_->resSummary);
  resLay->addWidget(d_->resTable, 1);
  d_->tabs->addTab(resPage, tr("Reservations"));
  connect(d_->tabs, &QTabWidget::currentChanged, this, [this](int i) {
    if (i == 2 && d_->model)
      d_->fillReservations();
  });
  col->addWidget(d_->tabs, 1);

  d_->drill = new QPushButton(tr("Reservations behind OTB"));
  col->addWidget(d_->drill);
  auto *scroll = new QScrollArea;
  scroll->setWidget(right);
  scroll->setWidgetResizable(true);
  scroll->setFrameShape(QFrame::NoFrame);
  split->addWidget(scroll);
  split->setStretchFactor(0, 3);
  split->setStretchFactor(1, 2);
  split->setSizes({800, 520});
  scroll->setHorizontalScrollBarPolicy(Qt::ScrollBarAlwaysOff);
  outer->addWidget(split, 1);

  auto *foot = new QHBoxLayout;
  d_->status = new QLabel;
  d_->progress = new QProgressBar;
  d_->progress->setMaximumWidth(200);
  d_->cancel = new QPushButton(tr("Cancel"));
  foot->addWidget(d_->status, 1);
  foot->addWidget(d_->progress);
  foot->addWidget(d_->cancel);
  outer->addLayout(foot);
  d_->progress->hide();
  d_->cancel->hide();

  d_->jobs = new DateStudyJobs(this);
  d_->poll = new QTimer(this);
  connect(d_->poll, &QTimer::timeout, this, [this] { d_->updateProgress(); });
  d_->jobs->onBusyChanged = [this] { d_->updateProgress(); };
  d_->jobs->onStatus = [this](const QString &text) { d_->status->setText(text); };
  d_->jobs->onCache = [this] { d_->cacheGrew(); };
  d_->jobs->onProtection = [this](const ProtectionOut &out) { d_->protectionFinished(out); };
  connect(d_->cancel, &QPushButton::clicked, this, [this] {
    d_->jobs->stop();
    d_->updateProgress();
    d_->status->setText(tr("Cancelled: no forecasts for the methods not computed yet."));
    d_->applyForecast();
  });

  connect(prev, &QPushButton::clicked, this, [this] { emit nightStepRequested(-1); });
  connect(next, &QPushButton::clicked, this, [this] { emit nightStepRequested(1); });
  auto shortcut = [this](QKeySequence key, int step) {
    auto *s = new QShortcut(key, this);
    s->setContext(Qt::WidgetWithChildrenShortcut);
    connect(s, &QShortcut::activated, this, [this, step] { emit nightStepRequested(step); });
  };
  shortcut(QKeySequence(Qt::ALT | Qt::Key_Left), -1);
  shortcut(QKeySequence(Qt::ALT | Qt::Key_Right), 1);
  shortcut(QKeySequence(Qt::Key_PageUp), -1);
  shortcut(QKeySequence(Qt::Key_PageDown), 1);
  connect(reset, &QPushButton::clicked, d_->chart, &DateStudyChart::resetView);
  connect(png, &QPushButton::clicked, this, [this] {
    const QString f = QFileDialog::getSaveFileName(this, tr("Export chart"), {}, tr("PNG (*.png)"));
    if (!f.isEmpty())
      d_->chart->exportPng(f);
  });
  connect(pdf, &QPushButton::clicked, this, [this] {
    const QString f = QFileDialog::getSaveFileName(this, tr("Export chart"), {}, tr("PDF (*.pdf)"));
    if (!f.isEmpty())
      d_->chart->exportPdf(f);
  });
  connect(d_->segment, &QComboBox::currentIndexChanged, this, [this] {
    if (!d_->model)
      return;
    const QString seg = d_->segment->currentData().toString();
    d_->model->setSegment(seg == kStacked ? std::string() : seg.toStdString());
    setNight(d_->model->night());
  });
  connect(d_->method, &QComboBox::currentIndexChanged, this, [this] {
    if (!d_->model)
      return;
    QElapsedTimer t;
    t.start();
    const std::string m = d_->methodName();
    if (DateStudyJobs::isSlow(m) && !d_->model->forecast(m) && d_->model->lead() >= 1)
      d_->jobs->requestSlow(m);
    d_->applyForecast();
    d_->methodMicros = t.nsecsElapsed() / 1000;
    d_->requestProtection();
  });
  connect(save, &QPushButton::clicked, this,
          [this] { saveOverride(d_->ovValue->value(), d_->ovReason->text()); });
  connect(d_->drill, &QPushButton::clicked, this, &DateStudyPanel::showReservations);
  connect(d_->segTable, &QTableWidget::cellDoubleClicked, this, [this](int row, int) {
    const int i = d_->segment->findData(d_->segTable->item(row, 0)->text());
    if (i >= 0)
      d_->segment->setCurrentIndex(i);
    showReservations();
  });
}

DateStudyPanel::~DateStudyPanel() {
  delete d_->jobs; // waits for the workers, which read the session
  delete d_;
}

void DateStudyPanel::setSession(WorkbenchSession *session) {
  const bool same = session && session == d_->session && d_->model;
  const cb::Date keep = same ? d_->model->night() : cb::Date();
  d_->jobs->reset(session);
  d_->session = session;
  d_->model = session ? std::make_unique<DateStudyModel>(*session) : nullptr;
  if (!session) {
    d_->title->setText(tr("No store open"));
    d_->chart->setData({});
    return;
  }
  {
    QSignalBlocker block(d_->segment);
    d_->segment->clear();
    d_->segment->addItem(tr("Hotel total"), QString());
    for (const auto &s : session->segments())
      d_->segment->addItem(s.name.empty() ? q(s.code) : tr("%1 – %2").arg(q(s.code), q(s.name)),
                           q(s.code));
    d_->segment->addItem(tr("Stacked segments"), kStacked);
  }
  d_->readOverrides();
  setNight(same ? keep : session->defaultNight());
}

void DateStudyPanel::setNight(cb::Date night) {
  if (!d_->model)
    return;
  QElapsedTimer t;
  t.start();
  d_->model->setNight(night);
  const bool trace = qEnvironmentVariableIsSet("CURVEBENCH_TRACE_DATESTUDY");
  auto lap = [&](const char *what) {
    if (trace)
      qInfo("%s %lld us", what, static_cast<long long>(t.nsecsElapsed() / 1000));
  };
  d_->jobs->ensure(d_->model->lead(), d_->model->horizonNeeded(), d_->methodName());
  d_->model->setCache(d_->jobs->cache());
  lap("ensure");
  d_->redraw();
  lap("redraw");
  d_->loadOverrides();
  lap("overrides");
  d_->applyForecast();
  lap("forecast");
  if (d_->tabs->currentIndex() == 2) // the drill-down list is filled only when shown
    d_->fillReservations();
  lap("reservations");
  d_->requestProtection();
  d_->nightMicros = t.nsecsElapsed() / 1000;
}

DateStudyModel *DateStudyPanel::model() const { return d_->model.get(); }
DateStudyChart *DateStudyPanel::chart() const { return d_->chart; }
QComboBox *DateStudyPanel::segmentPicker() const { return d_->segment; }
QComboBox *DateStudyPanel::methodPicker() const { return d_->method; }
QTableWidget *DateStudyPanel::segmentTable() const { return d_->segTable; }
QTableWidget *DateStudyPanel::reservationTable() const { return d_->resTable; }
QListWidget *DateStudyPanel::overrideHistory() const { return d_->ovHistory; }
bool DateStudyPanel::isComputing() const {
  return d_->jobs->forecasting() || d_->jobs->protecting();
}
QString DateStudyPanel::forecastText() const { return d_->fcValue->text(); }
qint64 DateStudyPanel::lastNightSwitchMicros() const { return d_->nightMicros; }
qint64 DateStudyPanel::lastMethodSwitchMicros() const { return d_->methodMicros; }

bool DateStudyPanel::saveOverride(double value, const QString &reason) {
  if (!d_->model)
    return false;
  if (reason.trimmed().isEmpty()) {
    d_->status->setText(tr("An override needs a reason."));
    return false;
  }
  try {
    const QString author = qEnvironmentVariable("USER");
    d_->model->addOverride(value, reason.trimmed().toStdString(), author.toStdString());
  } catch (const std::exception &e) {
    d_->status->setText(tr("Override not saved: %1").arg(q(std::string(e.what()))));
    return false;
  }
  d_->ovReason->clear();
  d_->readOverrides();
  d_->loadOverrides();
  d_->applyForecast();
  d_->status->setText(tr("Override saved."));
  emit overrideSaved();
  return true;
}

void DateStudyPanel::showReservations() {
  if (!d_->model)
    return;
  d_->fillReservations();
  d_->tabs->setCurrentIndex(2);
}

} // namespace cbui
