#include "ui/mainwindow.h"

#include "core/datahealth.h"
#include "core/reservationimporter.h"
#include "core/samplestore.h"
#include "core/store.h"
#include "core/textformat.h"
#include "ui/accuracypanel.h"
#include "ui/datapanel.h"
#include "ui/datestudypanel.h"
#include "ui/findingspanel.h"
#include "ui/groupofferpanel.h"
#include "ui/horizonpanel.h"
#include "ui/importjob.h"
#include "ui/morningbrief.h"
#include "ui/propertyeditorpanel.h"
#include "ui/propertysummarypanel.h"
#include "ui/segmentcomparepanel.h"
#include "ui/workbenchsession.h"
#include "ui/yearmappanel.h"

#include <QAction>
#include <QCloseEvent>
#include <QDateEdit>
#include <QDockWidget>
#include <QDragEnterEvent>
#include <QDropEvent>
#include <QFileDialog>
#include <QFutureWatcher>
#include <QLabel>
#include <QMenu>
#include <QMenuBar>
#include <QMimeData>
#include <QProgressBar>
#include <QSettings>
#include <QShortcut>
#include <QStatusBar>
#include <QTabWidget>
#include <QTimer>
#include <QToolBar>
#include <QToolButton>
#include <QUrl>
#include <QtConcurrent/QtConcurrentRun>

#include <algorithm>
#include <atomic>
#include <stdexcept>
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
QSettings settings() {
  return QSettings(QStringLiteral("Curvebench"), QStringLiteral("curvebench"));
}
const QString kDateFormat = QStringLiteral("ddd d MMM yyyy");

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
    : QMainWindow(parent), tabs_(new QTabWidget), horizon_(new HorizonPanel),
      propertyEditor_(new PropertyEditorPanel), summary_(propertyEditor_->summaryPanel()),
      compare_(new SegmentComparePanel), yearMap_(new YearMapPanel), dateStudy_(new DateStudyPanel),
      accuracy_(new AccuracyPanel), data_(new DataPanel), asOfEdit_(new QDateEdit),
      asOfNote_(new QLabel), progress_(new QProgressBar),
      findingsDock_(new QDockWidget(QStringLiteral("Findings"))), findings_(new FindingsPanel),
      findingsButton_(new QToolButton), cancelImport_(new QToolButton), readOnlyLabel_(new QLabel) {
  setWindowTitle(QStringLiteral("Curvebench"));
  setAcceptDrops(true);

  // The reading date, prominent: every figure on every screen is as of this date.
  auto *bar = addToolBar(QStringLiteral("Reading date"));
  bar->setObjectName(QStringLiteral("readingDateBar"));
  bar->setMovable(false);
  auto *asOfLabel = new QLabel(QStringLiteral("  As of "));
  QFont big = asOfLabel->font();
  big.setPointSizeF(big.pointSizeF() * 1.25);
  big.setBold(true);
  asOfLabel->setFont(big);
  asOfEdit_->setFont(big);
  asOfEdit_->setObjectName(QStringLiteral("asOfEdit"));
  asOfEdit_->setDisplayFormat(kDateFormat);
  asOfEdit_->setCalendarPopup(true);
  asOfEdit_->setToolTip(
      QStringLiteral("Reading date: the data as it stood at the end of this day"));
  asOfEdit_->setEnabled(false);
  bar->addWidget(asOfLabel);
  bar->addWidget(asOfEdit_);
  bar->addWidget(asOfNote_);

  tabs_->addTab(horizon_, QStringLiteral("Horizon"));
  tabs_->addTab(dateStudy_, QStringLiteral("Date Study"));
  tabs_->addTab(compare_, QStringLiteral("Segment Compare"));
  tabs_->addTab(yearMap_, QStringLiteral("Year Map"));
  tabs_->addTab(accuracy_, QStringLiteral("Accuracy"));
  groupOffer_ = new GroupOfferPanel;
  tabs_->addTab(groupOffer_, QStringLiteral("Group offer"));
  tabs_->addTab(data_, QStringLiteral("Data"));
  tabs_->addTab(propertyEditor_, QStringLiteral("Property"));
  const char *tips[] = {
      "The next nights at a glance",
      "One night in depth",
      "Segments side by side: curves, booking window, rate by lead, this year vs last year",
      "A whole year of nights by season class or demand",
      "How well each forecast method did on this property",
      "A group's offer against the transient business it would displace, night by night",
      "Import files step by step, the import log and the data's health",
      "The property: capacity, room types, segments, channels, seasons, costs, events"};
  for (int i = 0; i < tabs_->count(); ++i)
    tabs_->setTabToolTip(i,
                         QStringLiteral("%1 (Ctrl+%2)").arg(QString::fromUtf8(tips[i])).arg(i + 1));
  setCentralWidget(tabs_);

  findingsDock_->setObjectName(QStringLiteral("findingsDock"));
  findingsDock_->setWidget(findings_);
  addDockWidget(Qt::BottomDockWidgetArea, findingsDock_);
  findingsDock_->hide();

  progress_->setRange(0, 0);
  progress_->setMaximumWidth(160);
  progress_->hide();
  cancelImport_->setText(QStringLiteral("Cancel import"));
  cancelImport_->hide();
  findingsButton_->setText(QStringLiteral("No findings"));
  findingsButton_->setToolTip(
      QStringLiteral("Import errors and data-health findings (show or hide)"));
  findingsButton_->setAutoRaise(true);
  statusBar()->addPermanentWidget(progress_);
  statusBar()->addPermanentWidget(cancelImport_);
  readOnlyLabel_->setStyleSheet(QStringLiteral("QLabel { background: #fff3d6; padding: 0 6px; }"));
  readOnlyLabel_->hide();
  statusBar()->addPermanentWidget(readOnlyLabel_);
  statusBar()->addPermanentWidget(findingsButton_);
  connect(findingsButton_, &QToolButton::clicked, this,
          [this] { findingsDock_->setVisible(!findingsDock_->isVisible()); });
  connect(cancelImport_, &QToolButton::clicked, this, &MainWindow::cancelImport);
  connect(findings_, &FindingsPanel::countChanged, this, [this](int attention) {
    const int all = findings_->count();
    findingsButton_->setText(all == 0         ? QStringLiteral("No findings")
                             : attention == 0 ? QStringLiteral("%1 notes").arg(all)
                                              : QStringLiteral("⚠ %1 findings").arg(all));
  });
  data_->setFindingsPanel(findings_);
  connect(data_, &DataPanel::findingsRequested, this, [this] { findingsDock_->show(); });
  connect(data_, &DataPanel::storeWritten, this, [this] {
    if (session_)
      openStore(session_->path());
  });
  connect(findings_, &FindingsPanel::nightRequested, this, [this](const QDate &night) {
    showNight(fromQDate(night));
    showScreen(DateStudyScreen);
  });

  for (int i = 0; i < tabs_->count(); ++i) {
    auto *sc = new QShortcut(QKeySequence(Qt::CTRL | static_cast<Qt::Key>(Qt::Key_1 + i)), this);
    connect(sc, &QShortcut::activated, this, [this, i] { tabs_->setCurrentIndex(i); });
  }
  buildMenus();

  connect(horizon_, &HorizonPanel::nightActivated, this, [this](const QDate &night) {
    showNight(fromQDate(night));
    showScreen(DateStudyScreen);
  });
  connect(yearMap_, &YearMapPanel::nightActivated, this, [this](const QDate &night) {
    showNight(fromQDate(night));
    showScreen(DateStudyScreen);
  });
  // Once the first screen is drawn: warm Date Study's forecasts and check the data's health.
  connect(horizon_, &HorizonPanel::outlookShown, this, [this] {
    dateStudy_->startBackgroundWork();
    startHealthCheck();
  });
  connect(dateStudy_, &DateStudyPanel::nightStepRequested, this, [this](int days) {
    if (night_.isValid())
      showNight(fromQDate(night_.addDays(days)));
  });
  connect(asOfEdit_, &QDateEdit::dateChanged, this, [this](const QDate &date) {
    if (session_ && fromQDate(date) != session_->readingDate())
      setReadingDate(fromQDate(date));
  });
  // A property edit changes what every screen computes: reload once the edits pause.
  auto *reload = new QTimer(this);
  reload->setSingleShot(true);
  reload->setInterval(700);
  connect(reload, &QTimer::timeout, this, &MainWindow::reloadAfterEdit);
  connect(propertyEditor_, &PropertyEditorPanel::storeWritten, reload, qOverload<>(&QTimer::start));
  connect(tabs_, &QTabWidget::currentChanged, this, [this](int i) {
    // By name: an index would point at another screen once screens are added.
    settings().setValue(QStringLiteral("window/screenName"), screenNames().value(i));
    refreshLazyScreens();
  });

  resize(1366, 740);
  QSettings s = settings();
  restoreGeometry(s.value(QStringLiteral("window/geometry")).toByteArray());
  restoreState(s.value(QStringLiteral("window/state")).toByteArray());
  tabs_->setCurrentIndex(
      std::max(0, screenFromName(s.value(QStringLiteral("window/screenName")).toString())));
}

MainWindow::~MainWindow() {
  // Date Study's background jobs read the session: stop them while it is still alive (the
  // panels, children of the window, are destroyed after its members).
  dateStudy_->setSession(nullptr);
  accuracy_->setSession(nullptr);
  horizon_->setSession(nullptr);
  compare_->setSession(nullptr);
  yearMap_->setSession(nullptr);
  groupOffer_->setSession(nullptr);
}

void MainWindow::refreshLazyScreens() {
  if (!session_)
    return;
  if (compareStale_ && tabs_->currentWidget() == compare_) {
    compareStale_ = false;
    compare_->setSession(session_.get());
  }
  if (yearMapStale_ && tabs_->currentWidget() == yearMap_) {
    yearMapStale_ = false;
    yearMap_->setSession(session_.get());
  }
}

void MainWindow::buildMenus() {
  QMenu *file = menuBar()->addMenu(QStringLiteral("&File"));
  QAction *open = file->addAction(QStringLiteral("&Open store…"));
  open->setShortcut(QKeySequence::Open);
  connect(open, &QAction::triggered, this, [this] {
    QString path =
        QFileDialog::getOpenFileName(this, QStringLiteral("Open a Curvebench store"), QString(),
                                     QStringLiteral("Curvebench stores (*.curvebench);;"
                                                    "All files (*)"));
    if (!path.isEmpty())
      openStore(std::filesystem::path(path.toStdString()));
  });
  QAction *import = file->addAction(QStringLiteral("&Import reservations…"));
  connect(import, &QAction::triggered, this, [this] {
    QString path = QFileDialog::getOpenFileName(this, QStringLiteral("Import reservations (CSV)"),
                                                QString(), QStringLiteral("CSV files (*.csv)"));
    if (!path.isEmpty())
      importCsv(std::filesystem::path(path.toStdString()));
  });
  QAction *brief = file->addAction(QStringLiteral("Morning &brief (PDF)…"));
  connect(brief, &QAction::triggered, this, [this] {
    const QString done =
        session_ ? saveMorningBriefAs(this, *session_) : QStringLiteral("Open a store first");
    if (!done.isEmpty())
      statusBar()->showMessage(done);
  });
  recentMenu_ = file->addMenu(QStringLiteral("Open &recent"));
  rebuildRecentMenu();
  file->addSeparator();
  QAction *quit = file->addAction(QStringLiteral("&Quit"));
  quit->setShortcut(QKeySequence::Quit);
  connect(quit, &QAction::triggered, this, &QWidget::close);

  QMenu *edit = menuBar()->addMenu(QStringLiteral("&Edit"));
  edit->addAction(propertyEditor_->undoAction()); // the Property screen's edits, while shown
  edit->addAction(propertyEditor_->redoAction());

  QMenu *view = menuBar()->addMenu(QStringLiteral("&View"));
  for (int i = 0; i < tabs_->count(); ++i)
    connect(view->addAction(QStringLiteral("%1\tCtrl+%2").arg(tabs_->tabText(i)).arg(i + 1)),
            &QAction::triggered, this, [this, i] { tabs_->setCurrentIndex(i); });
  view->addAction(findingsDock_->toggleViewAction());
}

void MainWindow::rebuildRecentMenu() {
  recentMenu_->clear();
  const QStringList recent = settings().value(QStringLiteral("recentStores")).toStringList();
  for (const QString &path : recent)
    connect(recentMenu_->addAction(path), &QAction::triggered, this,
            [this, path] { openStore(std::filesystem::path(path.toStdString())); });
  recentMenu_->setEnabled(!recent.isEmpty());
}

void MainWindow::closeEvent(QCloseEvent *event) {
  QSettings s = settings();
  s.setValue(QStringLiteral("window/geometry"), saveGeometry());
  s.setValue(QStringLiteral("window/state"), saveState());
  QMainWindow::closeEvent(event);
}

void MainWindow::dragEnterEvent(QDragEnterEvent *event) {
  for (const QUrl &url : event->mimeData()->urls())
    if (url.isLocalFile() &&
        url.toLocalFile().endsWith(QStringLiteral(".csv"), Qt::CaseInsensitive)) {
      event->acceptProposedAction();
      return;
    }
}

void MainWindow::dropEvent(QDropEvent *event) {
  for (const QUrl &url : event->mimeData()->urls())
    if (url.isLocalFile() &&
        url.toLocalFile().endsWith(QStringLiteral(".csv"), Qt::CaseInsensitive)) {
      event->acceptProposedAction();
      importCsv(std::filesystem::path(url.toLocalFile().toStdString()));
      return;
    }
}

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

void MainWindow::cancelImport() {
  if (!importControl_)
    return;
  importControl_->cancel = true;
  statusBar()->showMessage(QStringLiteral("Cancelling the import …"));
}

void MainWindow::startHealthCheck() {
  if (!session_ || healthChecked_)
    return;
  healthChecked_ = true;
  const std::filesystem::path store = session_->path();
  auto *watcher = new QFutureWatcher<cb::Findings>(this);
  connect(watcher, &QFutureWatcher<cb::Findings>::finished, this, [this, watcher, store] {
    const cb::Findings found = watcher->result();
    watcher->deleteLater();
    if (!session_ || session_->path() != store)
      return; // another store was opened meanwhile
    findings_->setFindings(QStringLiteral("health"),
                           QStringLiteral("Data health of %1: %2 finding(s)")
                               .arg(QString::fromStdString(store.filename().string()))
                               .arg(found.size()),
                           found);
    data_->setHealthFindings(found);
  });
  // A store handle of its own: the check reads while the screens use the session.
  watcher->setFuture(QtConcurrent::run([store]() -> cb::Findings {
    try {
      return cb::checkDataHealth(*cb::Store::open(store));
    } catch (const std::exception &e) {
      return {cb::Finding{cb::Severity::Warning, store.string(), 0, 0,
                          std::string("data health not checked: ") + e.what()}};
    }
  }));
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

void MainWindow::reloadAfterEdit() {
  if (!session_)
    return;
  const cb::Date asOf = session_->readingDate();
  const QDate night = night_;
  connect(
      this, &MainWindow::sessionLoaded, this,
      [this, asOf, night] {
        if (session_->readingDate() != asOf)
          setReadingDate(asOf);
        if (night.isValid())
          showNight(fromQDate(night));
      },
      Qt::SingleShotConnection);
  startLoad(session_->path(), false, QStringLiteral("Property saved; recomputing the screens …"));
}

void MainWindow::importCsv(const std::filesystem::path &file) {
  if (session_ && !readOnlyReason_.isEmpty()) {
    statusBar()->showMessage(QStringLiteral("Not imported: %1").arg(readOnlyReason_), 10000);
    emit importFinished(false);
    return;
  }
  if (!session_ || importing_) {
    statusBar()->showMessage(session_ ? QStringLiteral("An import is already running")
                                      : QStringLiteral("Open a store first, then drop the CSV"),
                             8000);
    if (!session_)
      emit importFinished(false);
    return;
  }
  importing_ = true;
  const std::filesystem::path store = session_->path();
  importControl_ = std::make_shared<ImportControl>();
  progress_->setRange(0, 0);
  progress_->show();
  cancelImport_->show();
  const QString name = QString::fromStdString(file.filename().string());
  statusBar()->showMessage(QStringLiteral("Importing %1 …").arg(name));
  // The progress bar follows the importer's row count (its total is the file size estimate).
  auto *poll = new QTimer(this);
  connect(poll, &QTimer::timeout, this, [this, control = importControl_] {
    const auto total = control->total.load(), done = control->done.load();
    if (total > 0) {
      progress_->setRange(0, 1000);
      progress_->setValue(static_cast<int>(std::min<std::int64_t>(1000, done * 1000 / total)));
    }
  });
  poll->start(100);
  auto *watcher = new QFutureWatcher<ImportJobOutcome>(this);
  connect(watcher, &QFutureWatcher<ImportJobOutcome>::finished, this,
          [this, watcher, store, name, poll] {
            const ImportJobOutcome o = watcher->result();
            const cb::ImportReport &r = o.report;
            watcher->deleteLater();
            poll->deleteLater();
            importing_ = false;
            importControl_.reset();
            cancelImport_->hide();
            progress_->setRange(0, 0);
            findings_->setFindings(
                QStringLiteral("import"),
                QStringLiteral("Import of %1: %2 finding(s)").arg(name).arg(r.findings.size()),
                r.findings);
            if (!r.findings.empty())
              findingsDock_->show();
            setIdle(o.summary);
            emit importFinished(r.written);
            if (r.written)
              openStore(store);
          });
  auto control = importControl_;
  watcher->setFuture(QtConcurrent::run([store, file, control] {
    return runImportJob(store, file, ImportKind::Reservations, {}, control.get());
  }));
}

void MainWindow::setSession(std::unique_ptr<WorkbenchSession> session) {
  dateStudy_->setSession(nullptr); // its jobs must end before the old session goes
  accuracy_->setSession(nullptr);
  session_ = std::move(session);
  healthChecked_ = false;
  propertyEditor_->showSession(*session_);
  const QString path = QString::fromStdString(session_->path().string());
  // The writer lock: kept across reloads of the same store, taken anew for another one.
  if (!writer_ || writer_->path() != session_->path()) {
    writer_.reset();
    try {
      writer_ = cb::Store::open(session_->path(), cb::Store::Access::WriterElseReadOnly);
    } catch (const std::exception &) {
      // The session itself opened; a store that cannot be locked stays writable as before.
    }
  }
  readOnlyReason_ = writer_ && writer_->readOnly()
                        ? QString::fromStdString(writer_->readOnlyReason())
                        : QString();
  const bool readOnly = !readOnlyReason_.isEmpty();
  readOnlyLabel_->setText(QStringLiteral("Read-only"));
  readOnlyLabel_->setToolTip(readOnlyReason_);
  readOnlyLabel_->setVisible(readOnly);
  data_->setReadOnly(readOnly, readOnlyReason_);
  dateStudy_->setReadOnly(readOnly, readOnlyReason_);
  propertyEditor_->setReadOnly(readOnly, readOnlyReason_);
  setWindowTitle(QStringLiteral("Curvebench — %1%2")
                     .arg(QString::fromStdString(session_->property().name),
                          readOnly ? QStringLiteral(" (read-only)") : QString()));
  {
    QSettings s = settings();
    QStringList recent = s.value(QStringLiteral("recentStores")).toStringList();
    recent.removeAll(path);
    recent.prepend(path);
    while (recent.size() > 8)
      recent.removeLast();
    s.setValue(QStringLiteral("recentStores"), recent);
  }
  rebuildRecentMenu();
  {
    QSignalBlocker block(asOfEdit_);
    asOfEdit_->setDate(toQDate(session_->readingDate()));
    asOfEdit_->setEnabled(true);
  }
  asOfNote_->setText(QStringLiteral("   newest data: %1")
                         .arg(toQDate(session_->newestActivity()).toString(kDateFormat)));
  setIdle(QStringLiteral("%1 reservations loaded; data as of %2%3")
              .arg(QString::fromStdString(cb::formatCount(session_->summary().reservations)),
                   toQDate(session_->readingDate()).toString(kDateFormat),
                   readOnly ? QStringLiteral(" · read-only: ") + readOnlyReason_ : QString()));
  horizon_->setSession(session_.get());
  dateStudy_->setSession(session_.get());
  compare_->setSession(nullptr); // the old session is gone; recomputed when shown
  yearMap_->setSession(nullptr);
  compareStale_ = yearMapStale_ = true;
  refreshLazyScreens();
  accuracy_->setSession(session_.get());
  data_->setStore(session_->path());
  groupOffer_->setSession(session_.get());
  showNight(session_->defaultNight());
  emit sessionLoaded();
}

bool MainWindow::setReadingDate(cb::Date date) {
  if (!session_)
    return false;
  // The panels let go of the session before it changes (Date Study's background jobs work on
  // copies of their own and are cancelled, not waited for).
  dateStudy_->setSession(nullptr);
  accuracy_->setSession(nullptr);
  try {
    session_->setReadingDate(date);
  } catch (const std::invalid_argument &e) {
    dateStudy_->setSession(session_.get());
    accuracy_->setSession(session_.get());
    if (night_.isValid())
      dateStudy_->setNight(fromQDate(night_));
    statusBar()->showMessage(
        QStringLiteral("Reading date not changed: %1").arg(QString::fromUtf8(e.what())), 10000);
    QSignalBlocker block(asOfEdit_);
    asOfEdit_->setDate(toQDate(session_->readingDate()));
    return false;
  }
  {
    QSignalBlocker block(asOfEdit_);
    asOfEdit_->setDate(toQDate(date));
  }
  statusBar()->showMessage(QStringLiteral("Every screen now shows the data as of %1")
                               .arg(toQDate(date).toString(kDateFormat)));
  horizon_->setSession(session_.get());
  dateStudy_->setSession(session_.get());
  compareStale_ = yearMapStale_ = true;
  refreshLazyScreens();
  accuracy_->setSession(session_.get());
  groupOffer_->setSession(session_.get());
  if (night_.isValid())
    showNight(fromQDate(night_));
  return true;
}

void MainWindow::showNight(cb::Date night) {
  night_ = toQDate(night);
  dateStudy_->setNight(night);
}

QDate MainWindow::studiedNight() const { return night_; }

QStringList MainWindow::screenNames() {
  return {
      QStringLiteral("horizon"),  QStringLiteral("date-study"), QStringLiteral("segment-compare"),
      QStringLiteral("year-map"), QStringLiteral("accuracy"),   QStringLiteral("group-offer"),
      QStringLiteral("data"),     QStringLiteral("property")};
}

int MainWindow::screenFromName(const QString &name) {
  return static_cast<int>(screenNames().indexOf(name));
}

void MainWindow::showScreen(Screen screen) { tabs_->setCurrentIndex(screen); }

MainWindow::Screen MainWindow::currentScreen() const {
  return static_cast<Screen>(tabs_->currentIndex());
}

} // namespace cbui
