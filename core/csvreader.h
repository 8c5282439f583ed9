// Streaming RFC 4180 reader that knows where every field came from (line and column).
#pragma once

#include "core/finding.h"

#include <cstddef>
#include <cstdint>
#include <istream>
#include <optional>
#include <string>
#include <vector>

namespace cb {

/// One field of a record, with the position of its first character (the opening quote for a
/// quoted field). `column` counts characters (UTF-8 code points), 1-based, on physical line
/// `line`; a field after an embedded newline starts on a later line than its record.
struct CsvField {
  std::string text;
  std::int64_t line = 0;
  int column = 0;
  bool quoted = false;
};

/// One record (row). `line` is the physical line where it starts. `problem` is non-empty when
/// the record breaks RFC 4180 in a way the reader could recover from (e.g. text after a closing
/// quote, or a truncated last line); `problemField` is then the 1-based field number at fault.
struct CsvRecord {
  std::int64_t line = 0;
  std::vector<CsvField> fields;
  bool endedWithNewline = true;
  std::string problem;
  int problemField = 0;

  std::size_t size() const { return fields.size(); }
  const std::string &operator[](std::size_t i) const { return fields[i].text; }
};

/// Reads CSV records one at a time from a stream, in fixed-size chunks: memory holds one chunk
/// and one record (capped at Options::maxRecordBytes), however long the file.
///
/// Handles quotes, doubled quotes, embedded delimiters and newlines, CRLF / LF / CR line ends
/// and a leading UTF-8 BOM; validates UTF-8. File-level problems (empty file, semicolons,
/// invalid UTF-8, unterminated quote, oversized record) stop reading: next() returns false and
/// fatal() says why as a finding whose column is the 1-based field number.
///
/// Example:
///   CsvReader reader(in, "res.csv");
///   CsvRecord rec;
///   while (reader.next(rec)) { use(rec.line, rec[0]); }
///   if (reader.fatal()) report(*reader.fatal());
class CsvReader {
public:
  struct Options {
    char delimiter = ',';
    std::size_t chunkBytes = 64 * 1024;
    std::size_t maxRecordBytes = 1024 * 1024;
  };

  CsvReader(std::istream &in, std::string fileLabel);
  CsvReader(std::istream &in, std::string fileLabel, Options options);

  /// Reads the next non-blank record into `out` (reusing its storage). The first record is the
  /// header. Returns false at the end of the input or after a fatal problem.
  bool next(CsvRecord &out);

  /// The problem that stopped reading, if any.
  const std::optional<Finding> &fatal() const { return fatal_; }
  /// Bytes taken from the stream and processed so far (for progress).
  std::int64_t bytesConsumed() const { return consumed_; }
  /// Number of fields in the header (the first record); 0 before it is read.
  std::size_t headerSize() const { return headerSize_; }

private:
  static constexpr int kEnd = -1;    ///< get(): end of input
  static constexpr int kFailed = -2; ///< get(): fatal problem, see fatal_

  int get();
  int peek();
  bool refill();
  bool checkUtf8(unsigned char b);
  void badUtf8();
  void newLine(int c);
  void fail(std::int64_t line, int column, std::string message);
  bool checkHeader(CsvRecord &rec);
  void checkTruncated(CsvRecord &rec);

  std::istream &in_;
  std::string file_;
  Options opt_;
  std::vector<char> buf_;
  std::size_t pos_ = 0;
  std::size_t end_ = 0;
  bool eof_ = false;
  bool started_ = false;
  std::int64_t consumed_ = 0;
  std::int64_t line_ = 1; ///< physical line of the next byte
  int col_ = 1;           ///< character column of the next byte
  int utf8Need_ = 0;
  unsigned char utf8Lo_ = 0x80, utf8Hi_ = 0xBF;
  std::int64_t utf8Line_ = 0; ///< where the current multi-byte sequence started
  unsigned char utf8Lead_ = 0;
  int currentField_ = 1;  ///< 1-based field number being read, for error columns
  int fieldByte_ = 0;     ///< bytes of the current field read so far (its opening quote too)
  int utf8FieldByte_ = 0; ///< fieldByte_ of the current multi-byte sequence's first byte
  std::size_t headerSize_ = 0;
  std::int64_t records_ = 0;
  std::optional<Finding> fatal_;
};

} // namespace cb
