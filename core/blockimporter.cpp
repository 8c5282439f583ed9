// Group-block import (see blockimporter.h): read whole, hashed, mapped, validated, written.
#include "core/blockimporter.h"

#include "core/blockprofile.h"
#include "core/csvreader.h"
#include "core/nativeformat.h"
#include "core/sha256.h"

#include <date/date.h>
#include <fmt/format.h>

#include <cerrno>
#include <chrono>
#include <cstring>
#include <fstream>
#include <sstream>
#include <unordered_map>

namespace cb {
namespace {

std::string nowUtc() {
  return date::format("%FT%TZ",
                      std::chrono::floor<std::chrono::seconds>(std::chrono::system_clock::now()));
}

std::int64_t lineOf(const CsvRecord &rec, int column) {
  if (column <= 0 || rec.fields.empty())
    return rec.line;
  const auto i = std::min(static_cast<std::size_t>(column), rec.fields.size()) - 1;
  return rec.fields[i].line;
}

std::string csvLine(const CsvRecord &rec, std::string_view last) {
  std::string line;
  for (const auto &f : rec.fields)
    line += quoteCsvField(f.text) + ',';
  return line + quoteCsvField(last) + '\n';
}

} // namespace

ImportReport importBlocks(Store &store, const std::filesystem::path &file,
                          const ImportOptions &options) {
  ImportReport rep;
  ImportLogEntry &log = rep.log;
  Findings &findings = rep.findings;
  const std::string label = file.string();
  const bool lenient = options.mode == ImportMode::Lenient;
  log.file = std::filesystem::absolute(file).lexically_normal().string();
  log.kind = "blocks";
  log.profile = options.profile.empty() ? "native" : options.profile;
  log.mode = lenient ? "lenient" : "strict";
  log.startedAt = nowUtc();
  std::optional<Store::Transaction> tx;
  auto failed = [&]() -> ImportReport & {
    tx.reset();
    log.added = log.updated = log.unchanged = 0;
    log.finishedAt = nowUtc();
    if (!options.dryRun)
      log.id = store.logFailedImport(log);
    return rep;
  };
  auto profile = options.profileText.empty()
                     ? BlockProfile::load(log.profile, findings)
                     : BlockProfile::parse(options.profileText, log.profile, findings);
  if (!profile) {
    rep.ioOrUsageError = true;
    return failed();
  }
  std::error_code ec;
  errno = 0;
  std::ifstream in(file, std::ios::binary);
  const int openError = errno;
  if (std::filesystem::is_directory(file, ec) || !in) {
    // The reason, as the reservation import gives it: a missing file and a locked one differ.
    findings.push_back(
        Finding{Severity::Error, label, 0, 0,
                std::filesystem::is_directory(file, ec)
                    ? std::string("cannot open the file: it is a folder")
                    : fmt::format("cannot open the file: {}",
                                  std::strerror(openError != 0 ? openError : ENOENT))});
    rep.ioOrUsageError = true;
    return failed();
  }
  std::ostringstream bytes;
  bytes << in.rdbuf();
  const std::string text = bytes.str();
  log.sha256 = sha256Hex(text);

  std::istringstream stream(text);
  CsvReader::Options readerOptions;
  readerOptions.delimiter = profile->delimiter();
  CsvReader reader(stream, label, readerOptions);
  CsvRecord header;
  if (!reader.next(header)) {
    if (reader.fatal())
      findings.push_back(*reader.fatal());
    return failed();
  }
  if (!profile->bind(header, label, findings))
    return failed();

  std::string rejected =
      lenient && options.rejectsFile && !options.dryRun ? csvLine(header, "problem") : "";
  tx.emplace(store);
  log.id = store.beginImport(log);
  std::unordered_map<std::string, std::int64_t> firstLine;
  bool rowErrors = false;
  CsvRecord rec;
  BlockRecord b;
  while (reader.next(rec)) {
    ++log.rowsRead;
    std::vector<RowProblem> problems;
    if (!rec.problem.empty()) {
      problems.push_back(RowProblem{rec.problemField, rec.problem});
    } else if (rec.size() != header.size()) {
      problems.push_back(RowProblem{
          static_cast<int>(std::min(rec.size(), header.size()) + 1),
          fmt::format("the row has {} fields but the header has {}", rec.size(), header.size())});
    } else {
      problems = profile->map(rec, b);
      if (problems.empty()) {
        std::string field;
        std::string message = validateBlock(b, &field);
        if (!message.empty())
          problems.push_back(RowProblem{profile->sourceColumn(field), message});
      }
      if (!b.block.id.empty()) {
        const int idColumn = profile->sourceColumn("block_id");
        auto [it, inserted] = firstLine.emplace(b.block.id, lineOf(rec, idColumn));
        if (!inserted)
          problems.push_back(RowProblem{
              idColumn, fmt::format("{} \"{}\" was already used on line {}; ids must be unique "
                                    "within a file",
                                    profile->columnName("block_id"), b.block.id, it->second)});
      }
    }
    if (problems.empty()) {
      if (lenient || !rowErrors) {
        switch (store.upsertBlock(b)) {
        case UpsertResult::Added: ++log.added; break;
        case UpsertResult::Updated: ++log.updated; break;
        case UpsertResult::Unchanged: ++log.unchanged; break;
        }
      }
    } else {
      rowErrors = true;
      ++log.rejected;
      if (!rejected.empty()) {
        std::string joined;
        for (const auto &p : problems)
          joined += (joined.empty() ? "" : "; ") + p.message;
        rejected += csvLine(rec, joined);
      }
      for (auto &p : problems)
        findings.push_back(
            Finding{Severity::Error, label, lineOf(rec, p.column), p.column, std::move(p.message)});
    }
  }
  if (reader.fatal()) {
    findings.push_back(*reader.fatal());
    return failed();
  }
  if (log.rowsRead == 0) {
    findings.push_back(Finding{Severity::Error, label, header.line, 0,
                               "the file has a header line but no blocks"});
    return failed();
  }
  if (rowErrors && !lenient) {
    findings.push_back(
        Finding{Severity::Info, label, 0, 0,
                fmt::format("{} of {} rows rejected; strict import: nothing was written",
                            log.rejected, log.rowsRead)});
    return failed();
  }
  if (log.rejected > 0 && !rejected.empty()) {
    std::ofstream out(*options.rejectsFile, std::ios::binary | std::ios::trunc);
    out << rejected;
    out.flush();
    if (!out) {
      // The rows are not written either: the user would lose track of the rejects otherwise.
      findings.push_back(
          Finding{Severity::Error, label, 0, 0,
                  fmt::format("cannot write the rejects file {}", options.rejectsFile->string())});
      rep.ioOrUsageError = true;
      return failed();
    }
  }
  log.finishedAt = nowUtc();
  if (options.dryRun) {
    tx.reset(); // rolls back: a validation writes nothing
    return rep;
  }
  store.finishImport(log);
  tx->commit();
  rep.written = true;
  return rep;
}

} // namespace cb
