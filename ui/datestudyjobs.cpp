#include "ui/datestudyjobs.h"

#include "core/forecastmethod.h"

#include <QtConcurrent/QtConcurrent>

#include <algorithm>

#ifdef __linux__
#include <sys/resource.h>
#include <sys/syscall.h>
#include <unistd.h>
#endif

namespace cbui {
namespace {

// The pools' threads run at a lower priority (nice 10 on Linux): on a busy machine the UI thread
// keeps the CPU and a night switch stays quick, yet the forecasts still progress when other
// programs load the machine (idle scheduling starved them for minutes behind a compiler). The
// pools are ours alone, so the threads stay at that priority; raising it back would need
// privileges an ordinary user does not have.
void lowerThreadPriority() {
#ifdef __linux__
  thread_local bool done = false;
  if (!done) {
    setpriority(PRIO_PROCESS, static_cast<id_t>(syscall(SYS_gettid)), 10);
    done = true;
  }
#endif
}

} // namespace

DateStudyJobs::DateStudyJobs(QObject *parent)
    : watcher_(new QFutureWatcher<ForecastCache>(parent)),
      protWatcher_(new QFutureWatcher<ProtectionOut>(parent)) {
  forecastPool_.setMaxThreadCount(1);
  protectionPool_.setMaxThreadCount(1);
  forecastDone_ =
      QObject::connect(watcher_, &QFutureWatcherBase::finished, parent, [this] { finished(); });
  protectionDone_ = QObject::connect(protWatcher_, &QFutureWatcherBase::finished, parent,
                                     [this] { protectionEnded(); });
}

DateStudyJobs::~DateStudyJobs() {
  // The watchers belong to the parent and may outlive this object by a moment: no finished event
  // may reach a destroyed one.
  QObject::disconnect(forecastDone_);
  QObject::disconnect(protectionDone_);
  stop();
}

void DateStudyJobs::reset(WorkbenchSession *session) {
  cancelForecasts();
  cancelProtection();
  pendingProt_.reset();
  ++sessionGeneration_;
  cache_.reset();
  session_ = session;
}

void DateStudyJobs::cancelForecasts() {
  if (progress_)
    progress_->cancel = true;
  ++generation_;
  queue_.clear();
  std::erase_if(running_, [](const QFuture<ForecastCache> &f) { return f.isFinished(); });
}

void DateStudyJobs::cancelProtection() {
  if (protCancel_)
    *protCancel_ = true;
  std::erase_if(protRunning_, [](const QFuture<ProtectionOut> &f) { return f.isFinished(); });
}

void DateStudyJobs::stop() {
  cancelForecasts();
  cancelProtection();
  pendingProt_.reset();
  for (auto &f : running_)
    f.waitForFinished();
  running_.clear();
  for (auto &f : protRunning_)
    f.waitForFinished();
  protRunning_.clear();
}

void DateStudyJobs::ensure(int lead, int horizon, const std::string &first) {
  if (!session_ || lead < 1)
    return;
  const cb::Date asOf = session_->readingDate();
  const bool cached = cache_ && cache_->asOf == asOf && lead <= cache_->horizon;
  // forecasting() counts only the work of the current generation: the queue waiting behind a
  // cancelled job that is still ending is coming too.
  const bool coming = forecasting() && asOf_ == asOf && lead <= horizon_;
  if (cached || coming)
    return;
  // The job under way ends at its next reading date; the next one starts after it. A protection
  // for another reading date is of no use any more; one for this date goes on.
  cancelForecasts();
  if (protInFlight_ && protAsOf_ != asOf)
    cancelProtection();
  cache_.reset();
  asOf_ = asOf;
  horizon_ = horizon;
  // One method at a time, quick ones first, so the picker fills within seconds and a method
  // switch finds most methods cached. mlp (minutes on the sample) and auto run only on demand.
  static const std::vector<std::string> quickFirst = {
      "naive",       "last-year", "mavg",  "pickup-add",   "pickup-adv", "pickup-mult",
      "pace-extrap", "ses",       "blend", "holt-winters", "ar",         "regress"};
  std::vector<std::string> order = quickFirst;
  const std::string shown = isSlow(first) ? std::string("pickup-adv") : first;
  queue_.push_back({shown});
  if (isSlow(first))
    queue_.push_back({first});
  for (const auto &m : order)
    if (m != shown &&
        std::find(cb::methodNames().begin(), cb::methodNames().end(), m) != cb::methodNames().end())
      queue_.push_back({m});
  groupsDone_ = 0;
  groupsTotal_ = static_cast<int>(queue_.size());
  startNext();
}

void DateStudyJobs::requestSlow(const std::string &method) {
  if (!session_)
    return;
  for (const auto &g : queue_)
    if (g.size() == 1 && g[0] == method)
      return;
  queue_.push_front({method});
  ++groupsTotal_;
  startNext();
}

void DateStudyJobs::startNext() {
  if (queue_.empty() || forecastInFlight_) {
    if (onBusyChanged)
      onBusyChanged();
    return;
  }
  std::vector<std::string> group = queue_.front();
  queue_.pop_front();
  progress_ = std::make_shared<CacheProgress>();
  auto s = std::make_shared<const WorkbenchSession>(*session_); // the job's own copy
  auto prog = progress_;
  const cb::Date asOf = asOf_;
  const int horizon = horizon_;
  auto f = QtConcurrent::run(&forecastPool_, [s, asOf, horizon, group, prog] {
    lowerThreadPriority();
    return computeForecastCache(*s, asOf, horizon, group, prog.get());
  });
  running_.push_back(f);
  running_generation_ = generation_;
  forecastInFlight_ = true;
  watcher_->setFuture(f);
  if (onStatus)
    onStatus(isSlow(group[0])
                 ? QObject::tr("Computing %1 in the background (slow: a minute or more)…")
                       .arg(QString::fromStdString(group[0]))
                 : QObject::tr("Computing forecasts in the background: %1 (%2 of %3 methods)…")
                       .arg(QString::fromStdString(group[0]))
                       .arg(groupsDone_ + 1)
                       .arg(groupsTotal_));
  if (onBusyChanged)
    onBusyChanged();
}

void DateStudyJobs::finished() {
  forecastInFlight_ = false;
  std::erase_if(running_, [](const QFuture<ForecastCache> &f) { return f.isFinished(); });
  if (running_generation_ != generation_ || watcher_->future().resultCount() == 0) {
    startNext();
    return;
  }
  ++groupsDone_;
  ForecastCache part = watcher_->result();
  if (!part.cancelled) {
    auto merged =
        cache_ ? std::make_shared<ForecastCache>(*cache_) : std::make_shared<ForecastCache>();
    merged->asOf = part.asOf;
    merged->horizon = part.horizon;
    for (auto &[name, run] : part.runs)
      merged->runs.insert_or_assign(name, std::move(run));
    for (auto &[name, bySeries] : part.mae)
      merged->mae[name] = std::move(bySeries);
    merged->failures.insert(merged->failures.end(), part.failures.begin(), part.failures.end());
    cache_ = merged;
    if (onStatus)
      onStatus(part.failures.empty() ? QString() : QString::fromStdString(part.failures.front()));
    if (onCache)
      onCache();
  }
  startNext();
}

void DateStudyJobs::requestProtection(cb::Date night, const std::string &method) {
  if (!session_)
    return;
  if (protInFlight_) {
    const bool coming = protCurrentRunning() && protNight_ == night && protMethod_ == method &&
                        protAsOf_ == session_->readingDate();
    if (coming)
      pendingProt_.reset();
    else
      pendingProt_.emplace(night, method); // the latest request wins
    return;
  }
  startProtection(night, method);
}

void DateStudyJobs::protectionEnded() {
  // A cancelled job, or one for an earlier session, ends without a result: the screen would show
  // "cancelled", or the figures of data no longer loaded, as if they were current.
  const bool current = protCurrentRunning();
  protInFlight_ = false;
  std::erase_if(protRunning_, [](const QFuture<ProtectionOut> &f) { return f.isFinished(); });
  std::optional<ProtectionOut> out;
  if (current && protWatcher_->future().resultCount() > 0)
    out = protWatcher_->result();
  if (pendingProt_ && session_) {
    const auto [night, method] = *pendingProt_; // a copy: startProtection clears it
    startProtection(night, method);
  }
  if (onBusyChanged)
    onBusyChanged();
  if (out && onProtection)
    onProtection(*out);
}

void DateStudyJobs::startProtection(cb::Date night, const std::string &method) {
  auto s = std::make_shared<const WorkbenchSession>(*session_); // the job's own copy
  const cb::Date asOf = session_->readingDate();
  protCancel_ = std::make_shared<std::atomic<bool>>(false);
  protSession_ = sessionGeneration_;
  protNight_ = night;
  protAsOf_ = asOf;
  protMethod_ = method;
  pendingProt_.reset();
  auto f = QtConcurrent::run(&protectionPool_, [s, night, asOf, method, cancel = protCancel_] {
    lowerThreadPriority();
    ProtectionOut out{night, asOf, method, std::nullopt, {}};
    try {
      out.protection = computeProtection(*s, asOf, night, method, cancel.get());
    } catch (const std::exception &e) {
      out.error = e.what();
    }
    return out;
  });
  protRunning_.push_back(f);
  protInFlight_ = true;
  protWatcher_->setFuture(f);
  if (onBusyChanged)
    onBusyChanged();
}

} // namespace cbui
