// The property store: one SQLite file per property (schema in store.cpp, migrations ordered).
#pragma once

#include "core/blockrecord.h"
#include "core/reservation.h"

#include <cstdint>
#include <filesystem>
#include <functional>
#include <map>
#include <memory>
#include <optional>
#include <stdexcept>
#include <string>
#include <vector>

namespace cb {

class SqliteDb;

/// Thrown for I/O failures and refused stores (newer schema, not a Curvebench store, …).
class StoreError : public std::runtime_error {
public:
  using std::runtime_error::runtime_error;
};

/// One line of the import log.
struct ImportLogEntry {
  std::int64_t id = 0;
  std::string file;
  std::string sha256;
  std::string kind;    ///< "reservations", "blocks", …
  std::string profile; ///< "native" or the profile name
  std::string mode;    ///< "strict" or "lenient"
  std::int64_t rowsRead = 0;
  std::int64_t added = 0;
  std::int64_t updated = 0;
  std::int64_t unchanged = 0;
  std::int64_t rejected = 0;
  std::string startedAt;  ///< UTC, ISO 8601 "YYYY-MM-DDTHH:MM:SSZ"
  std::string finishedAt; ///< UTC
  /// "written" (committed), "failed" (nothing written) or "cancelled". Empty when logging means
  /// the default: "written" for beginImport/finishImport, "failed" for logFailedImport.
  std::string outcome;
};

/// An event note with its row id, so one note can be edited or deleted (core/holidaymap.h reads
/// the notes; the id is what tells two notes with the same dates and label apart).
struct StoredEvent {
  std::int64_t id = 0;
  EventNote note;
  bool operator==(const StoredEvent &) const = default;
};

/// Outcome of writing one reservation.
enum class UpsertResult { Added, Updated, Unchanged };

/// A 128-bit digest of every field of a reservation an import can change (all but the id and the
/// import that wrote it): two independent 64-bit hashes of the same bytes, so two different rows
/// share a digest with a chance of about 2^-128. An import compares digests instead of asking the
/// store row by row (Store::reservationDigests).
struct ReservationDigest {
  std::uint64_t a = 0, b = 0;
  friend bool operator==(const ReservationDigest &, const ReservationDigest &) = default;
};
ReservationDigest digestOf(const Reservation &r);

/// Counts shown by `curvebench info` and the GUI summary.
struct StoreSummary {
  std::int64_t reservations = 0;
  std::map<std::string, std::int64_t> byStatus;  ///< native status name → count
  std::map<std::string, std::int64_t> bySegment; ///< segment code → count
  std::map<std::string, std::int64_t> byChannel; ///< channel code → count
  std::int64_t dayUse = 0;
  std::optional<Date> firstArrival, lastArrival, firstBooked, lastBooked;
  /// Newest booked_on or cancelled_on: the latest reading date the data supports.
  std::optional<Date> lastActivity;
  std::int64_t blocks = 0, denials = 0, events = 0;
  bool operator==(const StoreSummary &) const = default;
};

/// A Curvebench property store. Not thread-safe: one Store per thread.
/// Every write runs inside a transaction; a batch of writes shares one via Transaction.
class Store {
public:
  static constexpr int kSchemaVersion = 9;

  /// Creates a new store file; throws StoreError if the file exists.
  static std::unique_ptr<Store> create(const std::filesystem::path &path, const Property &property);
  /// How open() shares a store with other programs.
  enum class Access {
    ReadWrite, ///< read and write; other programs may too (SQLite locks each write)
    ReadOnly,  ///< read only: every write throws StoreError; no migration (an older schema
               ///< is refused)
    /// The desktop program: read-write when no other program holds the store's writer lock
    /// (an advisory lock on "<store>.lock" beside it, released on close or crash), else
    /// read-only with readOnlyReason() saying so. The lock is held for the life of the Store.
    /// (POSIX flock; where there is none, or the lock file cannot be made, this opens
    /// read-write.)
    WriterElseReadOnly,
  };

  /// Opens an existing store. A newer schema is refused (StoreError naming both versions);
  /// an older one is migrated after copying the file to "<path>.v<old>.bak". A file that is
  /// shorter than its own header says (truncated) or not a Curvebench store is refused before
  /// anything is written; errors met later name the file and say what happened (damaged, in
  /// use by another program, disk full, read-only).
  static std::unique_ptr<Store> open(const std::filesystem::path &path,
                                     Access access = Access::ReadWrite);
  /// Test hook: creates a store at an older schema `version` (1 … kSchemaVersion), writes the
  /// property and closes it, so tests can exercise the real migration path of open().
  static void createAtVersionForTesting(const std::filesystem::path &path, const Property &property,
                                        int version);
  ~Store();
  Store(const Store &) = delete;
  Store &operator=(const Store &) = delete;

  const std::filesystem::path &path() const { return path_; }
  int schemaVersion() const;
  /// True when this Store cannot write (Access::ReadOnly, a write-protected file, or another
  /// program holding the writer lock under Access::WriterElseReadOnly).
  bool readOnly() const;
  /// Why the store is read-only, as a sentence for a status bar; empty when it is not.
  const std::string &readOnlyReason() const { return readOnlyReason_; }

  /// RAII transaction: commits on commit(), rolls back on destruction otherwise.
  class Transaction {
  public:
    explicit Transaction(Store &store);
    ~Transaction();
    void commit();
    Transaction(const Transaction &) = delete;
    Transaction &operator=(const Transaction &) = delete;

  private:
    Store &store_;
    bool done_ = false;
  };

  /// A write of the whole store at once (the first import into a store with no reservations).
  /// Through SQLite's write-ahead log every page of it is written twice: into the log at the
  /// commit, then into the file at the checkpoint (1.3 s of a 4.6 s import of a million rows).
  /// While a DirectWrite lives, this connection uses SQLite's rollback journal instead, which
  /// keeps a copy of only the pages the file held before the transaction (a handful in a new
  /// store: pages added past the file's old end are undone by cutting the file back), so each
  /// page is written once. The commit is as atomic as before: synchronous=FULL while it lives,
  /// and a crash leaves "<store>-journal", which the next read-write open rolls back before
  /// it switches the store back to the write-ahead log.
  /// Only when no other connection has the store open: SQLite needs the store to itself to
  /// switch (asked without waiting), and otherwise the write goes through the log as always
  /// (active() false). Make it outside any transaction and end it after the commit or the
  /// roll-back; its end switches back to the write-ahead log (or, should that fail, the next
  /// read-write open does).
  /// While it is active, SQLite checks no foreign keys. What an import writes then keeps them
  /// by itself: upsertReservation puts a row's codes into their tables before the row, and the
  /// import log and the reservation stamp have none. A new write under a DirectWrite must keep
  /// that promise too.
  class DirectWrite {
  public:
    explicit DirectWrite(Store &store);
    ~DirectWrite();
    bool active() const { return active_; }
    DirectWrite(const DirectWrite &) = delete;
    DirectWrite &operator=(const DirectWrite &) = delete;

  private:
    Store &store_;
    bool active_ = false;
  };

  // Property and reference data.
  Property property() const;
  void setProperty(const Property &p); ///< name, currency, capacity, changes, settings
  std::vector<RoomType> roomTypes() const;
  std::vector<Segment> segments() const;
  std::vector<Channel> channels() const;
  void upsertRoomType(const RoomType &r);
  void upsertSegment(const Segment &s);
  void upsertChannel(const Channel &c);
  /// Deletes a room type, segment or channel. Refused (StoreError naming what uses it, nothing
  /// deleted) while a reservation, block, denial, closure or forecast override still carries the
  /// code; an unknown code is refused too.
  void deleteRoomType(const std::string &code);
  void deleteSegment(const std::string &code);
  void deleteChannel(const std::string &code);

  // Reservations. upsertReservation must be called inside a Transaction; it creates missing
  // segment / channel / room-type rows (code only) so foreign keys hold. importId is the
  // import_log row that wrote it (0 = none); an unchanged row keeps its earlier importId.
  UpsertResult upsertReservation(const Reservation &r, std::int64_t importId);
  /// The same, when the caller already knows whether the id is stored (from
  /// reservationDigests): a new id is inserted at once, a stored one updated at once.
  UpsertResult upsertReservation(const Reservation &r, std::int64_t importId, bool stored);
  /// The same, with `digest` = digestOf(r) worked out by the caller (the import's writer works
  /// it out on the reading thread, which has time to spare, not on its own).
  UpsertResult upsertReservation(const Reservation &r, std::int64_t importId, bool stored,
                                 const ReservationDigest &digest);
  /// Calls `visit` with every stored reservation's id and digest, in id order: from the
  /// snapshot when it is current, else in one pass of the table. `count`, when given, is called
  /// first with the number of reservations `visit` will see (from the snapshot's header, or
  /// counted in the table).
  void visitReservationDigests(
      const std::function<void(std::string &&id, const ReservationDigest &digest)> &visit,
      const std::function<void(std::size_t rows)> &count = {}) const;
  /// Every reservation, ordered by id. Read from the snapshot beside the store when it was
  /// written for the current reservationStamp() (core/reservationsnapshot.h), else from the
  /// table, and then the snapshot is written again (unless the store is read-only).
  std::vector<Reservation> reservations() const;
  /// A random number the store replaces, in the same transaction, whenever it adds or changes a
  /// reservation (schema 8): equal stamps mean the same reservations.
  std::uint64_t reservationStamp() const;
  std::optional<Reservation> reservation(const std::string &id) const;
  std::int64_t reservationCount() const;
  /// False for a store with no reservations yet (cheaper than reservationCount() == 0).
  bool hasReservations() const;

  // Other records.
  void addGroupBlock(const GroupBlock &b);     ///< a block with the same id is replaced
  std::vector<GroupBlock> groupBlocks() const; ///< ordered by id
  /// Writes a block with its contract date and room type (schema 6), creating missing segment
  /// and room-type codes; same id = the stored block is updated when any field differs.
  /// Throws StoreError when validateBlock() refuses it.
  UpsertResult upsertBlock(const BlockRecord &b);
  std::vector<BlockRecord> blockRecords() const; ///< ordered by id
  void addDenial(const Denial &d);
  std::vector<Denial> denials() const;        ///< in the order added
  void addClosure(const SalesClosure &c);     ///< the segment row is created if missing
  std::vector<SalesClosure> closures() const; ///< ordered by night, then segment
  /// Adds an event note; returns its id. StoreError when `to` is before `from`.
  std::int64_t addEvent(const EventNote &e);
  std::vector<EventNote> events() const;         ///< ordered by first day, then in the order added
  std::vector<StoredEvent> storedEvents() const; ///< the same order, with ids
  /// Writes the note with this id: replaces it, or puts a deleted note back under its old id (so
  /// an undone delete keeps its place among notes of the same first day).
  void putEvent(std::int64_t id, const EventNote &e);
  void deleteEvent(std::int64_t id); ///< StoreError when there is no such note

  // Import log. beginImport() inserts a row and returns its id (inside the caller's
  // transaction, so a rolled-back strict import leaves no row); finishImport() fills it in.
  std::int64_t beginImport(const ImportLogEntry &e);
  void finishImport(const ImportLogEntry &e); ///< e.id must be set
  /// Logs an import that wrote nothing (strict failure) in its own transaction.
  std::int64_t logFailedImport(const ImportLogEntry &e);
  std::vector<ImportLogEntry> importLog() const;

  /// The counts of `curvebench info` and the workbench's summary: from the snapshot when it is
  /// current, else from one pass over the table.
  StoreSummary summary() const;
  /// The same from `rows`, which must be this store's reservations() (the workbench has them in
  /// memory already); the counts of blocks, denials and events are read from the store.
  StoreSummary summary(const std::vector<Reservation> &rows) const;

  /// Test hook: the store's own connection (its pragmas are per connection).
  SqliteDb &sqliteForTesting() { return *db_; }
  /// The connection, for the store's own record classes kept in other files (forecast runs and
  /// overrides, core/forecastrun.h). Same thread rule as the store.
  SqliteDb &database() { return *db_; }

private:
  Store(std::filesystem::path path, std::unique_ptr<SqliteDb> db);
  std::int64_t insertLogEntry(const ImportLogEntry &e, std::string_view defaultOutcome);
  std::vector<Reservation> reservationsFromTable() const;
  StoreSummary summaryOf(const std::vector<Reservation> &rows) const;
  StoreSummary summaryFromTable() const;
  void requireWritable() const; ///< throws StoreError with readOnlyReason() when read-only
  std::filesystem::path path_;
  std::unique_ptr<SqliteDb> db_;
  struct Statements;
  std::unique_ptr<Statements> stmts_;
  std::string readOnlyReason_;
  int lockFd_ = -1; ///< the advisory writer lock (Access::WriterElseReadOnly), -1 = none
};

} // namespace cb
