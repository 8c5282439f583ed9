#include "core/sqlite.h"

#include "core/store.h"

#include <fmt/format.h>
#include <sqlite3.h>

#include <limits>
#include <mutex>
#include <utility>

namespace cb {
namespace {

std::string fileOf(sqlite3 *db) {
  const char *name = db ? sqlite3_db_filename(db, "main") : nullptr;
  return name && *name ? name : "the store";
}

/// The error as a user can act on it: for the conditions a person can meet (a damaged, busy,
/// full or write-protected file) a plain sentence naming the file comes first, then SQLite's
/// own words and the SQL in brackets; anything else keeps "message (SQL: …)".
std::string describe(sqlite3 *db, int rc, std::string_view message, std::string_view sql) {
  std::string plain;
  const std::string file = fileOf(db);
  switch (rc & 0xFF) {
  case SQLITE_BUSY:
  case SQLITE_LOCKED:
    plain = fmt::format("{} is in use by another program (another Curvebench window or command "
                        "is writing to it); nothing was changed. Close the other program or wait "
                        "for it to finish, then try again",
                        file);
    break;
  case SQLITE_CORRUPT:
  case SQLITE_NOTADB:
    plain = fmt::format("{} is damaged and cannot be read safely; nothing was changed. Restore it "
                        "from a backup copy",
                        file);
    break;
  case SQLITE_FULL:
    plain = fmt::format("{}: the disk is full (or the store reached its size limit); this change "
                        "was not written. Free some space and try again",
                        file);
    break;
  case SQLITE_READONLY:
    plain = fmt::format("{} is read-only (write-protected, or opened for reading only); nothing "
                        "was written",
                        file);
    break;
  case SQLITE_IOERR:
    plain = fmt::format("{}: the disk reported a read or write error; this change was not written",
                        file);
    break;
  default: break;
  }
  if (plain.empty())
    return fmt::format("{} (SQL: {})", message, sql);
  return fmt::format("{} ({}; SQL: {})", plain, message, sql);
}

[[noreturn]] void throwError(sqlite3 *db, std::string_view sql) {
  if (!db)
    throw StoreError(fmt::format("out of memory (SQL: {})", sql));
  throw StoreError(describe(db, sqlite3_extended_errcode(db), sqlite3_errmsg(db), sql));
}

} // namespace

// ---- SqliteStatement -------------------------------------------------------------------------

SqliteStatement::SqliteStatement(sqlite3 *db, sqlite3_stmt *stmt, std::string sql)
    : db_(db), stmt_(stmt), sql_(std::move(sql)) {}

SqliteStatement::SqliteStatement(SqliteStatement &&other) noexcept
    : db_(std::exchange(other.db_, nullptr)), stmt_(std::exchange(other.stmt_, nullptr)),
      sql_(std::move(other.sql_)) {}

SqliteStatement &SqliteStatement::operator=(SqliteStatement &&other) noexcept {
  if (this != &other) {
    sqlite3_finalize(stmt_);
    db_ = std::exchange(other.db_, nullptr);
    stmt_ = std::exchange(other.stmt_, nullptr);
    sql_ = std::move(other.sql_);
  }
  return *this;
}

SqliteStatement::~SqliteStatement() { sqlite3_finalize(stmt_); }

void SqliteStatement::check(int rc) const {
  if (rc != SQLITE_OK)
    throwError(db_, sql_);
}

void SqliteStatement::bind(int index, std::int64_t value) {
  check(sqlite3_bind_int64(stmt_, index, value));
}

void SqliteStatement::bind(int index, int value) { check(sqlite3_bind_int(stmt_, index, value)); }

void SqliteStatement::bind(int index, double value) {
  check(sqlite3_bind_double(stmt_, index, value));
}

void SqliteStatement::bind(int index, std::string_view text) {
  check(sqlite3_bind_text64(stmt_, index, text.data(), text.size(), SQLITE_TRANSIENT, SQLITE_UTF8));
}

void SqliteStatement::bindBlob(int index, const void *data, std::size_t size) {
  check(sqlite3_bind_blob64(stmt_, index, data, size, SQLITE_TRANSIENT));
}

void SqliteStatement::bindUncopied(int index, std::string_view text) {
  check(sqlite3_bind_text64(stmt_, index, text.data(), text.size(), SQLITE_STATIC, SQLITE_UTF8));
}

void SqliteStatement::bindUncopiedOrNull(int index, std::string_view text) {
  if (text.empty())
    bind(index, nullptr);
  else
    bindUncopied(index, text);
}

void SqliteStatement::bindBlobUncopied(int index, const void *data, std::size_t size) {
  check(sqlite3_bind_blob64(stmt_, index, data, size, SQLITE_STATIC));
}

void SqliteStatement::bind(int index, std::nullptr_t) { check(sqlite3_bind_null(stmt_, index)); }

void SqliteStatement::bind(int index, Date day) {
  const auto iso = day.toIsoChars();
  bind(index, std::string_view(iso.data(), iso.size())); // SQLITE_TRANSIENT: copied
}

void SqliteStatement::bind(int index, const std::optional<Date> &day) {
  if (day)
    bind(index, *day);
  else
    bind(index, nullptr);
}

void SqliteStatement::bindTextOrNull(int index, std::string_view text) {
  if (text.empty())
    bind(index, nullptr);
  else
    bind(index, text);
}

bool SqliteStatement::step() {
  int rc = sqlite3_step(stmt_);
  if (rc == SQLITE_ROW)
    return true;
  if (rc == SQLITE_DONE) {
    sqlite3_reset(stmt_);
    return false;
  }
  // Take the message first so the reset cannot replace it.
  std::string message = describe(db_, rc, sqlite3_errmsg(db_), sql_);
  sqlite3_reset(stmt_);
  throw StoreError(message);
}

void SqliteStatement::reset() {
  sqlite3_reset(stmt_);
  sqlite3_clear_bindings(stmt_);
}

std::int64_t SqliteStatement::columnInt64(int column) const {
  return sqlite3_column_int64(stmt_, column);
}

int SqliteStatement::columnInt(int column) const {
  std::int64_t v = columnInt64(column);
  if (v < std::numeric_limits<int>::min() || v > std::numeric_limits<int>::max())
    throw StoreError(
        fmt::format("value {} in column {} does not fit an int (SQL: {})", v, column, sql_));
  return static_cast<int>(v);
}

double SqliteStatement::columnDouble(int column) const {
  return sqlite3_column_double(stmt_, column);
}

std::span<const unsigned char> SqliteStatement::columnBlob(int column) const {
  const auto *data = static_cast<const unsigned char *>(sqlite3_column_blob(stmt_, column));
  if (!data)
    return {};
  return {data, static_cast<std::size_t>(sqlite3_column_bytes(stmt_, column))};
}

std::string_view SqliteStatement::columnTextView(int column) const {
  const auto *text = sqlite3_column_text(stmt_, column);
  if (!text)
    return {};
  return {reinterpret_cast<const char *>(text),
          static_cast<std::size_t>(sqlite3_column_bytes(stmt_, column))};
}

std::string SqliteStatement::columnText(int column) const {
  const auto *text = sqlite3_column_text(stmt_, column);
  if (!text)
    return {};
  // Size after the text call: sqlite3_column_bytes then describes the UTF-8 form just made.
  auto size = static_cast<std::size_t>(sqlite3_column_bytes(stmt_, column));
  return std::string(reinterpret_cast<const char *>(text), size);
}

bool SqliteStatement::columnIsNull(int column) const {
  return sqlite3_column_type(stmt_, column) == SQLITE_NULL;
}

Date SqliteStatement::columnDate(int column) const {
  std::string text = columnText(column);
  auto day = Date::parseIso(text);
  if (!day)
    throw StoreError(
        fmt::format("'{}' in column {} is not a date YYYY-MM-DD (SQL: {})", text, column, sql_));
  return *day;
}

std::optional<Date> SqliteStatement::columnOptionalDate(int column) const {
  if (columnIsNull(column))
    return std::nullopt;
  return columnDate(column);
}

// ---- SqliteDb --------------------------------------------------------------------------------

SqliteDb::SqliteDb(const std::filesystem::path &path, Mode mode) : path_(path) {
  // No memory statistics: nothing reads them, and keeping them took a global mutex at every
  // allocation, about 6 % of a large import (measured with perf). sqlite3_config works only
  // before SQLite initialises, so once, before the first connection; refused (harmless) if
  // something else in the process initialised SQLite first.
  static std::once_flag configured;
  std::call_once(configured, [] { sqlite3_config(SQLITE_CONFIG_MEMSTATUS, 0); });
  int flags =
      (mode == Mode::ReadOnly ? SQLITE_OPEN_READONLY : SQLITE_OPEN_READWRITE) | SQLITE_OPEN_NOMUTEX;
  if (mode == Mode::Create)
    flags |= SQLITE_OPEN_CREATE;
  int rc = sqlite3_open_v2(path.c_str(), &db_, flags, nullptr);
  if (rc != SQLITE_OK) {
    std::string message = db_ ? sqlite3_errmsg(db_) : sqlite3_errstr(rc);
    if (db_ && (rc & 0xFF) != SQLITE_CANTOPEN)
      message = describe(db_, rc, message, "open");
    sqlite3_close_v2(db_);
    db_ = nullptr;
    throw StoreError(fmt::format("cannot open {}: {}", path.string(), message));
  }
  sqlite3_extended_result_codes(db_, 1);
  // A second program (GUI and command line on the same store) waits briefly instead of failing.
  sqlite3_busy_timeout(db_, busyMs_);
}

SqliteDb::~SqliteDb() { sqlite3_close_v2(db_); }

void SqliteDb::exec(std::string_view sql) {
  std::string text(sql); // sqlite3_exec needs a terminated string
  char *error = nullptr;
  if (int rc = sqlite3_exec(db_, text.c_str(), nullptr, nullptr, &error); rc != SQLITE_OK) {
    std::string message = error ? error : sqlite3_errmsg(db_);
    sqlite3_free(error);
    throw StoreError(describe(db_, sqlite3_extended_errcode(db_), message, sql));
  }
}

SqliteStatement SqliteDb::prepare(std::string_view sql, bool persistent) {
  sqlite3_stmt *stmt = nullptr;
  unsigned flags = persistent ? SQLITE_PREPARE_PERSISTENT : 0U;
  const char *tail = nullptr;
  int rc = sqlite3_prepare_v3(db_, sql.data(), static_cast<int>(sql.size()), flags, &stmt, &tail);
  if (rc != SQLITE_OK) {
    sqlite3_finalize(stmt);
    throwError(db_, sql);
  }
  if (!stmt) // only whitespace or comments
    throw StoreError(fmt::format("no SQL statement to prepare (SQL: {})", sql));
  return SqliteStatement(db_, stmt, std::string(sql));
}

std::int64_t SqliteDb::queryInt64(std::string_view sql) {
  auto st = prepare(sql);
  if (!st.step())
    throw StoreError(fmt::format("query returned no row (SQL: {})", sql));
  return st.columnInt64(0);
}

std::string SqliteDb::queryText(std::string_view sql) {
  auto st = prepare(sql);
  if (!st.step())
    throw StoreError(fmt::format("query returned no row (SQL: {})", sql));
  return st.columnText(0);
}

std::int64_t SqliteDb::changes() const { return sqlite3_changes64(db_); }

std::int64_t SqliteDb::lastInsertRowid() const { return sqlite3_last_insert_rowid(db_); }

bool SqliteDb::inTransaction() const { return sqlite3_get_autocommit(db_) == 0; }

bool SqliteDb::readOnly() const { return sqlite3_db_readonly(db_, "main") == 1; }

void SqliteDb::setBusyTimeout(int milliseconds) {
  sqlite3_busy_timeout(db_, milliseconds);
  busyMs_ = milliseconds;
}

} // namespace cb
