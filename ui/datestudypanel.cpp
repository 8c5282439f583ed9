#include "ui/datestudypanel.h"

#include "core/forecastmethod.h"
#include "core/textformat.h"
#include "ui/csvexport.h"
#include "ui/datestudychart.h"
#include "ui/datestudydetails.h"
#include "ui/datestudyjobs.h"
#include "ui/datestudymodel.h"
#include "ui/tableexport.h"
#include "ui/workbenchsession.h"

#include <QComboBox>
#include <QDate>
#include <QElapsedTimer>
#include <QFileDialog>
#include <QFileInfo>
#include <QHBoxLayout>
#include <QLabel>
#include <QLocale>
#include <QProgressBar>
#include <QPushButton>
#include <QScrollArea>
#include <QShortcut>
#include <QSplitter>
#include <QTableWidget>
#include <QTimer>
#include <QVBoxLayout>

#include <cmath>
#include <deque>
#include <memory>
#include <optional>
#include <tuple>

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

} // namespace

struct DateStudyPanel::Impl {
  QString readOnly; ///< why overrides cannot be saved here; empty = writable
  DateStudyPanel *self = nullptr;
  WorkbenchSession *session = nullptr;
  std::unique_ptr<DateStudyModel> model;
  DateStudyChart *chart = nullptr;
  DateStudyDetails *details = nullptr;
  DateStudyChartData base; // curves and band of the night; the forecast is added on top
  QLabel *title = nullptr, *status = nullptr;
  QComboBox *segment = nullptr, *method = nullptr;
  QPushButton *cancel = nullptr;
  QProgressBar *progress = nullptr;
  std::vector<double> overrideValues;
  std::vector<cb::ForecastOverride> allOverrides; // read when the session opens and after a save
  std::string overrideError;
  qint64 nightMicros = 0, methodMicros = 0;
  bool started = false; // background forecasts run once the panel was shown (or asked to)
  // The protection on screen: night, reading date, method (it does not read the forecast cache,
  // so a method computed in the background does not make it stale).
  std::optional<std::tuple<cb::Date, cb::Date, std::string>> shownProtection;

  DateStudyJobs *jobs = nullptr;
  QTimer *poll = nullptr;

  std::string methodName() const { return method->currentData().toString().toStdString(); }
  bool stacked() const { return segment->currentData().toString() == kStacked; }

  std::string protectionMethod() const {
    return DateStudyJobs::isSlow(methodName()) ? kDefaultMethod : methodName();
  }

  void ensureForecasts() {
    if (!model || !started)
      return;
    jobs->ensure(model->lead(), model->horizonNeeded(), methodName());
    model->setCache(jobs->cache());
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
    if (!model || model->lead() < 1 || !started)
      return;
    if (shownProtection ==
        std::make_tuple(model->night(), session->readingDate(), protectionMethod()))
      return;
    shownProtection.reset();
    if (!jobs->protecting())
      details->setSegmentsPending(tr("Computing protection…"));
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
    shownProtection = std::make_tuple(out.night, out.asOf, out.method);
  }

  void fillSegments(const ProtectionOut &out) {
    if (!out.protection) {
      details->setSegmentsPending(tr("No protection for this night: %1").arg(q(out.error)));
      return;
    }
    const auto &p = *out.protection;
    QList<SegmentRowText> rows;
    for (std::size_t i = 0; i < p.result.lines.size(); ++i) {
      const auto &l = p.result.lines[i];
      SegmentRowText r;
      r.segment = q(l.demand.code);
      r.otb = i < p.segmentOtb.size() ? p.segmentOtb[i] : 0;
      r.forecast = r.otb + std::max(0.0, l.demand.mean);
      r.rate = l.demand.rate;
      r.rateText = q(cb::formatMoney(l.demand.rate, session->property().currency));
      r.protect = l.protectedRooms ? static_cast<int>(std::lround(*l.protectedRooms)) : -1;
      r.limit = static_cast<int>(std::lround(l.bookingLimit));
      r.open = l.open;
      rows << r;
    }
    QStringList notes;
    notes << tr("EMSR-b with %1 forecasts; %2 of %3 rooms left.")
                 .arg(q(out.method), count(p.result.remaining), count(p.capacity));
    for (const auto &n : p.notes)
      notes << q(n);
    details->setSegments(rows, notes.join(QLatin1Char(' ')));
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
    details->setDrillText(tr("Reservations behind OTB (%1 rooms)").arg(count(otb)));
    title->setText(
        tr("<b>%1</b> · %2 · reading date %3")
            .arg(dayText(model->night()),
                 model->lead() >= 1 ? tr("%1 days ahead").arg(model->lead()) : tr("already stayed"),
                 dayText(session->readingDate())));
  }

  void applyForecast() {
    DateStudyChartData d = base;
    const std::string m = methodName();
    QString desc, formula, value, accuracy;
    if (m != "auto") {
      auto made = cb::makeMethod(m);
      desc = q(made->description());
      formula = q(made->formula());
    } else {
      desc = tr("Per series and lead bucket, the method with the lowest error over the last 8 "
                "weeks of nights already final at the reading date.");
      formula = tr("F = F_m*, m* = argmin_m MAE_m (lead bucket, 8 weeks)");
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
      value = tr("Forecast <b>%1</b> rooms").arg(rooms1(fv->forecast));
      if (d.hasForecastBand)
        value += tr(" (80 % band %1–%2)").arg(rooms1(*fv->lo), rooms1(*fv->hi));
      value += tr(" · OTB %1").arg(count(fv->otb));
      if (m == "auto")
        value += tr(" · chosen: %1").arg(q(fv->method));
    } else if (model->lead() < 1) {
      value = tr("Night already stayed: final %1 rooms").arg(count(model->roomsOnBooks()));
    } else if (!started) {
      value = tr("Forecasts start when Date Study is shown…");
    } else {
      value = DateStudyJobs::isSlow(m) && !jobs->forecasting()
                  ? tr("%1 not computed (cancelled)").arg(q(m))
                  : tr("Forecast being computed…");
    }
    int lead = 0;
    if (auto mae = model->mae(m == "auto" && fv ? fv->method : m, &lead))
      accuracy = tr("Backtest MAE at lead %1, %2, last 8 weeks: <b>%3</b> rooms")
                     .arg(lead)
                     .arg(q(model->series()), rooms1(*mae));
    else
      accuracy = tr("Backtest MAE: not available yet");
    details->setForecast(value, accuracy, desc, formula);

    CapacityTexts t;
    t.capacity = count(session->property().capacityOn(model->night()));
    t.demand = t.band = t.sold = t.spill = t.sellout = t.occupancy = tr("—");
    if (const auto cap = model->capacityFigures(m)) {
      t.demand = rooms1(cap->forecast);
      if (cap->lo && cap->hi)
        t.band = tr("%1–%2").arg(rooms1(*cap->lo), rooms1(*cap->hi));
      t.sold = rooms1(cap->constrained);
      t.spill = rooms1(cap->spill);
      t.sellout = q(cb::formatPercent(cap->pSellout));
      t.occupancy = q(cb::formatPercent(cap->occupancy));
    }
    details->setCapacity(t);
    d.overrides = QVector<double>(overrideValues.begin(), overrideValues.end());
    QElapsedTimer timer;
    timer.start();
    chart->setData(d);
    if (qEnvironmentVariableIsSet("CURVEBENCH_TRACE_DATESTUDY"))
      qInfo("chart %lld us", static_cast<long long>(timer.nsecsElapsed() / 1000));
  }

  void loadOverrides() {
    overrideValues.clear();
    QStringList lines;
    if (!overrideError.empty())
      lines << tr("Overrides cannot be read: %1").arg(q(overrideError));
    for (const auto &o : allOverrides) {
      if (o.night != model->night())
        continue;
      const QString seg = o.segment.empty() ? tr("hotel") : q(o.segment);
      lines << tr("%1 · %2 · %3 rooms · %4%5")
                   .arg(q(o.createdAt), seg, rooms1(o.value), q(o.reason),
                        o.author.empty() ? QString() : tr(" (%1)").arg(q(o.author)));
      if (o.segment == model->segment())
        overrideValues.push_back(o.value);
    }
    details->setOverrideHistory(lines);
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
    const auto res = model->reservationsOnBooks();
    QList<ReservationRowText> rows;
    int total = 0;
    for (const auto &r : res) {
      total += r.rooms;
      ReservationRowText t;
      t.id = q(r.id);
      t.bookedOn = q(r.bookedOn.toIso());
      t.status = q(cb::statusName(r.status));
      if (r.cancelledOn)
        t.status =
            tr("booked (cancelled %1, after the reading date)").arg(q(r.cancelledOn->toIso()));
      t.segment = q(r.segment);
      t.rooms = r.rooms;
      t.arrival = q(r.arrival.toIso());
      t.nights = r.nights();
      t.rate = r.rate;
      t.rateText = q(
          cb::formatMoney(r.rate, r.currency.empty() ? session->property().currency : r.currency));
      rows << t;
    }
    details->setReservations(rows,
                             tr("%1 reservations, %2 rooms on the books for %3 (%4) as of %5")
                                 .arg(count(static_cast<double>(res.size())), count(total),
                                      dayText(model->night()),
                                      model->segment().empty() ? tr("hotel") : q(model->segment()),
                                      dayText(session->readingDate())));
  }

  void exportTable(QTableWidget *table, const QString &name) {
    const QFileInfo suggested(name);
    const QString done = saveTableAs(
        self, *table->model(), suggested.completeBaseName(),
        suggested.suffix() == QStringLiteral("xlsx") ? TableFormat::Xlsx : TableFormat::Csv);
    if (!done.isEmpty())
      status->setText(done);
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
  d_->segment->setSizeAdjustPolicy(QComboBox::AdjustToContents);
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
  d_->details = new DateStudyDetails;
  auto *scroll = new QScrollArea;
  scroll->setWidget(d_->details);
  scroll->setWidgetResizable(true);
  scroll->setFrameShape(QFrame::NoFrame);
  scroll->setHorizontalScrollBarPolicy(Qt::ScrollBarAlwaysOff);
  split->addWidget(scroll);
  split->setStretchFactor(0, 3);
  split->setStretchFactor(1, 2);
  split->setSizes({800, 520});
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
    d_->jobs->cancelForecasts(); // the night's protection goes on
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
    if (d_->started && DateStudyJobs::isSlow(m) && !d_->model->forecast(m) &&
        d_->model->lead() >= 1)
      d_->jobs->requestSlow(m);
    d_->applyForecast();
    d_->methodMicros = t.nsecsElapsed() / 1000;
    d_->requestProtection();
  });
  connect(d_->details, &DateStudyDetails::overrideRequested, this,
          [this](double value, const QString &reason) { saveOverride(value, reason); });
  connect(d_->details, &DateStudyDetails::drillRequested, this, &DateStudyPanel::showReservations);
  connect(d_->details, &DateStudyDetails::tabShown, this, [this](int tab) {
    if (tab == DateStudyDetails::ReservationsTab && d_->model)
      d_->fillReservations();
  });
  connect(d_->details, &DateStudyDetails::segmentActivated, this, [this](const QString &code) {
    const int i = d_->segment->findData(code);
    if (i >= 0)
      d_->segment->setCurrentIndex(i);
    showReservations();
  });
  connect(d_->details, &DateStudyDetails::exportRequested, this,
          [this](QTableWidget *table, const QString &name) { d_->exportTable(table, name); });
}

DateStudyPanel::~DateStudyPanel() {
  delete d_->jobs; // waits for the workers, which read the session
  delete d_;
}

void DateStudyPanel::startBackgroundWork() {
  if (d_->started)
    return;
  d_->started = true;
  if (!d_->model)
    return;
  d_->ensureForecasts();
  d_->applyForecast();
  d_->requestProtection();
}

void DateStudyPanel::showEvent(QShowEvent *event) {
  QWidget::showEvent(event);
  startBackgroundWork();
}

void DateStudyPanel::setSession(WorkbenchSession *session) {
  const bool same = session && session == d_->session && d_->model;
  const cb::Date keep = same ? d_->model->night() : cb::Date();
  d_->jobs->reset(session);
  d_->shownProtection.reset();
  // Hidden, the forecasts of a new session (another reading date, say) wait until the panel is
  // shown or the main window asks for them (once Horizon has drawn its own), so that the screen
  // in view does not share the cores with work for one out of view.
  if (!isVisible())
    d_->started = false;
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
  d_->ensureForecasts();
  lap("ensure");
  d_->redraw();
  lap("redraw");
  d_->loadOverrides();
  lap("overrides");
  d_->applyForecast();
  lap("forecast");
  if (d_->details->currentTab() == DateStudyDetails::ReservationsTab) // filled only when shown
    d_->fillReservations();
  lap("reservations");
  d_->requestProtection();
  d_->nightMicros = t.nsecsElapsed() / 1000;
}

DateStudyModel *DateStudyPanel::model() const { return d_->model.get(); }
DateStudyChart *DateStudyPanel::chart() const { return d_->chart; }
QComboBox *DateStudyPanel::segmentPicker() const { return d_->segment; }
QComboBox *DateStudyPanel::methodPicker() const { return d_->method; }
QTableWidget *DateStudyPanel::segmentTable() const { return d_->details->segmentTable(); }
QTableWidget *DateStudyPanel::reservationTable() const { return d_->details->reservationTable(); }
QListWidget *DateStudyPanel::overrideHistory() const { return d_->details->overrideHistory(); }
bool DateStudyPanel::isComputing() const {
  return d_->jobs->forecasting() || d_->jobs->protecting();
}
QString DateStudyPanel::forecastText() const { return d_->details->forecastText(); }
qint64 DateStudyPanel::lastNightSwitchMicros() const { return d_->nightMicros; }
qint64 DateStudyPanel::lastMethodSwitchMicros() const { return d_->methodMicros; }

void DateStudyPanel::setReadOnly(bool readOnly, const QString &reason) {
  d_->readOnly = readOnly ? (reason.isEmpty() ? tr("read-only") : reason) : QString();
  d_->details->setOverrideEditable(!readOnly, tr("Read-only: %1").arg(d_->readOnly));
}

bool DateStudyPanel::saveOverride(double value, const QString &reason) {
  if (!d_->model)
    return false;
  if (!d_->readOnly.isEmpty()) {
    d_->status->setText(tr("Override not saved: %1").arg(d_->readOnly));
    return false;
  }
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
  d_->details->clearOverrideReason();
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
  d_->details->showTab(DateStudyDetails::ReservationsTab);
}

} // namespace cbui
