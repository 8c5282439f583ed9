// A thin RAII layer over the SQLite C API, used only by the store.
//
// Why by hand: SQLiteCpp *is* packaged in Debian 12 (libsqlitecpp-dev 3.2.1-1, checked with
// `apt-cache policy libsqlitecpp-dev`), so this is a choice, not a gap. The store needs only
// open / exec / prepare / bind / step / column; every failure must become a cb::StoreError
// carrying both sqlite3_errmsg and the SQL text; and dates travel as ISO text. That is about
// 300 lines over the C API, against one more package for the install scripts and CI plus a
// translation layer from another library's exceptions. Revisit if this file grows much.
#pragma once

#include "core/date.h"

#include <cstddef>
#include <cstdint>
#include <filesystem>
#include <optional>
#include <span>
#include <string>
#include <string_view>

struct sqlite3;
struct sqlite3_stmt;

namespace cb {

class SqliteDb;

/// A prepared statement. Parameters and columns are numbered as SQLite numbers them
/// (bind from 1, columns from 0). Every failure throws cb::StoreError with the SQL text.
/// Example: `auto st = db.prepare("SELECT count(*) FROM t WHERE d >= ?1"); st.bind(1, day);
/// st.step(); auto n = st.columnInt64(0); st.reset();`
class SqliteStatement {
public:
  SqliteStatement(SqliteStatement &&other) noexcept;
  SqliteStatement &operator=(SqliteStatement &&other) noexcept;
  SqliteStatement(const SqliteStatement &) = delete;
  SqliteStatement &operator=(const SqliteStatement &) = delete;
  ~SqliteStatement();

  void bind(int index, std::int64_t value);
  void bind(int index, int value);
  void bind(int index, double value);
  void bind(int index, std::string_view text); ///< copied, so temporaries are safe
  void bind(int index, std::nullptr_t);
  void bind(int index, Date day);                       ///< as 'YYYY-MM-DD'
  void bind(int index, const std::optional<Date> &day); ///< 'YYYY-MM-DD' or NULL
  /// Empty text is bound as NULL (optional codes such as a reservation's channel).
  void bindTextOrNull(int index, std::string_view text);
  void bindBlob(int index, const void *data, std::size_t size); ///< copied
  /// Not copied (SQLITE_STATIC): `text` must stay as it is until the statement has stepped
  /// and is bound afresh. For the statements an import runs a million times: the copies were
  /// 8 % of the writer thread's work there (perf).
  void bindUncopied(int index, std::string_view text);
  /// The same for an optional text: empty is bound as NULL.
  void bindUncopiedOrNull(int index, std::string_view text);
  void bindBlobUncopied(int index, const void *data, std::size_t size);

  /// Runs one step: true when a row is ready to read, false when done. When done the
  /// statement is reset (bindings kept) so it holds no read lock; stop early with reset().
  bool step();
  /// Resets the statement and clears all bindings.
  void reset();

  std::int64_t columnInt64(int column) const;
  int columnInt(int column) const; ///< throws if the value does not fit an int
  double columnDouble(int column) const;
  std::string columnText(int column) const; ///< NULL reads as ""
  /// The same without a copy, valid until the next step, reset or call on this column.
  std::string_view columnTextView(int column) const;
  bool columnIsNull(int column) const;
  /// The bytes of a BLOB (empty for NULL), valid until the next step, reset or column call.
  std::span<const unsigned char> columnBlob(int column) const;
  Date columnDate(int column) const; ///< throws unless the value is 'YYYY-MM-DD'
  std::optional<Date> columnOptionalDate(int column) const; ///< NULL → nullopt

  const std::string &sql() const { return sql_; }

private:
  friend class SqliteDb;
  SqliteStatement(sqlite3 *db, sqlite3_stmt *stmt, std::string sql);
  void check(int rc) const;

  sqlite3 *db_ = nullptr;
  sqlite3_stmt *stmt_ = nullptr;
  std::string sql_;
};

/// One connection to an SQLite file, closed on destruction.
class SqliteDb {
public:
  /// ReadOnly opens an existing file for reading only (writes fail with SQLITE_READONLY).
  enum class Mode { OpenExisting, Create, ReadOnly };

  /// Opens (or creates) the file read-write, or read-only with Mode::ReadOnly. Throws
  /// cb::StoreError on failure. Every error message names the file; damaged, locked, full and
  /// read-only files get a plain-language explanation before SQLite's own words.
  SqliteDb(const std::filesystem::path &path, Mode mode);
  ~SqliteDb();
  SqliteDb(const SqliteDb &) = delete;
  SqliteDb &operator=(const SqliteDb &) = delete;

  /// Runs one or more statements, discarding any rows.
  void exec(std::string_view sql);
  /// `persistent` hints SQLite that the statement will be reused many times.
  SqliteStatement prepare(std::string_view sql, bool persistent = false);
  /// First column of the first row as an integer, e.g. "PRAGMA user_version" or a count.
  std::int64_t queryInt64(std::string_view sql);
  /// First column of the first row as text, e.g. "PRAGMA journal_mode".
  std::string queryText(std::string_view sql);

  /// Rows changed by the last INSERT, UPDATE or DELETE on this connection.
  std::int64_t changes() const;
  std::int64_t lastInsertRowid() const;
  /// True while a BEGIN … COMMIT/ROLLBACK is open on this connection.
  bool inTransaction() const;
  /// True when the connection cannot write (opened read-only, or the file is write-protected).
  bool readOnly() const;
  /// How long a statement waits for another program's lock before failing (default 5 s).
  void setBusyTimeout(int milliseconds);
  int busyTimeout() const { return busyMs_; }
  const std::filesystem::path &path() const { return path_; }

private:
  std::filesystem::path path_;
  sqlite3 *db_ = nullptr;
  int busyMs_ = 5000;
};

} // namespace cb
