#include "core/reservationimporter.h"

#include "core/csvreader.h"
#include "core/mappingprofile.h"
#include "core/nativeformat.h"
#include "core/sha256.h"

#include <date/date.h>
#include <fmt/format.h>

#include <algorithm>
#include <cerrno>
#include <chrono>
#include <cstring>
#include <fstream>
#include <streambuf>
#include <unordered_map>

namespace cb {
namespace {

/// A file whose bytes are hashed as the CSV reader pulls them, so a large extract is read once.
class HashingFileBuf : public std::streambuf {
public:
  explicit HashingFileBuf(const std::filesystem::path &path)
      : file_(path, std::ios::binary), buf_(64 * 1024) {}
  bool isOpen() const { return file_.is_open(); }
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
    file_.read(buf_.data(), static_cast<std::streamsize>(buf_.size()));
    auto n = static_cast<std::size_t>(file_.gcount());
    if (n == 0)
      return traits_type::eof();
    hash_.update(std::string_view(buf_.data(), n));
    setg(buf_.data(), buf_.data(), buf_.data() + n);
    return traits_type::to_int_type(*gptr());
  }

private:
  std::ifstream file_;
  std::vector<char> buf_;
  Sha256 hash_;
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
class RejectsWriter {
public:
  bool open(const std::filesystem::path &path, const CsvRecord &header) {
    path_ = path;
    out_.open(path, std::ios::binary | std::ios::trunc);
    if (!out_)
      return false;
    write(header, "problem");
    return true;
  }
  bool isOpen() const { return out_.is_open(); }
  void write(const CsvRecord &rec, std::string_view problem) {
    for (const auto &f : rec.fields)
      out_ << quoteCsvField(f.text) << ',';
    out_ << quoteCsvField(problem) << '\n';
  }
  bool close() {
    out_.close();
    return !out_.fail();
  }
  void discard() {
    out_.close();
    std::error_code ec;
    std::filesystem::remove(path_, ec);
  }

private:
  std::filesystem::path path_;
  std::ofstream out_;
};

} // namespace

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
  std::optional<Store::Transaction> tx;
  RejectsWriter rejects;
  HashingFileBuf input(file);
  auto failed = [&]() -> ImportReport & {
    tx.reset(); // rolls back
    if (rejects.isOpen())
      rejects.discard();
    if (input.isOpen())
      log.sha256 = input.finishDigest();
    log.added = log.updated = log.unchanged = 0;
    log.finishedAt = nowUtc();
    log.id = store.logFailedImport(log);
    return rep;
  };

  auto profile = MappingProfile::load(log.profile, findings);
  if (!profile)
    return failed();
  if (!input.isOpen()) {
    fileError(0, 0, fmt::format("cannot open the file: {}", std::strerror(errno)));
    return failed();
  }
  std::error_code sizeError;
  const auto fileSize = static_cast<std::int64_t>(std::filesystem::file_size(file, sizeError));
  std::istream in(&input);
  CsvReader::Options readerOptions;
  readerOptions.delimiter = profile->delimiter();
  CsvReader reader(in, label, readerOptions);

  CsvRecord header;
  if (!reader.next(header)) {
    if (reader.fatal())
      findings.push_back(*reader.fatal());
    return failed();
  }
  if (!profile->bind(header, label, findings))
    return failed();
  if (lenient && options.rejectsFile && !rejects.open(*options.rejectsFile, header)) {
    fileError(0, 0,
              fmt::format("cannot write the rejects file {}: {}", options.rejectsFile->string(),
                          std::strerror(errno)));
    return failed();
  }

  tx.emplace(store);
  log.id = store.beginImport(log);
  const std::string idName = profile->sourceName("reservation_id");
  const int idColumn = profile->sourceColumn("reservation_id");
  std::unordered_map<std::string, std::int64_t> firstLine; // id → line, for duplicates
  bool rowErrors = false;
  std::int64_t listed = 0, unlisted = 0;
  CsvRecord rec;
  Reservation r;
  std::vector<RowProblem> problems;
  while (reader.next(rec)) {
    ++log.rowsRead;
    problems.clear();
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
        if (!message.empty()) {
          std::string source = profile->sourceName(field);
          if (message.find(source) == std::string::npos)
            message = source + ": " + message;
          problems.push_back(RowProblem{profile->sourceColumn(field), message});
        }
      }
      if (!r.id.empty()) {
        auto [it, inserted] = firstLine.emplace(r.id, rec.line);
        if (!inserted)
          problems.push_back(RowProblem{
              idColumn, fmt::format("{} \"{}\" was already used on line {}; ids must be unique "
                                    "within a file",
                                    idName, r.id, it->second)});
      }
    }

    if (problems.empty()) {
      if (lenient || !rowErrors) {
        switch (store.upsertReservation(r, log.id)) {
        case UpsertResult::Added: ++log.added; break;
        case UpsertResult::Updated: ++log.updated; break;
        case UpsertResult::Unchanged: ++log.unchanged; break;
        }
      }
    } else {
      rowErrors = true;
      ++log.rejected;
      std::string joinedProblems;
      for (auto &p : problems) {
        joinedProblems += (joinedProblems.empty() ? "" : "; ") + p.message;
        if (listed++ < kMaxRowFindings)
          findings.push_back(
              Finding{Severity::Error, label, rec.line, p.column, std::move(p.message)});
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
  if (rejects.isOpen() && !rejects.close())
    fileError(
        0, 0,
        fmt::format("could not finish writing the rejects file {}", options.rejectsFile->string()));
  if (options.progress)
    options.progress(options.progressContext, fileSize, fileSize);
  log.sha256 = input.finishDigest();
  log.finishedAt = nowUtc();
  store.finishImport(log);
  tx->commit();
  rep.written = true;
  return rep;
}

} // namespace cb
