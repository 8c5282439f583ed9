// The Date Study's background work: forecasts of every method for the reading date (computed
// once, so a method switch reads from the cache) and the protection of the shown night, off the
// UI thread with progress and cancel. No Q_OBJECT: results come back through callbacks on the UI
// thread (QFutureWatcher).
#pragma once

#include "ui/datestudymodel.h"

#include <QFuture>
#include <QFutureWatcher>
#include <QThreadPool>

#include <atomic>

#include <deque>
#include <functional>
#include <memory>
#include <optional>
#include <string>
#include <utility>
#include <vector>

namespace cbui {

/// A protection computed for one night, reading date and method.
struct ProtectionOut {
  cb::Date night, asOf;
  std::string method;
  std::optional<cb::NightProtection> protection;
  std::string error;
};

class DateStudyJobs {
public:
  explicit DateStudyJobs(QObject *parent);
  ~DateStudyJobs();
  DateStudyJobs(const DateStudyJobs &) = delete;
  DateStudyJobs &operator=(const DateStudyJobs &) = delete;

  /// Cancels everything running without waiting for it, forgets the cache, reads `session` from
  /// now on. Each job works on its own copy of the session (they share the reservations), so
  /// the window may change or close the session at once; a cancelled job ends within a reading
  /// date of its backtest and its result is dropped.
  void reset(WorkbenchSession *session);
  /// Cancels and waits for everything running (the cache stays). Blocks: for the destructor.
  void stop();
  /// Cancels the forecast under way and empties the queue without waiting (the cache stays, the
  /// protection goes on; the futures are kept for stop()).
  void cancelForecasts();
  /// Starts the forecasts of every fast method for the session's reading date, up to `horizon`
  /// nights, `first` first — unless the cache or the work under way already reaches `lead`.
  void ensure(int lead, int horizon, const std::string &first);
  /// Queues a slow method ("auto", "mlp"), ahead of the quick ones still waiting.
  void requestSlow(const std::string &method);
  /// Methods computed only when asked for (minutes on the sample property).
  static bool isSlow(const std::string &method) { return method == "auto" || method == "mlp"; }
  /// Computes the protection of `night` by `method` for the session's reading date. While
  /// another protection runs, the latest request waits and starts when it ends; a request equal
  /// to the one under way is already coming.
  void requestProtection(cb::Date night, const std::string &method);

  std::shared_ptr<const ForecastCache> cache() const { return cache_; }
  /// Work for the current session under way or queued (a cancelled job still ending is not).
  bool forecasting() const {
    return (forecastInFlight_ && running_generation_ == generation_) || !queue_.empty();
  }
  /// A protection for the current session under way (not cancelled) or waiting to start.
  bool protecting() const { return protCurrentRunning() || pendingProt_.has_value(); }
  /// Progress: methods computed and methods asked for since the last reset of the queue.
  int done() const { return groupsDone_; }
  int total() const { return groupsTotal_; }

  std::function<void(const QString &)> onStatus;           ///< a line for the status bar
  std::function<void()> onCache;                           ///< cache() grew
  std::function<void(const ProtectionOut &)> onProtection; ///< a protection is ready
  std::function<void()> onBusyChanged;                     ///< start or end of work

private:
  /// Cancels the protection under way without waiting; its result will not be delivered.
  void cancelProtection();
  bool protCurrentRunning() const {
    return protInFlight_ && protSession_ == sessionGeneration_ && protCancel_ && !*protCancel_;
  }
  void startProtection(cb::Date night, const std::string &method);
  void protectionEnded();
  void startNext();
  void finished();
  WorkbenchSession *session_ = nullptr;
  std::shared_ptr<ForecastCache> cache_;
  std::deque<std::vector<std::string>> queue_;
  cb::Date asOf_;
  int horizon_ = 0;
  int generation_ = 0, running_generation_ = -1;
  // A job counts as under way until its watcher's finished() has been handled, not only until
  // its thread ends (QFutureWatcher::isRunning): a job started in between would replace the
  // watcher's future and its queued finished event, and the result would be lost.
  bool forecastInFlight_ = false, protInFlight_ = false;
  int sessionGeneration_ = 0, protSession_ = -1; ///< reset() counts sessions
  cb::Date protNight_, protAsOf_;                ///< of the protection under way
  std::string protMethod_;
  std::optional<std::pair<cb::Date, std::string>> pendingProt_; ///< night, method
  int groupsDone_ = 0, groupsTotal_ = 0;
  std::shared_ptr<CacheProgress> progress_;
  std::shared_ptr<std::atomic<bool>> protCancel_; ///< of the protection under way
  QFutureWatcher<ForecastCache> *watcher_;
  QFutureWatcher<ProtectionOut> *protWatcher_;
  std::vector<QFuture<ForecastCache>> running_;
  std::vector<QFuture<ProtectionOut>> protRunning_;
  // Threads of their own (one each), so the global pool stays free for Horizon's outlook and
  // store loading: the first screen is not kept waiting behind a queue of forecasts.
  QThreadPool forecastPool_, protectionPool_;
  QMetaObject::Connection forecastDone_, protectionDone_;
};

} // namespace cbui
