#include "core/reservationimporter.h"

#include "core/csvreader.h"
#include "core/keptcube.h"
#include "core/largememory.h"
#include "core/mappingprofile.h"
#include "core/nativeformat.h"
#include "core/reservationsnapshot.h"
#include "core/reservationwriter.h"
#include "core/sha256.h"

#include <date/date.h>
#include <fmt/format.h>

#include <algorithm>
#include <cerrno>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstring>
#include <functional>
#include <limits>
#include <memory>
#include <new>
#include <optional>
#include <streambuf>
#include <string_view>
#include <system_error>
#include <thread>
#include <utility>
#include <vector>

namespace cb {
namespace {

/// A file whose bytes are hashed as the CSV reader pulls them, so a large extract is read once.
/// Built on std::FILE rather than std::ifstream: the stream cannot tell a read error from the
/// end of the file, and errno must be captured right after fopen() for an honest message.
class HashingFileBuf : public std::streambuf {
public:
  explicit HashingFileBuf(const std::filesystem::path &path) : buf_(64 * 1024) {
    errno = 0;
    file_ = std::fopen(path.c_str(), "rb");
    if (!file_)
      error_ = errno;
  }
  ~HashingFileBuf() override {
    if (file_)
      std::fclose(file_);
  }
  HashingFileBuf(const HashingFileBuf &) = delete;
  HashingFileBuf &operator=(const HashingFileBuf &) = delete;

  bool isOpen() const { return file_ != nullptr; }
  /// errno of the failed open or of the first failed read; 0 when all went well.
  int error() const { return error_; }
  bool readFailed() const { return file_ && error_ != 0; }
  /// Hashes whatever the reader did not consume (it stops early on a fatal problem).
  std::string finishDigest() {
    while (underflow() != traits_type::eof())
      setg(buf_.data(), egptr(), egptr());
    return hash_.hexDigest();
  }

protected:
  int_type underflow() override {
    if (gptr() < egptr())
      return traits_type::to_int_type(*gptr());
    if (!file_ || error_ != 0)
      return traits_type::eof();
    errno = 0;
    std::size_t n = std::fread(buf_.data(), 1, buf_.size(), file_);
    if (n == 0) {
      if (std::ferror(file_))
        error_ = errno != 0 ? errno : EIO;
      return traits_type::eof();
    }
    hash_.update(std::string_view(buf_.data(), n));
    setg(buf_.data(), buf_.data(), buf_.data() + n);
    return traits_type::to_int_type(*gptr());
  }

private:
  std::FILE *file_ = nullptr;
  int error_ = 0;
  std::vector<char> buf_;
  Sha256 hash_;
};

/// What an import knows of one reservation id: whether the store holds it (and its digest) and
/// where this file used it first.
struct IdState {
  std::string id;
  ReservationDigest stored;
  bool inStore = false;
  std::int64_t line = 0; ///< where this file used the id first; 0 = not yet
};

/// Every id the store holds and every id read so far, looked up once per row. Hand-written open
/// addressing over one vector of states: std::unordered_map costs an allocation and a cache miss
/// per node, which at a million ids was a fifth of a re-import (measured with perf); the
/// Debian packages we use offer no flat hash map (Boost 1.74 predates unordered_flat_map).
/// A re-imported extract lists its ids in the order the store first took them, so the state
/// after the last one found is tried first, and the hash slots are only built at the first miss.
class IdIndex {
public:
  explicit IdIndex(std::size_t expected) : expected_(expected) { states_.reserve(expected); }
  /// `more` ids to come on top of those expected so far.
  void expect(std::size_t more) {
    expected_ += more;
    states_.reserve(expected_);
  }

  void addStored(std::string &&id, const ReservationDigest &digest) {
    states_.push_back(IdState{std::move(id), digest, true, 0});
    noteLargest(states_.size() - 1);
  }
  /// Instead of addStored() for every stored id: an id met for the first time is looked up in
  /// `stored` (which must outlive this index).
  void lookUpStoredIn(const SnapshotDigests *stored) { stored_ = stored; }

  /// The state of `id`, added (not in the store, not yet used) when new.
  IdState &operator[](std::string_view id) {
    if (next_ < states_.size() && states_[next_].id == id)
      return states_[next_++];
    // An id beyond the largest known is new without a lookup: a first extract lists its ids in
    // ascending order, and hashing each one into the slots was the import's largest single cost
    // after SQLite (measured with perf). The slots catch up at the next lookup that needs them.
    // (Not with the stored ids elsewhere: the largest known is then only the largest read.)
    if (!stored_ && (states_.empty() || id > states_[largest_].id)) {
      states_.push_back(IdState{std::string(id), {}, false, 0});
      largest_ = states_.size() - 1;
      next_ = states_.size();
      return states_.back();
    }
    std::size_t k = find(id);
    if (k == states_.size()) {
      const std::optional<ReservationDigest> stored =
          stored_ ? stored_->find(id) : std::optional<ReservationDigest>();
      states_.push_back(
          IdState{std::string(id), stored.value_or(ReservationDigest{}), stored.has_value(), 0});
      place(k);
      noteLargest(k);
    }
    next_ = k + 1;
    return states_[k];
  }

private:
  /// Index of `id` in states_, or states_.size() when absent; indexes every state first.
  std::size_t find(std::string_view id) {
    if (slots_.empty() || (states_.size() + 1) * 2 > slots_.size()) {
      std::size_t n = 16;
      while (n < std::max(expected_, states_.size() + 1) * 2)
        n *= 2;
      slots_.assign(n, 0);
      indexed_ = 0;
    }
    while (indexed_ < states_.size())
      place(indexed_);
    const std::size_t mask = slots_.size() - 1;
    for (std::size_t i = std::hash<std::string_view>{}(id)&mask;; i = (i + 1) & mask) {
      const std::uint32_t slot = slots_[i];
      if (slot == 0)
        return states_.size();
      if (states_[slot - 1].id == id)
        return slot - 1;
    }
  }
  void place(std::size_t k) {
    const std::size_t mask = slots_.size() - 1;
    std::size_t i = std::hash<std::string_view>{}(states_[k].id) & mask;
    while (slots_[i] != 0)
      i = (i + 1) & mask;
    slots_[i] = static_cast<std::uint32_t>(k + 1);
    indexed_ = k + 1;
  }

  void noteLargest(std::size_t k) {
    if (k == 0 || states_[k].id > states_[largest_].id)
      largest_ = k;
  }

  std::size_t expected_;
  std::vector<IdState> states_;
  std::size_t largest_ = 0;          ///< the state with the largest id, when states_ is not empty
  std::vector<std::uint32_t> slots_; ///< 1 + index into states_; 0 = empty
  std::size_t indexed_ = 0;          ///< states_[0, indexed_) are in slots_
  std::size_t next_ = 0;             ///< the state tried first by the next lookup
  const SnapshotDigests *stored_ = nullptr;
};

std::string nowUtc() {
  return date::format("%FT%TZ",
                      std::chrono::floor<std::chrono::seconds>(std::chrono::system_clock::now()));
}

// Enough to fix a file by; the rest are counted (and all of them go to the rejects file).
constexpr int kMaxRowFindings = 1000;
// Progress is reported this often (rows), as the brief's long-work rule asks.
constexpr std::int64_t kProgressEvery = 4096;

/// The rejected rows of a lenient import: the original fields plus a "problem" column.
/// std::FILE for the same reason as HashingFileBuf: errno right after open, and a close that
/// reports a failed final flush (a full disk shows up only there).
class RejectsWriter {
public:
  RejectsWriter() = default;
  RejectsWriter(const RejectsWriter &) = delete;
  RejectsWriter &operator=(const RejectsWriter &) = delete;
  ~RejectsWriter() {
    if (out_)
      std::fclose(out_);
  }

  /// False with error() set when the file cannot be created.
  bool open(const std::filesystem::path &path, const CsvRecord &header) {
    path_ = path;
    errno = 0;
    out_ = std::fopen(path.c_str(), "wb");
    if (!out_) {
      error_ = errno;
      return false;
    }
    write(header, "problem");
    return true;
  }
  bool isOpen() const { return out_ != nullptr; }
  int error() const { return error_; }
  void write(const CsvRecord &rec, std::string_view problem) {
    line_.clear();
    for (const auto &f : rec.fields)
      line_ += quoteCsvField(f.text) + ',';
    line_ += quoteCsvField(problem) + '\n';
    errno = 0;
    if (std::fwrite(line_.data(), 1, line_.size(), out_) != line_.size() && error_ == 0)
      error_ = errno != 0 ? errno : EIO;
  }
  /// False with error() set when any write or the final flush failed.
  bool close() {
    errno = 0;
    const bool closed = std::fclose(out_) == 0;
    out_ = nullptr;
    if (!closed && error_ == 0)
      error_ = errno != 0 ? errno : EIO;
    return error_ == 0;
  }
  /// Closes and removes a half-written rejects file; never removes anything but a regular file
  /// (the path may name a device such as /dev/stdout).
  void discard() {
    if (out_) {
      std::fclose(out_);
      out_ = nullptr;
    }
    std::error_code ec;
    if (std::filesystem::is_regular_file(path_, ec))
      std::filesystem::remove(path_, ec);
  }

private:
  std::filesystem::path path_;
  std::FILE *out_ = nullptr;
  int error_ = 0;
  std::string line_;
};

/// The physical line of a finding at 1-based field `column`: a field after an embedded newline
/// sits on a later line than its record starts. A column past the last field (a short row) is
/// where the row ended; column 0 (the whole row) is where it began.
std::int64_t lineOfColumn(const CsvRecord &rec, int column) {
  if (column <= 0 || rec.fields.empty())
    return rec.line;
  const auto i = std::min(static_cast<std::size_t>(column), rec.fields.size()) - 1;
  return rec.fields[i].line;
}

/// validateReservation() decides what is wrong and which native field is at fault; the phrase
/// is made here so that it names the column as the user's file calls it, and names it once
/// ("booked_on 2026-05-02 is after arrival 2026-05-01", not "booked_on: booked on …").
std::string validationMessage(const Reservation &r, const std::string &field,
                              const std::string &fallback, const MappingProfile &profile) {
  auto name = [&](std::string_view f) { return profile.columnName(f); };
  if (field == "departure")
    return fmt::format("{} {} is before {} {}", name("departure"), r.departure.toIso(),
                       name("arrival"), r.arrival.toIso());
  if (field == "booked_on")
    return fmt::format("{} {} is after {} {}", name("booked_on"), r.bookedOn.toIso(),
                       name("arrival"), r.arrival.toIso());
  if (field == "cancelled_on") {
    if (r.status == ReservationStatus::Cancelled && !r.cancelledOn)
      return fmt::format("{} is cancelled but {} is empty", name("status"), name("cancelled_on"));
    if (r.status != ReservationStatus::Cancelled && r.cancelledOn)
      return fmt::format("{} {} is set but {} is {}", name("cancelled_on"), r.cancelledOn->toIso(),
                         name("status"), statusName(r.status));
    if (r.cancelledOn)
      return fmt::format("{} {} is before {} {}", name("cancelled_on"), r.cancelledOn->toIso(),
                         name("booked_on"), r.bookedOn.toIso());
  }
  if (field == "rooms")
    return r.rooms < 0 ? fmt::format("{} is negative ({})", name("rooms"), r.rooms)
                       : fmt::format("{} is {}; a reservation holds at least one room",
                                     name("rooms"), r.rooms);
  if (field == "rate")
    return std::isfinite(r.rate) ? fmt::format("{} is negative ({})", name("rate"), r.rate)
                                 : fmt::format("{} is not a finite number", name("rate"));
  return fallback;
}

} // namespace

// What is written, by kind of problem:
// - Row-level problems (a bad value, a wrong field count, a duplicate id, a truncated last row):
//   strict writes nothing; lenient writes the valid rows and reports (and copies) the rejects.
// - File-level problems write nothing even with --lenient, because then no row can be trusted
//   to have been read as the user meant: invalid UTF-8, a semicolon- or tab-separated file, an
//   unterminated quote, an oversized record, a bad header (missing or repeated column), an empty
//   file or one with a header only.
// - I/O and usage problems (the file, the profile or the rejects file cannot be opened, read,
//   parsed or written) write nothing and set ImportReport::ioOrUsageError.
// Counts: a strict import that fails writes nothing, so its log row keeps rows read and rejected
// but shows 0 added / updated / unchanged. Progress reports (bytes read, file size) so a bar can
// move smoothly; it is called every kProgressEvery rows and once at the end.
ImportReport importReservations(Store &store, const std::filesystem::path &file,
                                const ImportOptions &options) {
  ImportReport rep;
  ImportLogEntry &log = rep.log;
  Findings &findings = rep.findings;
  const std::string label = file.string();
  const bool lenient = options.mode == ImportMode::Lenient;
  log.file = std::filesystem::absolute(file).lexically_normal().string();
  log.kind = "reservations";
  log.profile = options.profile.empty() ? "native" : options.profile;
  log.mode = lenient ? "lenient" : "strict";
  log.startedAt = nowUtc();

  auto fileError = [&](std::int64_t line, int column, std::string message) {
    findings.push_back(Finding{Severity::Error, label, line, column, std::move(message)});
  };
  auto ioError = [&](std::string message) {
    fileError(0, 0, std::move(message));
    rep.ioOrUsageError = true;
  };
  // Declared before tx: ends (back to the write-ahead log) after the commit or roll-back.
  std::optional<Store::DirectWrite> direct;
  std::optional<Store::Transaction> tx;
  // Declared after tx: stopped before the transaction rolls back, whichever way we leave.
  std::optional<ReservationWriter> writer;
  RejectsWriter rejects;
  HashingFileBuf input(file);
  auto failed = [&]() -> ImportReport & {
    writer.reset(); // stops the writer's thread: the store is ours again
    tx.reset();     // rolls back
    direct.reset();
    if (rejects.isOpen())
      rejects.discard();
    if (input.isOpen())
      log.sha256 = input.finishDigest();
    log.added = log.updated = log.unchanged = 0;
    log.finishedAt = nowUtc();
    if (!options.dryRun)
      log.id = store.logFailedImport(log);
    return rep;
  };

  auto profile = options.profileText.empty()
                     ? MappingProfile::load(log.profile, findings)
                     : MappingProfile::parse(options.profileText, log.profile, findings);
  if (!profile) {
    rep.ioOrUsageError = true; // an unknown or broken profile is a usage error, not data
    return failed();
  }
  std::error_code statusError;
  if (std::filesystem::is_directory(file, statusError)) {
    ioError("cannot open the file: it is a folder");
    return failed();
  }
  if (!input.isOpen()) {
    ioError(fmt::format("cannot open the file: {}", std::strerror(input.error())));
    return failed();
  }
  auto readFailed = [&] {
    if (!input.readFailed())
      return false;
    ioError(fmt::format("cannot read the file: {}", std::strerror(input.error())));
    return true;
  };
  std::error_code sizeError;
  const auto fileSize = static_cast<std::int64_t>(std::filesystem::file_size(file, sizeError));
  std::istream in(&input);
  CsvReader::Options readerOptions;
  readerOptions.delimiter = profile->delimiter();
  CsvReader reader(in, label, readerOptions);

  CsvRecord header;
  if (!reader.next(header)) {
    if (readFailed())
      return failed();
    if (reader.fatal())
      findings.push_back(*reader.fatal());
    return failed();
  }
  if (!profile->bind(header, label, findings))
    return failed();
  if (lenient && options.rejectsFile && !options.dryRun &&
      !rejects.open(*options.rejectsFile, header)) {
    ioError(fmt::format("cannot write the rejects file {}: {}", options.rejectsFile->string(),
                        std::strerror(rejects.error())));
    return failed();
  }

  // The first import into a store writes all of it: each page once, not through the log and
  // then the checkpoint (Store::DirectWrite; with the other changes of that round, 4.5-4.9 s ->
  // 3.2-3.6 s for a million rows, measured).
  if (!options.dryRun && !store.hasReservations())
    direct.emplace(store);
  tx.emplace(store);
  log.id = store.beginImport(log);
  const std::uint64_t stampBefore = store.reservationStamp();
  // Asked again inside the transaction: the answer before it only picks the journal, this one
  // decides what the snapshot is written from (another program may have imported in between).
  // Not count(*): without an index beside it that reads the whole table (schema 9).
  const bool emptyBefore = !store.hasReservations();
  std::vector<Reservation> written;
  // Into an empty store, digestOf of each kept row, in the same order: the snapshot stores them,
  // and working them out again there was an eighth of its writing time at a million rows.
  std::vector<ReservationDigest> writtenDigests;
  // Not for a dry run (nothing is written), and given up without failing the import when memory
  // runs short: the snapshot is only a cache.
  bool writtenComplete = !options.dryRun;
  auto giveUpSnapshot = [&] {
    writtenComplete = false;
    std::vector<Reservation>().swap(written);
    std::vector<ReservationDigest>().swap(writtenDigests);
  };
  try {
    if (emptyBefore && writtenComplete) { // about one row per 80 bytes of a native file;
      const auto rows = static_cast<std::size_t>(std::max<std::int64_t>(fileSize, 0) / 80);
      reserveLarge(written, rows); // growing the vector cost 5 % of the import
      reserveLarge(writtenDigests, rows);
    }
  } catch (const std::bad_alloc &) {
    giveUpSnapshot();
  }
  const std::string idName = profile->sourceName("reservation_id");
  const int idColumn = profile->sourceColumn("reservation_id");
  // Every id the store holds (with its digest) and every id read so far (with its line): an
  // unchanged row costs no query, a new one goes straight to INSERT, and a duplicate id within
  // the file is found in the same lookup. About one id per 64 bytes of file, on top of the
  // stored ones, so the index rarely grows.
  const auto fileRows = static_cast<std::size_t>(std::max<std::int64_t>(fileSize, 0) / 64);
  IdIndex ids(fileRows);
  std::int64_t storedBefore = 0;
  // A small file against a large store (a daily extract: a few hundred rows against a million)
  // looks each of its ids up in the snapshot in place; copying every stored id into the index
  // first was most of such an import (measured: 0.25 s of 0.7 s at a million rows). A file of
  // more than a sixteenth of the store copies them: one lookup per row then costs more.
  std::unique_ptr<SnapshotDigests> storedLookup;
  if (!emptyBefore)
    storedLookup = SnapshotDigests::open(snapshotPathFor(store.path()), stampBefore,
                                         16 * std::max<std::size_t>(fileRows, 1));
  if (storedLookup) {
    ids.lookUpStoredIn(storedLookup.get());
    storedBefore = static_cast<std::int64_t>(storedLookup->size());
  } else {
    store.visitReservationDigests(
        [&](std::string &&id, const ReservationDigest &digest) {
          ids.addStored(std::move(id), digest);
          ++storedBefore;
        },
        [&](std::size_t rows) { ids.expect(rows); });
  }
  // The rows written, kept to bring the store's snapshot up to date after the commit
  // (core/reservationsnapshot.h) without reading a million rows back. Into an empty store they
  // are all kept (they are the whole snapshot: 232 MB at a million rows); else beyond a quarter
  // of the store (or 100,000 rows) they are not, and the next read rebuilds the snapshot.
  const std::size_t keepAtMost =
      emptyBefore ? std::numeric_limits<std::size_t>::max()
                  : static_cast<std::size_t>(std::max<std::int64_t>(100000, storedBefore / 4));
  auto keep = [&](auto &&row, const ReservationDigest *digest) {
    if (!writtenComplete)
      return;
    try {
      if (written.size() < keepAtMost) {
        written.push_back(std::forward<decltype(row)>(row));
        if (digest)
          writtenDigests.push_back(*digest);
      } else {
        giveUpSnapshot();
      }
    } catch (const std::bad_alloc &) {
      giveUpSnapshot();
    }
  };
  // Into an empty store the writer adds every row it is handed (ids are unique within the file,
  // checked below), so this thread keeps a copy of each as it hands it over: the writer's thread
  // is the slower of the two, and first touching the kept rows' 232 MB (page faults) was 7 % of
  // its work at a million rows (perf). Else only the writer knows which rows the store took.
  // From here to writer->finish() the store belongs to the writer's thread.
  writer.emplace(store, log.id,
                 emptyBefore ? ReservationWriter::WrittenSink()
                             : ReservationWriter::WrittenSink(
                                   [&](Reservation &&row) { keep(std::move(row), nullptr); }));
  bool rowErrors = false;
  std::int64_t listed = 0, unlisted = 0;
  CsvRecord rec;
  Reservation r;
  std::vector<RowProblem> problems;
  while (reader.next(rec)) {
    ++log.rowsRead;
    problems.clear();
    IdState *idState = nullptr; // valid until the next row: the index may grow
    if (!rec.problem.empty()) {
      problems.push_back(RowProblem{rec.problemField, rec.problem});
    } else if (rec.size() != header.size()) {
      problems.push_back(RowProblem{
          static_cast<int>(std::min(rec.size(), header.size()) + 1),
          fmt::format("the row has {} fields but the header has {}", rec.size(), header.size())});
    } else {
      problems = profile->map(rec, r);
      if (problems.empty()) {
        std::string field;
        std::string message = validateReservation(r, &field);
        if (!message.empty())
          problems.push_back(RowProblem{profile->sourceColumn(field),
                                        validationMessage(r, field, message, *profile)});
      }
      if (!r.id.empty()) {
        idState = &ids[r.id];
        if (idState->line != 0)
          problems.push_back(RowProblem{
              idColumn, fmt::format("{} \"{}\" was already used on line {}; ids must be unique "
                                    "within a file",
                                    idName, r.id, idState->line)});
        else
          idState->line = lineOfColumn(rec, idColumn);
      }
    }

    if (problems.empty()) {
      const ReservationDigest digest = digestOf(r);
      if (idState && idState->inStore && idState->stored == digest) {
        ++log.unchanged; // the same as stored: nothing to write
      } else if (lenient || !rowErrors) {
        if (emptyBefore)
          keep(std::as_const(r), &digest);
        writer->add(std::move(r), idState && idState->inStore, digest); // map() fills r afresh
      }
    } else {
      rowErrors = true;
      ++log.rejected;
      std::string joinedProblems;
      for (auto &p : problems) {
        joinedProblems += (joinedProblems.empty() ? "" : "; ") + p.message;
        if (listed++ < kMaxRowFindings)
          findings.push_back(Finding{Severity::Error, label, lineOfColumn(rec, p.column), p.column,
                                     std::move(p.message)});
        else
          ++unlisted;
      }
      if (rejects.isOpen())
        rejects.write(rec, joinedProblems);
    }

    if (options.progress && log.rowsRead % kProgressEvery == 0 &&
        !options.progress(options.progressContext, reader.bytesConsumed(), fileSize)) {
      rep.cancelled = true;
      findings.push_back(Finding{
          Severity::Info, label, 0, 0,
          fmt::format("import cancelled after {} rows; nothing was written", log.rowsRead)});
      return failed();
    }
  }

  // No id is looked up any more: the snapshot's mapping can go before the commit and the update.
  ids.lookUpStoredIn(nullptr);
  storedLookup.reset();
  if (readFailed())
    return failed();
  {
    const ReservationWriter::Counts counts = writer->finish();
    writer.reset();
    // The rows kept on this thread are those handed over; into an empty store every one of them
    // is added. Should that ever not hold, the snapshot is not written from them.
    if (emptyBefore && writtenComplete &&
        (counts.updated != 0 || written.size() != static_cast<std::size_t>(counts.added) ||
         writtenDigests.size() != written.size()))
      giveUpSnapshot();
    log.added += counts.added;
    log.updated += counts.updated;
    log.unchanged += counts.unchanged;
  }
  if (unlisted > 0)
    findings.push_back(Finding{Severity::Error, label, 0, 0,
                               fmt::format("{} more problems are not listed here", unlisted)});
  if (reader.fatal()) {
    findings.push_back(*reader.fatal());
    return failed();
  }
  if (log.rowsRead == 0) {
    fileError(header.line, 0, "the file has a header line but no reservations");
    return failed();
  }
  if (rowErrors && !lenient) {
    findings.push_back(
        Finding{Severity::Info, label, 0, 0,
                fmt::format("{} of {} rows rejected; strict import: nothing was written",
                            log.rejected, log.rowsRead)});
    return failed();
  }
  if (rejects.isOpen() && !rejects.close()) {
    // The rows are not written either: the user would lose track of the rejects otherwise.
    ioError(fmt::format("cannot write the rejects file {}: {}", options.rejectsFile->string(),
                        std::strerror(rejects.error())));
    return failed();
  }
  if (options.progress)
    options.progress(options.progressContext, fileSize, fileSize);
  log.sha256 = input.finishDigest();
  log.finishedAt = nowUtc();
  if (options.dryRun) {
    tx.reset(); // rolls back: a validation writes nothing
    return rep;
  }
  store.finishImport(log);
  const std::uint64_t stampAfter = store.reservationStamp(); // this import's own stamp
  // The snapshot is written on a second thread while SQLite commits (the commit writes the
  // whole transaction out; the snapshot needs only the rows in hand). Should the commit fail,
  // the snapshot carries a stamp the store never shows, so it is never read.
  struct Join {
    std::thread &t;
    ~Join() {
      if (t.joinable())
        t.join();
    }
  };
  std::thread snapshotWriter;
  if (stampAfter != stampBefore && writtenComplete) {
    try {
      snapshotWriter = std::thread([&, snapshot = snapshotPathFor(store.path()),
                                    cubeFile = keptCubePathFor(store.path())]() noexcept {
        // The kept cube from the same rows (core/keptcube.h): the commands that read the total
        // curves then need neither the rows nor a pass over them.
        auto keepCube = [&](const auto &rows) {
          try {
            if (const std::optional<KeptCube> kept = keptCubeOf(rows))
              writeKeptCube(cubeFile, stampAfter, *kept);
          } catch (...) {
            // Only a cache, as the snapshot: the next command that needs it builds it.
          }
        };
        try {
          if (emptyBefore) {
            // The snapshot is in id order. Extracts mostly come in it already: checking costs
            // one pass, sorting sorted rows cost 0.26 s at a million (measured).
            const std::vector<ReservationDigest> *digests = &writtenDigests;
            const auto byId = [](const Reservation &a, const Reservation &b) {
              return a.id < b.id;
            };
            if (!std::is_sorted(written.begin(), written.end(), byId)) {
              std::sort(written.begin(), written.end(), byId);
              digests = nullptr; // in the file's order: the snapshot works them out again
            }
            // The kept cube on one more thread while this one writes the snapshot: the commit,
            // on the importing thread, is over before either (measured at a million rows:
            // commit 0.3 s, snapshot 0.5 s, cube 0.12 s), so the second core is free.
            bool cubeOnThread = false;
            std::thread cube;
            {
              Join joinCube{cube};
              try {
                cube = std::thread([&]() noexcept { keepCube(written); });
                cubeOnThread = true;
              } catch (...) {
                // No thread to be had: the cube is built after the snapshot, on this one.
              }
              writeReservationSnapshot(snapshot, stampAfter, written, digests);
            }
            if (!cubeOnThread)
              keepCube(written);
          } else {
            updateReservationSnapshot(
                snapshot, stampBefore, stampAfter, std::move(written),
                [&](std::span<const ReservationFacts> rows) { keepCube(rows); });
          }
        } catch (...) {
          // Only a cache (out of memory, say): the next read rebuilds it from the store.
        }
      });
    } catch (...) {
      // No thread (or no memory for its path) to be had: the import goes on without the
      // snapshot, and the next read rebuilds it.
    }
  }
  Join join{snapshotWriter};
  tx->commit();
  rep.written = true;
  return rep;
}

} // namespace cb
