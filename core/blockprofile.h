// How the columns of a group-blocks file become block fields: the native blocks layout, or a
// JSON block profile in the same style as the reservation mapping profiles.
#pragma once

#include "core/blockrecord.h"
#include "core/csvreader.h"
#include "core/finding.h"
#include "core/mappingprofile.h" // RowProblem

#include <array>
#include <map>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace cb {

/// Native blocks columns (the sample's blocks.csv), in the order a writer puts them.
inline constexpr std::array<std::string_view, 10> kBlockColumns = {
    "block_id",        "name",   "segment", "arrival",       "departure",
    "rooms_per_night", "cutoff", "status",  "contracted_on", "room_type"};

/// A blocks profile. JSON form:
///   {"kind": "blocks", "name": "…", "delimiter": ";",
///    "fields": {"block_id": {"column": "Code"},
///               "arrival": {"column": "From", "date_format": "%d.%m.%Y"},
///               "status": {"column": "Kind", "values": {"T": "tentative", "D": "definite"}},
///               "segment": {"constant": "GRP"},
///               "contracted_on": {"column": "Signed", "optional": true}}}
/// A field is read from a "column" (with an optional "date_format" for dates, a "values" map,
/// "optional": a missing column leaves it empty) or set to a "constant". block_id, arrival,
/// departure, rooms_per_night, cutoff and status are required; the rest may be left out.
/// The native profile reads every field from the column of its own name (optional ones may be
/// absent) and warns about columns it does not know.
class BlockProfile {
public:
  static BlockProfile native();
  /// "native" (or empty) → native(); otherwise a JSON profile file at that path.
  static std::optional<BlockProfile> load(const std::string &nameOrPath, Findings &findings);
  static std::optional<BlockProfile> parse(std::string_view json, const std::string &label,
                                           Findings &findings);

  const std::string &name() const { return name_; }
  char delimiter() const { return delimiter_; }

  /// Resolves the columns against the header; missing or repeated needed columns are error
  /// findings at the header line of `csvFile`. False when a needed column is missing.
  bool bind(const CsvRecord &header, const std::string &csvFile, Findings &findings);
  /// Maps one record (after bind()); returns every parse problem of the row (empty = parsed;
  /// validateBlock() is still to be checked).
  std::vector<RowProblem> map(const CsvRecord &row, BlockRecord &out) const;
  /// 1-based column a field is read from, or 0 (constant or absent).
  int sourceColumn(std::string_view field) const;
  /// The header name of that column, or the field name.
  std::string columnName(std::string_view field) const;

  struct FieldSpec {
    std::string column; ///< empty with `constant` set, or for an absent optional field
    bool optional = false;
    std::optional<std::string> constant;
    std::string dateFormat; ///< empty = ISO
    std::map<std::string, std::string> values;
    int index = -1; ///< bound 0-based column, -1 = none
  };

private:
  std::string name_ = "native";
  char delimiter_ = ',';
  bool warnUnused_ = false;
  std::array<FieldSpec, kBlockColumns.size()> specs_;
  std::vector<std::string> header_;
};

/// True for the fields a blocks file must provide.
bool isRequiredBlockField(std::string_view field);

} // namespace cb
