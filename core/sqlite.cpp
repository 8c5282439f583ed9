#include "core/sqlite.h"

#include "core/store.h"

#include <fmt/format.h>
#include <sqlite3.h>

#include <limits>
#include <utility>

namespace cb {
namespace {

[[noreturn]] void throwError(sqlite3 *db, std::string_view sql) {
  throw StoreError(fmt::format("{} (SQL: {})", db ? sqlite3_errmsg(db) : "out of memory", sql));
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

void SqliteStatement::bind(int index, std::nullptr_t) { check(sqlite3_bind_null(stmt_, index)); }

void SqliteStatement::bind(int index, Date day) { bind(index, std::string_view(day.toIso())); }

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
  std::string message = sqlite3_errmsg(db_);
  sqlite3_reset(stmt_);
  throw StoreError(fmt::format("{} (SQL: {})", message, sql_));
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
  int flags = SQLITE_OPEN_READWRITE | SQLITE_OPEN_NOMUTEX;
  if (mode == Mode::Create)
    flags |= SQLITE_OPEN_CREATE;
  int rc = sqlite3_open_v2(path.c_str(), &db_, flags, nullptr);
  if (rc != SQLITE_OK) {
    std::string message = db_ ? sqlite3_errmsg(db_) : sqlite3_errstr(rc);
    sqlite3_close_v2(db_);
    db_ = nullptr;
    throw StoreError(fmt::format("cannot open {}: {}", path.string(), message));
  }
  sqlite3_extended_result_codes(db_, 1);
  // A second program (GUI and command line on the same store) waits briefly instead of failing.
  sqlite3_busy_timeout(db_, 5000);
}

SqliteDb::~SqliteDb() { sqlite3_close_v2(db_); }

void SqliteDb::exec(std::string_view sql) {
  std::string text(sql); // sqlite3_exec needs a terminated string
  char *error = nullptr;
  if (sqlite3_exec(db_, text.c_str(), nullptr, nullptr, &error) != SQLITE_OK) {
    std::string message = error ? error : sqlite3_errmsg(db_);
    sqlite3_free(error);
    throw StoreError(fmt::format("{} (SQL: {})", message, sql));
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

} // namespace cb
