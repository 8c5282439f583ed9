#include "core/reservationwriter.h"

#include <system_error>
#include <utility>

namespace cb {

ReservationWriter::ReservationWriter(Store &store, std::int64_t importId, WrittenSink sink,
                                     bool threaded)
    : store_(store), importId_(importId), sink_(std::move(sink)) {
  if (!threaded)
    return;
  filling_.reserve(kBatchRows);
  try {
    thread_ = std::thread([this] { run(); });
  } catch (const std::system_error &) {
    // No thread to be had: every row is written at add(), as `threaded` false does.
  }
}

ReservationWriter::~ReservationWriter() { abandon(); }

void ReservationWriter::write(Row &row) {
  switch (store_.upsertReservation(row.r, importId_, row.stored, row.digest)) {
  case UpsertResult::Added: ++counts_.added; break;
  case UpsertResult::Updated: ++counts_.updated; break;
  case UpsertResult::Unchanged: ++counts_.unchanged; return;
  }
  if (sink_)
    sink_(std::move(row.r));
}

void ReservationWriter::add(Reservation &&r, bool stored) {
  const ReservationDigest digest = digestOf(r);
  add(std::move(r), stored, digest);
}

void ReservationWriter::add(Reservation &&r, bool stored, const ReservationDigest &digest) {
  if (!thread_.joinable()) {
    Row row{std::move(r), stored, digest};
    write(row);
    return;
  }
  filling_.push_back(Row{std::move(r), stored, digest});
  if (filling_.size() >= kBatchRows)
    hand(false);
}

void ReservationWriter::hand(bool last) {
  std::unique_lock lock(mutex_);
  changed_.wait(lock, [&] { return queue_.size() < kBatchesAhead || failure_; });
  if (failure_)
    std::rethrow_exception(failure_);
  if (!filling_.empty())
    queue_.push_back(std::move(filling_));
  if (last)
    closing_ = true;
  if (!spare_.empty()) {
    filling_ = std::move(spare_.back());
    spare_.pop_back();
  } else {
    filling_ = Batch();
    filling_.reserve(kBatchRows);
  }
  lock.unlock();
  changed_.notify_all();
}

void ReservationWriter::run() noexcept {
  for (;;) {
    Batch batch;
    {
      std::unique_lock lock(mutex_);
      changed_.wait(lock, [&] { return !queue_.empty() || closing_ || stop_; });
      if (stop_ || queue_.empty())
        return; // abandoned, or closing with everything written
      batch = std::move(queue_.front());
      queue_.pop_front();
    }
    changed_.notify_all(); // room in the queue
    try {
      for (Row &row : batch)
        write(row);
    } catch (...) {
      std::lock_guard lock(mutex_);
      failure_ = std::current_exception();
      queue_.clear();
      changed_.notify_all();
      return;
    }
    batch.clear(); // keeps the capacity (and the rows' strings are moved out or freed here)
    std::lock_guard lock(mutex_);
    if (spare_.size() < kBatchesAhead)
      spare_.push_back(std::move(batch));
  }
}

void ReservationWriter::rethrowIfFailed() {
  std::lock_guard lock(mutex_);
  if (failure_)
    std::rethrow_exception(failure_);
}

ReservationWriter::Counts ReservationWriter::finish() {
  if (thread_.joinable()) {
    hand(true);
    thread_.join();
    rethrowIfFailed();
  }
  return counts_;
}

void ReservationWriter::abandon() noexcept {
  if (!thread_.joinable())
    return;
  {
    std::lock_guard lock(mutex_);
    stop_ = true;
    queue_.clear();
  }
  changed_.notify_all();
  thread_.join();
}

} // namespace cb
