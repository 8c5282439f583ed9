// Small pieces every CSV-writing verb shares: safe CSV text, number cells, writing to a file or
// standard output, the date validator and weekday names.
#pragma once

#include "core/csvreader.h"
#include "core/date.h"
#include "core/finding.h"
#include "core/keptcube.h"
#include "core/store.h"
#include "core/unconstrain.h"

#include <CLI/CLI.hpp>
#include <fmt/format.h>

#include <cstdint>
#include <cstdio>
#include <memory>
#include <optional>
#include <string>
#include <vector>

namespace cbcli {

/// Spreadsheets run a cell starting with = + - @ (or a tab / CR trick) as a formula (brief
/// section 8); text from the data (series names, event labels) is then written with a leading
/// apostrophe. Quoted per RFC 4180 when needed.
std::string csvText(const std::string &text);
/// A number cell with `decimals` places, or an empty cell for nullopt.
std::string num(std::optional<double> v, int decimals = 2);
/// Writes `text` to `path`, or to standard output when it is empty; throws std::runtime_error
/// when the write fails.
void emit(const std::string &path, const fmt::memory_buffer &text);
/// Where notes after a CSV go (hints, caution): standard error while standard output carries the
/// CSV, so it stays machine-readable; standard output when the CSV went to a file.
std::FILE *notesStream(const std::string &out);
/// CLI11 validator for YYYY-MM-DD.
CLI::Validator dateCheck();
/// "Mon" … "Sun".
const char *weekdayName(cb::Date d);
/// Opens a store and loads its reservations; throws std::runtime_error when it has none (there
/// is nothing to forecast from).
std::unique_ptr<cb::Store> openWithRows(const std::string &path,
                                        std::vector<cb::Reservation> &rows);
/// A store and what a verb reads of it to build curve cubes: for the total, the kept cube
/// (core/keptcube.h) when it is current, so the reservations are not loaded at all; else the
/// reservations, from which the kept cube is then built and written beside the store (best
/// effort) for the next command.
class CubeSource {
public:
  /// Opens the store; `total` false (a split) never reads or writes the kept cube.
  CubeSource(const std::string &path, bool total);
  cb::Store &store() { return *store_; }
  /// The kept cube, when there is one (a total, and a store whose reservations stay a night).
  const std::optional<cb::KeptCube> &kept() const { return kept_; }
  /// The reservations, loaded at the first call when the kept cube was read instead (then they
  /// must be of the same data as the cube: std::runtime_error when another program wrote
  /// reservations in between).
  const std::vector<cb::Reservation> &reservations();
  /// kept()->cubeFor(options) when it gives one, else CurveCube::build(reservations(), options).
  /// Asking for exactly the kept cube hands it over: kept() is empty afterwards.
  cb::CurveCube cube(const cb::CubeOptions &options);

private:
  std::unique_ptr<cb::Store> store_;
  std::optional<cb::KeptCube> kept_;
  std::vector<cb::Reservation> rows_;
  bool loaded_ = false;
  std::optional<std::uint64_t> keptStamp_; ///< the stamp of the kept cube read from its file
};
/// The store's sales closures and denials: what unconstraining reads.
cb::CensorSources censorSources(const cb::Store &store);

/// Reads the header of a small input table (an offer, protection classes): col[k] = 1-based field
/// of names[k], 0 when absent. The first `required` names must be present, else one finding per
/// missing column, "missing column "x" (the header needs <needs>)". False when the file is empty
/// or a column is missing.
bool readTableHeader(cb::CsvReader &reader, cb::CsvRecord &rec, const std::string &path,
                     const std::vector<std::string> &names, std::size_t required,
                     const std::string &needs, std::vector<int> &col, cb::Findings &findings);
/// True for a well-formed data record (no reader problem, as many fields as the header); else
/// adds the finding.
bool tableRecordOk(const cb::CsvReader &reader, const cb::CsvRecord &rec, const std::string &path,
                   cb::Findings &findings);

} // namespace cbcli
