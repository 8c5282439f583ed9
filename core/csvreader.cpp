// Hand-written on purpose. Debian ships two C/C++ CSV libraries (`apt-cache search csv`):
// libfccp-dev (fast-cpp-csv-parser) splits the input into lines before it looks at quotes, so a
// quoted field cannot hold a newline, and it wants the column count at compile time; libcsv-dev
// (libcsv) parses quoted newlines in chunks but reports neither the line nor the position of a
// field, trims spaces by default, and neither validates UTF-8 nor skips a BOM. Import findings
// must point at file:line:column for every field and read large files in bounded memory, so the
// small state machine below does all of that in one pass.
#include "core/csvreader.h"

#include <fmt/format.h>

#include <string_view>
#include <utility>

namespace cb {
namespace {

/// What a file that is not text at all is, by its first bytes (the formats people pick by
/// mistake in an import dialog), or nullptr.
const char *binaryKind(std::string_view head) {
  auto starts = [&](std::string_view magic) { return head.substr(0, magic.size()) == magic; };
  if (starts("PK\x03\x04"))
    return "a ZIP archive (an Excel .xlsx workbook?)";
  if (starts("\xD0\xCF\x11\xE0\xA1\xB1\x1A\xE1"))
    return "an old Excel .xls workbook";
  if (starts("\x1F\x8B"))
    return "gzip-compressed (decompress it first)";
  if (starts("%PDF-"))
    return "a PDF document";
  if (starts(std::string_view("SQLite format 3\0", 16)))
    return "an SQLite database (a Curvebench store?)";
  return nullptr;
}

} // namespace

CsvReader::CsvReader(std::istream &in, std::string fileLabel)
    : CsvReader(in, std::move(fileLabel), Options{}) {}

CsvReader::CsvReader(std::istream &in, std::string fileLabel, Options options)
    : in_(in), file_(std::move(fileLabel)), opt_(options) {
  if (opt_.chunkBytes < 4)
    opt_.chunkBytes = 4; // room for a BOM in the first chunk
  buf_.resize(opt_.chunkBytes);
}

void CsvReader::fail(std::int64_t line, int column, std::string message) {
  if (!fatal_)
    fatal_ = Finding{Severity::Error, file_, line, column, std::move(message)};
}

bool CsvReader::refill() {
  if (eof_)
    return false;
  in_.read(buf_.data(), static_cast<std::streamsize>(buf_.size()));
  end_ = static_cast<std::size_t>(in_.gcount());
  pos_ = 0;
  if (end_ < buf_.size())
    eof_ = true;
  if (!started_) {
    started_ = true;
    auto u = [&](std::size_t i) { return i < end_ ? static_cast<unsigned char>(buf_[i]) : 0u; };
    if (u(0) == 0xEF && u(1) == 0xBB && u(2) == 0xBF) {
      pos_ = 3;
      consumed_ += 3;
    } else if ((u(0) == 0xFF && u(1) == 0xFE) || (u(0) == 0xFE && u(1) == 0xFF)) {
      fail(1, 1, "the file is UTF-16 encoded; save it as UTF-8 (in a spreadsheet: \"CSV UTF-8\")");
      return false;
    } else if (const char *kind = binaryKind(std::string_view(buf_.data(), end_))) {
      fail(1, 1,
           fmt::format("the file is {}, not CSV text; save the data as CSV (in a spreadsheet: "
                       "\"CSV UTF-8\")",
                       kind));
      return false;
    }
  }
  return pos_ < end_;
}

bool CsvReader::checkUtf8(unsigned char b) {
  // Well-formed UTF-8 per RFC 3629 / Unicode table 3-7: no overlongs, surrogates or > U+10FFFF.
  if (utf8Need_ == 0) {
    if (b < 0x80)
      return true;
    utf8Line_ = line_;
    utf8FieldByte_ = fieldByte_;
    utf8Lead_ = b;
    utf8Lo_ = 0x80;
    utf8Hi_ = 0xBF;
    if (b >= 0xC2 && b <= 0xDF)
      utf8Need_ = 1;
    else if (b >= 0xE0 && b <= 0xEF) {
      utf8Need_ = 2;
      if (b == 0xE0)
        utf8Lo_ = 0xA0;
      if (b == 0xED)
        utf8Hi_ = 0x9F;
    } else if (b >= 0xF0 && b <= 0xF4) {
      utf8Need_ = 3;
      if (b == 0xF0)
        utf8Lo_ = 0x90;
      if (b == 0xF4)
        utf8Hi_ = 0x8F;
    } else {
      badUtf8();
      return false;
    }
    return true;
  }
  if (b < utf8Lo_ || b > utf8Hi_) {
    badUtf8();
    return false;
  }
  utf8Lo_ = 0x80;
  utf8Hi_ = 0xBF;
  --utf8Need_;
  return true;
}

// The finding's column is the field number, like every other finding; the text places the
// byte within that field in bytes, so it cannot be mistaken for a second column number.
void CsvReader::badUtf8() {
  fail(utf8Line_, currentField_,
       fmt::format("the file is not valid UTF-8: byte {} of field {} (0x{:02X}) does not begin a "
                   "valid UTF-8 character; save the file as UTF-8 (in a spreadsheet: \"CSV "
                   "UTF-8\")",
                   utf8FieldByte_, currentField_, utf8Lead_));
}

int CsvReader::get() {
  if (pos_ == end_ && !refill()) {
    if (fatal_)
      return kFailed;
    if (utf8Need_ > 0) {
      badUtf8();
      return kFailed;
    }
    return kEnd;
  }
  auto b = static_cast<unsigned char>(buf_[pos_++]);
  ++consumed_;
  ++fieldByte_;
  if (b == 0) {
    // Text never holds byte 0: the file is binary, or UTF-16 without its byte-order mark.
    fail(line_, currentField_,
         fmt::format("byte {} of field {} is a NUL (0x00): the file is not CSV text (UTF-16 "
                     "without a byte-order mark, or a binary file); save it as UTF-8 CSV",
                     fieldByte_, currentField_));
    return kFailed;
  }
  if (!checkUtf8(b))
    return kFailed;
  if ((b & 0xC0) != 0x80)
    ++col_;
  return b;
}

int CsvReader::peek() {
  if (pos_ == end_ && !refill())
    return kEnd;
  return static_cast<unsigned char>(buf_[pos_]);
}

void CsvReader::newLine(int c) {
  if (c == '\r' && peek() == '\n')
    get();
  ++line_;
  col_ = 1;
}

bool CsvReader::next(CsvRecord &out) {
  if (fatal_)
    return false;
  for (;;) {
    out.fields.clear();
    out.problem.clear();
    out.problemField = 0;
    out.endedWithNewline = true;
    out.line = line_;
    currentField_ = 1;
    enum class State { Start, Unquoted, Quoted, QuoteSeen } st = State::Start;
    bool any = false;
    std::size_t bytes = 0;
    auto beginField = [&] {
      CsvField &f = out.fields.emplace_back();
      f.line = line_;
      f.column = col_;
      fieldByte_ = 0;
    };
    auto problem = [&](std::string msg) {
      if (out.problem.empty()) {
        out.problem = std::move(msg);
        out.problemField = currentField_;
      }
    };
    beginField();
    bool endOfRecord = false;
    while (!endOfRecord) {
      // The common case taken a run at a time: plain ASCII inside an unquoted field, with no
      // UTF-8 sequence open. Each byte counts exactly as get() would count it (consumed, field
      // byte, column, record length), so findings point at the same places; anything else
      // (quotes, delimiters, line ends, NUL, non-ASCII, a refill) goes through get() below.
      // Measured with perf: appending byte by byte was a fifth of re-importing 1M rows.
      if ((st == State::Start || st == State::Unquoted) && utf8Need_ == 0 && pos_ < end_ &&
          bytes < opt_.maxRecordBytes) {
        const std::size_t limit = std::min(end_, pos_ + (opt_.maxRecordBytes - bytes));
        std::size_t run = pos_;
        while (run < limit) {
          const auto b = static_cast<unsigned char>(buf_[run]);
          if (b == 0 || b >= 0x80 || b == '"' || b == '\n' || b == '\r' ||
              b == static_cast<unsigned char>(opt_.delimiter))
            break;
          ++run;
        }
        if (run > pos_) {
          const std::size_t k = run - pos_;
          out.fields.back().text.append(buf_.data() + pos_, k);
          pos_ = run;
          consumed_ += static_cast<std::int64_t>(k);
          fieldByte_ += static_cast<int>(k);
          col_ += static_cast<int>(k);
          bytes += k;
          any = true;
          st = State::Unquoted;
          continue;
        }
      }
      int c = get();
      if (c == kFailed)
        return false;
      if (c == kEnd) {
        if (st == State::Quoted) {
          const CsvField &f = out.fields.back();
          fail(f.line, currentField_,
               fmt::format("field {} opens a quote on line {} that is never closed: the file "
                           "ends inside quotes",
                           currentField_, f.line));
          return false;
        }
        if (!any) {
          out.fields.clear();
          if (records_ == 0)
            fail(0, 0, "the file is empty; expected a header line with column names");
          return false;
        }
        out.endedWithNewline = false;
        break;
      }
      any = true;
      if (++bytes > opt_.maxRecordBytes) {
        fail(out.line, currentField_,
             fmt::format("the record starting at line {} is longer than {} bytes; is a quote "
                         "left open?",
                         out.line, opt_.maxRecordBytes));
        return false;
      }
      const char ch = static_cast<char>(c);
      std::string &text = out.fields.back().text;
      switch (st) {
      case State::Quoted:
        if (ch == '"') {
          st = State::QuoteSeen;
        } else {
          text += ch;
          if (ch == '\r' && peek() == '\n') {
            get();
            text += '\n';
          }
          if (ch == '\r' || ch == '\n') {
            ++line_;
            col_ = 1;
          }
        }
        break;
      case State::QuoteSeen:
        if (ch == '"') {
          text += '"';
          st = State::Quoted;
          break;
        }
        if (ch != opt_.delimiter && ch != '\n' && ch != '\r') {
          problem(fmt::format("text after the closing quote of field {}; a field with quotes "
                              "must be quoted as a whole, inner quotes doubled",
                              currentField_));
          text += ch;
          st = State::Unquoted;
          break;
        }
        [[fallthrough]];
      case State::Start:
        if (st == State::Start && ch == '"') {
          out.fields.back().quoted = true;
          st = State::Quoted;
          break;
        }
        [[fallthrough]];
      case State::Unquoted:
        if (ch == opt_.delimiter) {
          ++currentField_;
          beginField();
          st = State::Start;
        } else if (ch == '\n' || ch == '\r') {
          newLine(c);
          endOfRecord = true;
        } else {
          if (ch == '"')
            problem(fmt::format("a quote inside unquoted field {}; a field with quotes must be "
                                "quoted as a whole, inner quotes doubled",
                                currentField_));
          text += ch;
          st = State::Unquoted;
        }
        break;
      }
    }
    const bool blank =
        out.fields.size() == 1 && !out.fields[0].quoted && out.fields[0].text.empty();
    if (blank)
      continue; // blank lines carry no data anywhere in the file
    ++records_;
    if (records_ == 1)
      return checkHeader(out);
    checkTruncated(out);
    return true;
  }
}

bool CsvReader::checkHeader(CsvRecord &rec) {
  headerSize_ = rec.size();
  // A byte-order mark is allowed once, before the first column name (skipped in refill()); one
  // inside a name (a file saved twice with a BOM, or pasted together) would hide the column.
  for (std::size_t i = 0; i < rec.size(); ++i)
    if (rec[i].find("\xEF\xBB\xBF") != std::string::npos) {
      fail(rec.fields[i].line, static_cast<int>(i + 1),
           fmt::format("column name {} holds an invisible byte-order mark (U+FEFF), e.g. from a "
                       "file saved twice as UTF-8 with BOM; remove it and save the file again",
                       i + 1));
      return false;
    }
  if (rec.size() != 1)
    return true;
  const std::string &h = rec[0];
  if (h.find_first_not_of(" \t") == std::string::npos) {
    fail(rec.line, 0,
         "the first non-empty line holds only spaces; expected a header line with column names");
    return false;
  }
  auto has = [&](char c) { return c != opt_.delimiter && h.find(c) != std::string::npos; };
  if (has(';'))
    fail(rec.line, 0,
         "the file is separated by semicolons; save it as comma-separated or set \"delimiter\": "
         "\";\" in a mapping profile");
  else if (has('\t'))
    fail(rec.line, 0,
         "the file is separated by tabs; save it as comma-separated or set \"delimiter\": \"\\t\" "
         "in a mapping profile");
  else if (has('|'))
    fail(rec.line, 0,
         "the file is separated by \"|\" (pipes); save it as comma-separated or set "
         "\"delimiter\": \"|\" in a mapping profile");
  else if (has(','))
    fail(rec.line, 0,
         fmt::format("the file is separated by commas but the mapping profile says \"{}\"; "
                     "set \"delimiter\": \",\" in the profile",
                     opt_.delimiter));
  return !fatal_;
}

void CsvReader::checkTruncated(CsvRecord &rec) {
  if (rec.endedWithNewline || rec.size() >= headerSize_)
    return;
  rec.problem = fmt::format("the last line ends without a newline and has {} of the header's {} "
                            "fields; the file looks truncated (cut off)",
                            rec.size(), headerSize_);
  rec.problemField = static_cast<int>(rec.size());
}

} // namespace cb
