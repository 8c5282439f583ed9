#pragma once
// Writes an import's reservations into the store on a thread of its own, so reading and checking
// the next rows of the file overlaps SQLite's work on the last ones. Into a new store a million
// rows spent about a third of the import in SQLite (measured with perf), all of it on the one
// thread that also parsed the file.
//
// The writer only calls Store::upsertReservation; the caller must not touch the store between
// construction and finish() or abandon() (one SQLite connection, used by one thread at a time).
// Rows are handed over in batches, a few batches ahead at most, so memory stays bounded.
#include "core/reservation.h"
#include "core/store.h"
#include <condition_variable>
#include <cstdint>
#include <deque>
#include <exception>
#include <functional>
#include <mutex>
#include <thread>
#include <vector>

namespace cb {

class ReservationWriter {
public:
  struct Counts {
    std::int64_t added = 0;
    std::int64_t updated = 0;
    std::int64_t unchanged = 0;
  };
  /// Called on the writer's thread with each row the store took (added or updated), in order.
  using WrittenSink = std::function<void(Reservation &&)>;

  /// `threaded` false writes each row at add() (the same results, one thread): for tests, and
  /// when no thread can be had.
  ReservationWriter(Store &store, std::int64_t importId, WrittenSink sink, bool threaded = true);
  ~ReservationWriter(); ///< abandon()
  ReservationWriter(const ReservationWriter &) = delete;
  ReservationWriter &operator=(const ReservationWriter &) = delete;

  /// Queues one row (`stored`: the store already holds its id). Rethrows, here or at the next
  /// add(), what the store threw on the writer's thread; nothing more is written after it.
  void add(Reservation &&r, bool stored);
  /// The same, with `digest` = digestOf(r) already worked out by the caller.
  void add(Reservation &&r, bool stored, const ReservationDigest &digest);
  /// Writes what is queued, stops the thread and returns the counts; rethrows the writer's error.
  Counts finish();
  /// Stops without writing what is still queued (the caller rolls back); never throws.
  void abandon() noexcept;
  bool threaded() const { return thread_.joinable(); }

private:
  struct Row {
    Reservation r;
    bool stored = false;
    ReservationDigest digest; ///< digestOf(r), worked out in add(), on the caller's thread
  };
  using Batch = std::vector<Row>;
  static constexpr std::size_t kBatchRows = 4096;
  static constexpr std::size_t kBatchesAhead = 4;

  void write(Row &row);
  void run() noexcept;
  void hand(bool last);
  void rethrowIfFailed();

  Store &store_;
  std::int64_t importId_;
  WrittenSink sink_;
  Counts counts_;
  Batch filling_;
  std::mutex mutex_;
  std::condition_variable changed_;
  std::deque<Batch> queue_;    ///< guarded by mutex_
  std::vector<Batch> spare_;   ///< emptied batches handed back for reuse; guarded by mutex_
  bool closing_ = false;       ///< guarded by mutex_: no batch will follow
  bool stop_ = false;          ///< guarded by mutex_: abandoned, drop the queue (set on the
                               ///< caller's thread, so add() never waits on it)
  std::exception_ptr failure_; ///< guarded by mutex_
  std::thread thread_;
};

} // namespace cb
