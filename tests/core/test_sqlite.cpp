#include "core/sqlite.h"

#include "core/store.h"
#include "testsupport.h"

#include <cstdint>
#include <limits>
#include <string>

namespace {

using cb::Date;
using cb::SqliteDb;

/// Passes when the StoreError thrown by `f` contains every needle.
template <class F>
::testing::AssertionResult throwsStoreError(F &&f, std::initializer_list<std::string> needles) {
  try {
    f();
  } catch (const cb::StoreError &e) {
    std::string what = e.what();
    for (const auto &n : needles)
      if (what.find(n) == std::string::npos)
        return ::testing::AssertionFailure() << "message \"" << what << "\" lacks \"" << n << "\"";
    return ::testing::AssertionSuccess();
  }
  return ::testing::AssertionFailure() << "no StoreError thrown";
}

class SqliteTest : public ::testing::Test {
protected:
  cbtest::TempDir dir;
  SqliteDb db{dir / "t.sqlite", SqliteDb::Mode::Create};
};

TEST_F(SqliteTest, BindsAndReadsEveryType) {
  db.exec("CREATE TABLE t (i INTEGER, r REAL, s TEXT, d TEXT, n TEXT)");
  auto ins = db.prepare("INSERT INTO t VALUES (?1, ?2, ?3, ?4, ?5)");
  const std::int64_t big = std::numeric_limits<std::int64_t>::max();
  const std::string text("h\xC3\xB4tel \0 nul", 12); // UTF-8 and an embedded NUL survive
  ins.bind(1, big);
  ins.bind(2, 0.1);
  ins.bind(3, text);
  ins.bind(4, Date::fromYmd(2026, 3, 1));
  ins.bind(5, nullptr);
  EXPECT_FALSE(ins.step());
  EXPECT_EQ(db.changes(), 1);
  EXPECT_EQ(db.lastInsertRowid(), 1);

  auto sel = db.prepare("SELECT i, r, s, d, n, typeof(d) FROM t");
  ASSERT_TRUE(sel.step());
  EXPECT_EQ(sel.columnInt64(0), big);
  EXPECT_EQ(sel.columnDouble(1), 0.1);
  EXPECT_EQ(sel.columnText(2), text);
  EXPECT_EQ(sel.columnText(3), "2026-03-01");
  EXPECT_EQ(sel.columnDate(3), Date::fromYmd(2026, 3, 1));
  EXPECT_TRUE(sel.columnIsNull(4));
  EXPECT_EQ(sel.columnText(4), "");
  EXPECT_EQ(sel.columnOptionalDate(4), std::nullopt);
  EXPECT_EQ(sel.columnText(5), "text");
  EXPECT_FALSE(sel.step());
}

TEST_F(SqliteTest, OptionalDateAndTextOrNull) {
  db.exec("CREATE TABLE t (d TEXT, c TEXT)");
  auto ins = db.prepare("INSERT INTO t VALUES (?1, ?2)");
  ins.bind(1, std::optional<Date>{});
  ins.bindTextOrNull(2, "");
  ins.step();
  ins.reset();
  ins.bind(1, std::optional<Date>{Date::fromYmd(2024, 2, 29)});
  ins.bindTextOrNull(2, "OTA");
  ins.step();
  EXPECT_EQ(db.queryInt64("SELECT count(*) FROM t WHERE d IS NULL AND c IS NULL"), 1);
  EXPECT_EQ(db.queryInt64("SELECT count(*) FROM t WHERE d = '2024-02-29' AND c = 'OTA'"), 1);
}

TEST_F(SqliteTest, ResetClearsBindingsAndAllowsReuse) {
  db.exec("CREATE TABLE t (v INTEGER)");
  auto ins = db.prepare("INSERT INTO t VALUES (?1)", true);
  for (int i = 1; i <= 3; ++i) {
    ins.reset();
    ins.bind(1, i);
    ins.step();
  }
  ins.reset(); // bindings cleared: the next row gets NULL
  ins.step();
  EXPECT_EQ(db.queryInt64("SELECT sum(v) FROM t"), 6);
  EXPECT_EQ(db.queryInt64("SELECT count(*) FROM t WHERE v IS NULL"), 1);
}

TEST_F(SqliteTest, PrepareErrorNamesMessageAndSql) {
  EXPECT_TRUE(throwsStoreError([&] { db.prepare("SELEC 1"); }, {"syntax error", "SELEC 1"}));
  EXPECT_TRUE(throwsStoreError([&] { db.prepare("SELECT * FROM missing_table"); },
                               {"no such table: missing_table", "SELECT * FROM missing_table"}));
}

TEST_F(SqliteTest, StepErrorNamesMessageAndSqlAndStatementStaysUsable) {
  db.exec("CREATE TABLE t (k TEXT PRIMARY KEY)");
  auto ins = db.prepare("INSERT INTO t VALUES (?1)");
  ins.bind(1, "a");
  ins.step();
  ins.reset();
  ins.bind(1, "a");
  EXPECT_TRUE(throwsStoreError([&] { ins.step(); },
                               {"UNIQUE constraint failed: t.k", "INSERT INTO t VALUES (?1)"}));
  ins.reset();
  ins.bind(1, "b");
  EXPECT_FALSE(ins.step());
  EXPECT_EQ(db.queryInt64("SELECT count(*) FROM t"), 2);
}

TEST_F(SqliteTest, ExecErrorNamesMessageAndSql) {
  EXPECT_TRUE(throwsStoreError([&] { db.exec("CREATE TABLE t (a); CREATE TABLE t (b)"); },
                               {"table t already exists", "CREATE TABLE t (b)"}));
}

TEST_F(SqliteTest, BadDateAndOutOfRangeIntThrow) {
  auto st = db.prepare("SELECT '2026-13-01', 3000000000");
  ASSERT_TRUE(st.step());
  EXPECT_TRUE(throwsStoreError([&] { st.columnDate(0); }, {"'2026-13-01'", "not a date"}));
  EXPECT_TRUE(throwsStoreError([&] { st.columnInt(1); }, {"3000000000", "does not fit"}));
  EXPECT_EQ(st.columnInt64(1), 3000000000);
}

TEST_F(SqliteTest, TransactionState) {
  EXPECT_FALSE(db.inTransaction());
  db.exec("BEGIN IMMEDIATE");
  EXPECT_TRUE(db.inTransaction());
  db.exec("ROLLBACK");
  EXPECT_FALSE(db.inTransaction());
}

TEST_F(SqliteTest, StatementsMove) {
  auto a = db.prepare("SELECT 42");
  cb::SqliteStatement b = std::move(a);
  ASSERT_TRUE(b.step());
  EXPECT_EQ(b.columnInt(0), 42);
  EXPECT_EQ(b.sql(), "SELECT 42");
  auto c = db.prepare("SELECT 7");
  c = std::move(b); // the statement "SELECT 7" is finalized here
  b = db.prepare("SELECT 8");
  ASSERT_TRUE(b.step());
  EXPECT_EQ(b.columnInt(0), 8);
}

TEST(Sqlite, OpenExistingRefusesMissingFile) {
  cbtest::TempDir dir;
  EXPECT_TRUE(
      throwsStoreError([&] { SqliteDb db(dir / "none.sqlite", SqliteDb::Mode::OpenExisting); },
                       {"cannot open", "none.sqlite"}));
  EXPECT_FALSE(std::filesystem::exists(dir / "none.sqlite"));
}

} // namespace
