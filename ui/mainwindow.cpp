#include "ui/mainwindow.h"

#include "core/samplestore.h"
#include "core/textformat.h"
#include "ui/nightcurvechart.h"
#include "ui/propertysummarypanel.h"
#include "ui/workbenchsession.h"

#include <QComboBox>
#include <QDateEdit>
#include <QFutureWatcher>
#include <QHBoxLayout>
#include <QLabel>
#include <QProgressBar>
#include <QSpinBox>
#include <QSplitter>
#include <QStatusBar>
#include <QToolButton>
#include <QVBoxLayout>
#include <QtConcurrent/QtConcurrentRun>

#include <variant>

namespace cbui {
namespace {

QDate toQDate(cb::Date d) {
  return QDate(d.year(), static_cast<int>(d.month()), static_cast<int>(d.day()));
}
cb::Date fromQDate(const QDate &d) {
  return cb::Date::fromYmd(d.year(), static_cast<unsigned>(d.month()),
                           static_cast<unsigned>(d.day()));
}

// A background load gives either a session or the message of what went wrong.
using LoadResult = std::variant<std::shared_ptr<WorkbenchSession>, QString>;

LoadResult loadSession(const std::filesystem::path &store, bool buildSampleFirst) {
  try {
    if (buildSampleFirst) {
      auto files = store.parent_path() / "sample-files";
      cb::buildSampleStore(store, files);
    }
    return std::shared_ptr<WorkbenchSession>(WorkbenchSession::open(store));
  } catch (const std::exception &e) {
    return QString::fromStdString(e.what());
  }
}

} // namespace

MainWindow::MainWindow(QWidget *parent)
    : QMainWindow(parent), summary_(new PropertySummaryPanel), chart_(new NightCurveChart),
      nightEdit_(new QDateEdit), segmentCombo_(new QComboBox), leadSpin_(new QSpinBox),
      nightLabel_(new QLabel), progress_(new QProgressBar) {
  setWindowTitle(QStringLiteral("Curvebench"));

  auto *controls = new QHBoxLayout;
  auto *prev = new QToolButton;
  prev->setText(QStringLiteral("◀"));
  prev->setToolTip(QStringLiteral("Previous night (Alt+Left)"));
  prev->setShortcut(QKeySequence(Qt::ALT | Qt::Key_Left));
  auto *next = new QToolButton;
  next->setText(QStringLiteral("▶"));
  next->setToolTip(QStringLiteral("Next night (Alt+Right)"));
  next->setShortcut(QKeySequence(Qt::ALT | Qt::Key_Right));
  nightEdit_->setDisplayFormat(QStringLiteral("ddd d MMM yyyy"));
  nightEdit_->setCalendarPopup(true);
  segmentCombo_->setSizeAdjustPolicy(QComboBox::AdjustToContents);
  leadSpin_->setRange(7, 365);
  leadSpin_->setValue(120);
  leadSpin_->setSuffix(QStringLiteral(" days"));
  controls->addWidget(new QLabel(QStringLiteral("Night")));
  controls->addWidget(prev);
  controls->addWidget(nightEdit_);
  controls->addWidget(next);
  controls->addSpacing(12);
  controls->addWidget(new QLabel(QStringLiteral("Segment")));
  controls->addWidget(segmentCombo_);
  controls->addSpacing(12);
  controls->addWidget(new QLabel(QStringLiteral("Booking window shown")));
  controls->addWidget(leadSpin_);
  controls->addStretch();

  auto *right = new QWidget;
  auto *rightLayout = new QVBoxLayout(right);
  rightLayout->addLayout(controls);
  rightLayout->addWidget(nightLabel_);
  rightLayout->addWidget(chart_, 1);

  auto *split = new QSplitter;
  split->addWidget(summary_);
  split->addWidget(right);
  split->setStretchFactor(1, 1);
  summary_->setMinimumWidth(250);
  setCentralWidget(split);

  progress_->setRange(0, 0);
  progress_->setMaximumWidth(160);
  progress_->hide();
  statusBar()->addPermanentWidget(progress_);

  connect(prev, &QToolButton::clicked, this,
          [this] { nightEdit_->setDate(nightEdit_->date().addDays(-1)); });
  connect(next, &QToolButton::clicked, this,
          [this] { nightEdit_->setDate(nightEdit_->date().addDays(1)); });
  connect(nightEdit_, &QDateEdit::dateChanged, this, [this] { refreshChart(); });
  connect(segmentCombo_, &QComboBox::currentIndexChanged, this, [this] { refreshChart(); });
  connect(leadSpin_, &QSpinBox::valueChanged, this, [this] { refreshChart(); });
  resize(1200, 720);
}

MainWindow::~MainWindow() = default;

void MainWindow::setBusy(const QString &what) {
  progress_->show();
  statusBar()->showMessage(what);
  centralWidget()->setEnabled(false);
}

void MainWindow::setIdle(const QString &message) {
  progress_->hide();
  statusBar()->showMessage(message);
  centralWidget()->setEnabled(true);
}

void MainWindow::openStore(const std::filesystem::path &store) {
  startLoad(store, false,
            QStringLiteral("Opening %1 …").arg(QString::fromStdString(store.string())));
}

void MainWindow::buildSampleAndOpen(const std::filesystem::path &store) {
  startLoad(store, true, QStringLiteral("Building the sample property (first run only) …"));
}

void MainWindow::startLoad(const std::filesystem::path &store, bool buildSampleFirst,
                           const QString &what) {
  setBusy(what);
  auto *watcher = new QFutureWatcher<LoadResult>(this);
  connect(watcher, &QFutureWatcher<LoadResult>::finished, this, [this, watcher] {
    LoadResult r = watcher->result();
    watcher->deleteLater();
    if (auto *msg = std::get_if<QString>(&r)) {
      setIdle(*msg);
      emit loadFailed(*msg);
      return;
    }
    auto shared = std::get<std::shared_ptr<WorkbenchSession>>(r);
    // The session was made for this window alone; take it over from the shared holder.
    setSession(std::make_unique<WorkbenchSession>(std::move(*shared)));
  });
  watcher->setFuture(QtConcurrent::run(
      [store, buildSampleFirst] { return loadSession(store, buildSampleFirst); }));
}

void MainWindow::setSession(std::unique_ptr<WorkbenchSession> session) {
  session_ = std::move(session);
  summary_->showSession(*session_);
  setWindowTitle(
      QStringLiteral("Curvebench — %1").arg(QString::fromStdString(session_->property().name)));
  {
    QSignalBlocker block(segmentCombo_);
    segmentCombo_->clear();
    segmentCombo_->addItem(QStringLiteral("All segments"), QString());
    for (const auto &s : session_->segments()) {
      QString code = QString::fromStdString(s.code);
      QString name = s.name.empty()
                         ? code
                         : QStringLiteral("%1 (%2)").arg(QString::fromStdString(s.name), code);
      segmentCombo_->addItem(name, code);
    }
  }
  setIdle(QStringLiteral("%1 reservations loaded; data as of %2")
              .arg(QString::fromStdString(cb::formatCount(session_->summary().reservations)),
                   QString::fromStdString(session_->readingDate().toIso())));
  {
    QSignalBlocker block(nightEdit_);
    nightEdit_->setDate(toQDate(session_->defaultNight()));
  }
  refreshChart();
  emit sessionLoaded();
}

void MainWindow::showNight(cb::Date night) { nightEdit_->setDate(toQDate(night)); }

void MainWindow::refreshChart() {
  if (!session_)
    return;
  cb::Date night = fromQDate(nightEdit_->date());
  std::string segment = segmentCombo_->currentData().toString().toStdString();
  NightCurves c = session_->curves(night, leadSpin_->value(), segment);
  chart_->showCurves(c);
  auto valueAt = [](const CurveSeries &series, int lead) -> std::optional<int> {
    for (std::size_t i = 0; i < series.x.size(); ++i)
      if (static_cast<int>(-series.x[i]) == lead)
        return static_cast<int>(series.y[i]);
    return std::nullopt;
  };
  int lead = c.readingLead.value_or(0);
  QString thisText = c.thisYear.y.empty()
                         ? QStringLiteral("not yet on sale in the window shown")
                         : QStringLiteral("%1 rooms").arg(static_cast<int>(c.thisYear.y.back()));
  auto lastAtLead = valueAt(c.lastYear, lead);
  auto lastFinal = valueAt(c.lastYear, 0);
  QString when =
      c.readingLead
          ? QStringLiteral("%1 days before arrival, on the books: %2").arg(lead).arg(thisText)
          : QStringLiteral("past night, final: %1").arg(thisText);
  QString last =
      QStringLiteral("Same night last year (%1): %2 at the same point")
          .arg(QString::fromStdString(c.lastYearNight.toIso()),
               lastAtLead ? QStringLiteral("%1 rooms").arg(*lastAtLead) : QStringLiteral("–"));
  if (c.readingLead && lastFinal)
    last += QStringLiteral(", final %1 rooms").arg(*lastFinal);
  nightLabel_->setText(
      QStringLiteral("<b>%1</b> — %2. %3.")
          .arg(nightEdit_->date().toString(QStringLiteral("dddd d MMMM yyyy")), when, last));
}

} // namespace cbui
