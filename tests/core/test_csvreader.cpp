#include "core/csvreader.h"

#include "testsupport.h"

#include <gtest/gtest.h>

#include <sstream>
#include <streambuf>

using cb::CsvReader;
using cb::CsvRecord;

namespace {

struct Parsed {
  std::vector<CsvRecord> records;
  std::optional<cb::Finding> fatal;
};

Parsed parse(const std::string &bytes, std::size_t chunk = 64 * 1024) {
  std::istringstream in(bytes);
  CsvReader::Options opt;
  opt.chunkBytes = chunk;
  CsvReader reader(in, "t.csv", opt);
  Parsed p;
  CsvRecord rec;
  while (reader.next(rec))
    p.records.push_back(rec);
  p.fatal = reader.fatal();
  return p;
}

std::vector<std::string> texts(const CsvRecord &r) {
  std::vector<std::string> v;
  for (const auto &f : r.fields)
    v.push_back(f.text);
  return v;
}

using Strings = std::vector<std::string>;

} // namespace

TEST(CsvReader, QuotesDoubledQuotesAndEmbeddedComma) {
  auto p = parse("id,note,rate\n1,\"say \"\"hi\"\", then go\",9.5\n2,\"a,b\",\"\"\n");
  ASSERT_FALSE(p.fatal) << p.fatal->toString();
  ASSERT_EQ(p.records.size(), 3u);
  EXPECT_EQ(texts(p.records[1]), (Strings{"1", "say \"hi\", then go", "9.5"}));
  EXPECT_EQ(texts(p.records[2]), (Strings{"2", "a,b", ""}));
  EXPECT_TRUE(p.records[2].fields[1].quoted);
  EXPECT_FALSE(p.records[2].fields[0].quoted);
  EXPECT_TRUE(p.records[1].problem.empty());
}

TEST(CsvReader, EmbeddedNewlineKeepsLineNumbersRight) {
  auto p = parse("id,note,x\n1,\"two\nlines\",a\n2,\"three\n\nlines\",b\n3,plain,c\n");
  ASSERT_FALSE(p.fatal);
  ASSERT_EQ(p.records.size(), 4u);
  EXPECT_EQ(p.records[1].line, 2);
  EXPECT_EQ(p.records[1][1], "two\nlines");
  // the field after the embedded newline starts on line 3, character 8 ("lines",a → a)
  EXPECT_EQ(p.records[1].fields[2].line, 3);
  EXPECT_EQ(p.records[1].fields[2].column, 8);
  EXPECT_EQ(p.records[2].line, 4);
  EXPECT_EQ(p.records[2][1], "three\n\nlines");
  EXPECT_EQ(p.records[3].line, 7);
  EXPECT_EQ(p.records[3].fields[1].column, 3);
}

TEST(CsvReader, CrLfAndLfGiveTheSameRecords) {
  auto lf = parse("a,b\n1,\"x\ny\"\n2,z\n");
  auto crlf = parse("a,b\r\n1,\"x\r\ny\"\r\n2,z\r\n");
  ASSERT_FALSE(lf.fatal);
  ASSERT_FALSE(crlf.fatal);
  ASSERT_EQ(crlf.records.size(), 3u);
  EXPECT_EQ(texts(crlf.records[2]), (Strings{"2", "z"}));
  EXPECT_EQ(crlf.records[2].line, 4);
  EXPECT_EQ(lf.records[2].line, 4);
  // inside quotes the line end is kept as written
  EXPECT_EQ(crlf.records[1][1], "x\r\ny");
  EXPECT_EQ(crlf.records[1].fields[1].column, 3);
  EXPECT_EQ(texts(crlf.records[0]), (Strings{"a", "b"}));
}

TEST(CsvReader, Utf8BomIsSkipped) {
  auto p = parse("\xEF\xBB\xBF"
                 "id,x\n1,2\n");
  ASSERT_FALSE(p.fatal);
  EXPECT_EQ(p.records[0][0], "id");
  EXPECT_EQ(p.records[0].fields[0].column, 1);
  EXPECT_EQ(p.records[0].fields[1].column, 4);
}

TEST(CsvReader, ColumnsCountCharactersNotBytes) {
  // "é" is two bytes but one character, so the second field starts at character 6.
  auto p = parse("n,x\nJos\xC3\xA9,1\n\xF0\x9F\x8F\xA8,2\n");
  ASSERT_FALSE(p.fatal) << p.fatal->toString();
  EXPECT_EQ(p.records[1].fields[1].column, 6);
  EXPECT_EQ(p.records[2][0], "\xF0\x9F\x8F\xA8"); // a 4-byte character is valid
  EXPECT_EQ(p.records[2].fields[1].column, 3);
}

TEST(CsvReader, AnyChunkSizeGivesTheSameResult) {
  const std::string in = "\xEF\xBB\xBF"
                         "id,note\r\n1,\"a\r\nb \"\"q\"\"\"\r\n2,caf\xC3\xA9\r\n\r\n3,x";
  auto ref = parse(in);
  ASSERT_FALSE(ref.fatal);
  ASSERT_EQ(ref.records.size(), 4u);
  for (std::size_t chunk : {4u, 5u, 6u, 7u, 11u}) {
    auto p = parse(in, chunk);
    ASSERT_FALSE(p.fatal) << "chunk " << chunk;
    ASSERT_EQ(p.records.size(), ref.records.size()) << "chunk " << chunk;
    for (std::size_t i = 0; i < ref.records.size(); ++i) {
      EXPECT_EQ(texts(p.records[i]), texts(ref.records[i])) << "chunk " << chunk;
      EXPECT_EQ(p.records[i].line, ref.records[i].line) << "chunk " << chunk;
    }
  }
  EXPECT_EQ(ref.records[3].line, 6); // the blank line 5 is skipped but counted
}

TEST(CsvReader, NonUtf8ByteIsFatalWithLineAndField) {
  auto p = parse("id,segment\n1,ok\n2,caf\xE9\n3,x\n");
  ASSERT_TRUE(p.fatal);
  EXPECT_EQ(p.fatal->line, 3);
  EXPECT_EQ(p.fatal->column, 2);
  // The prefix's column is the field number; the text counts bytes within that field, so no
  // second "column" appears that could contradict it.
  EXPECT_EQ(p.fatal->toString(),
            "t.csv:3:2: the file is not valid UTF-8: byte 4 of field 2 (0xE9) does not begin a "
            "valid UTF-8 character; save the file as UTF-8 (in a spreadsheet: \"CSV UTF-8\")");
  EXPECT_EQ(p.records.size(), 2u);
}

TEST(CsvReader, NonUtf8ByteCountsBytesWithinItsField) {
  // "é" (2 bytes) comes first, so the bad byte is byte 5 of the field though it is the 4th
  // character; in a quoted field the opening quote is byte 1. Every chunk size agrees.
  for (std::size_t chunk : {4u, 5u, 7u, 64u}) {
    auto p = parse("a,b,c\nx,\xC3\xA9"
                   "ab\xFF,z\n",
                   chunk);
    ASSERT_TRUE(p.fatal) << chunk;
    EXPECT_EQ(p.fatal->column, 2);
    EXPECT_NE(p.fatal->message.find("byte 5 of field 2 (0xFF)"), std::string::npos)
        << p.fatal->message;
  }
  auto q = parse("a,b,c\nx,y,\"long\nnote \xC0\"\n");
  ASSERT_TRUE(q.fatal);
  EXPECT_EQ(q.fatal->line, 3); // the line of the bad byte, inside a field that began on line 2
  EXPECT_EQ(q.fatal->column, 3);
  EXPECT_NE(q.fatal->message.find("byte 12 of field 3 (0xC0)"), std::string::npos)
      << q.fatal->message;
}

TEST(CsvReader, RejectsOverlongSurrogateAndCutSequences) {
  EXPECT_TRUE(parse("a\n\xC0\xAF\n").fatal);         // overlong "/"
  EXPECT_TRUE(parse("a\n\xED\xA0\x80\n").fatal);     // UTF-16 surrogate half
  EXPECT_TRUE(parse("a\n\xF4\x90\x80\x80\n").fatal); // above U+10FFFF
  EXPECT_TRUE(parse("a\nx\xC3").fatal);              // file ends inside a character
  EXPECT_TRUE(parse("a\n\xC3,x\n").fatal);           // lead byte without continuation
  auto utf16 = parse("\xFF\xFEi\0d\0", 64);
  ASSERT_TRUE(utf16.fatal);
  EXPECT_NE(utf16.fatal->message.find("UTF-16"), std::string::npos);
}

TEST(CsvReader, UnterminatedQuoteAtEndOfFile) {
  auto p = parse("id,note\n1,fine\n2,\"never closed\n3,x\n");
  ASSERT_TRUE(p.fatal);
  EXPECT_EQ(p.fatal->toString(),
            "t.csv:3:2: field 2 opens a quote on line 3 that is never closed: the file ends "
            "inside quotes");
}

TEST(CsvReader, SemicolonSeparatedFileIsNamed) {
  auto p = parse("reservation_id;status;booked_on\nA1;booked;2026-01-01\n");
  ASSERT_TRUE(p.fatal);
  EXPECT_EQ(p.fatal->toString(),
            "t.csv:1: the file is separated by semicolons; save it as comma-separated or set "
            "\"delimiter\": \";\" in a mapping profile");
  EXPECT_TRUE(p.records.empty());
}

TEST(CsvReader, SemicolonsAreFineWithThatDelimiter) {
  std::istringstream in("a;b\n1;\"x;y\"\n");
  CsvReader::Options opt;
  opt.delimiter = ';';
  CsvReader reader(in, "t.csv", opt);
  CsvRecord rec;
  ASSERT_TRUE(reader.next(rec));
  ASSERT_TRUE(reader.next(rec));
  EXPECT_EQ(texts(rec), (Strings{"1", "x;y"}));
}

TEST(CsvReader, EmptyFile) {
  for (std::string in : {"", "\xEF\xBB\xBF", "\n\n", "\r\n"}) {
    auto p = parse(in);
    ASSERT_TRUE(p.fatal);
    EXPECT_EQ(p.fatal->toString(),
              "t.csv: the file is empty; expected a header line with column names");
  }
}

TEST(CsvReader, TruncatedLastLineIsMarked) {
  auto p = parse("a,b,c,d\n1,2,3,4\n5,6");
  ASSERT_FALSE(p.fatal);
  ASSERT_EQ(p.records.size(), 3u);
  EXPECT_TRUE(p.records[1].problem.empty());
  EXPECT_FALSE(p.records[2].endedWithNewline);
  EXPECT_EQ(p.records[2].problemField, 2);
  EXPECT_EQ(p.records[2].problem, "the last line ends without a newline and has 2 of the "
                                  "header's 4 fields; the file looks truncated (cut off)");
  // a complete last line without a newline is fine
  auto q = parse("a,b\n1,2");
  ASSERT_EQ(q.records.size(), 2u);
  EXPECT_TRUE(q.records[1].problem.empty());
}

TEST(CsvReader, StrayQuotesAreRecordProblems) {
  auto p = parse("a,b\n1,\"x\"y\n2,5\" tall\n");
  ASSERT_FALSE(p.fatal);
  EXPECT_EQ(p.records[1][1], "xy");
  EXPECT_EQ(p.records[1].problemField, 2);
  EXPECT_NE(p.records[1].problem.find("text after the closing quote of field 2"),
            std::string::npos);
  EXPECT_EQ(p.records[2].problemField, 2);
  EXPECT_NE(p.records[2].problem.find("a quote inside unquoted field 2"), std::string::npos);
}

TEST(CsvReader, OversizedRecordStops) {
  std::istringstream in("a\n\"" + std::string(5000, 'x') + "\"\n");
  CsvReader::Options opt;
  opt.maxRecordBytes = 1000;
  CsvReader reader(in, "t.csv", opt);
  CsvRecord rec;
  ASSERT_TRUE(reader.next(rec));
  EXPECT_FALSE(reader.next(rec));
  ASSERT_TRUE(reader.fatal());
  EXPECT_NE(reader.fatal()->message.find("longer than 1000 bytes"), std::string::npos);
}

namespace {

/// Produces a large CSV on demand and counts how many bytes the reader has pulled from it,
/// so the test sees how far ahead of its current record the reader reads.
class GeneratedCsv : public std::streambuf {
public:
  explicit GeneratedCsv(int rows) : rows_(rows) {}
  std::int64_t produced() const { return produced_; }

protected:
  int_type underflow() override {
    if (gptr() < egptr())
      return traits_type::to_int_type(*gptr());
    if (next_ > rows_)
      return traits_type::eof();
    line_ = next_ == 0 ? std::string("reservation_id,note,rate\n")
                       : "R" + std::to_string(next_) + ",\"row " + std::to_string(next_) +
                             ", with comma\"," + std::to_string(next_ % 500) + ".5\n";
    ++next_;
    produced_ += static_cast<std::int64_t>(line_.size());
    setg(line_.data(), line_.data(), line_.data() + line_.size());
    return traits_type::to_int_type(*gptr());
  }

private:
  int rows_;
  int next_ = 0;
  std::string line_;
  std::int64_t produced_ = 0;
};

} // namespace

TEST(CsvReader, StreamsWithBoundedMemory) {
  // 200,000 rows (~7 MB) pass through while the reader is never more than one chunk ahead of
  // the record it returns, and the record's own storage stays at one row.
  GeneratedCsv gen(200000);
  std::istream in(&gen);
  CsvReader::Options opt;
  opt.chunkBytes = 16 * 1024;
  CsvReader reader(in, "gen.csv", opt);
  CsvRecord rec;
  std::int64_t rows = 0, maxAhead = 0;
  std::size_t maxField = 0;
  std::int64_t lastLine = 0;
  std::string lastId;
  while (reader.next(rec)) {
    ++rows;
    lastLine = rec.line;
    lastId = rec[0];
    maxAhead = std::max(maxAhead, gen.produced() - reader.bytesConsumed());
    for (const auto &f : rec.fields)
      maxField = std::max(maxField, f.text.capacity());
  }
  ASSERT_FALSE(reader.fatal());
  EXPECT_EQ(rows, 200001);
  EXPECT_EQ(lastLine, 200001);
  EXPECT_EQ(lastId, "R200000");
  EXPECT_GT(gen.produced(), 6'000'000);
  EXPECT_LE(maxAhead, static_cast<std::int64_t>(opt.chunkBytes + 64));
  EXPECT_LE(maxField, 64u);
}
