// Mapping profiles: how the columns of another layout become native reservation fields.
#pragma once

#include "core/csvreader.h"
#include "core/finding.h"
#include "core/reservation.h"

#include <array>
#include <map>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace cb {

/// A problem with one row, located at a 1-based column number (0 = no single column).
struct RowProblem {
  int column = 0;
  std::string message;
};

/// A JSON mapping profile (format in README "Mapping profiles"). Each native field comes from
/// one source: a column (optionally with "date_format", a "values" map, "optional"), a
/// "constant", the "line_number" (with optional "prefix"), "date_parts" (year / month / day
/// columns; month as a number or English name) or "from_field" (another date field plus the
/// sum of "plus_days" columns minus the sum of "minus_days" columns). Any field may carry
/// "only_when_status": it is empty unless the row's status is that native status.
///
/// Example:
///   Findings f;
///   auto profile = MappingProfile::load("hotel-bookings-open-data", f);
///   if (profile && profile->bind(headerRecord, "bookings.csv", f))
///     auto problems = profile->map(row, reservation);
class MappingProfile {
public:
  /// Loads a shipped profile by name (see shippedNames()), else a JSON file at that path.
  /// Profile errors (unknown keys, bad JSON, …) are findings on the profile file.
  static std::optional<MappingProfile> load(const std::string &nameOrPath, Findings &findings);
  /// Parses profile JSON; `label` names the profile file in findings.
  static std::optional<MappingProfile> parse(std::string_view json, const std::string &label,
                                             Findings &findings);
  /// Names of the profiles compiled into the program (resources/profiles/*.json).
  static std::vector<std::string> shippedNames();
  /// The JSON text of a shipped profile, or empty when there is none of that name.
  static std::string_view shippedText(std::string_view name);

  const std::string &name() const { return name_; }
  const std::string &label() const { return label_; }
  char delimiter() const { return delimiter_; }

  /// Resolves the profile's columns against a header record. Missing columns, ambiguous
  /// (repeated) columns and, if the profile asks, unused columns become findings at the
  /// header line of `csvFile`. Returns false when a column the profile needs is missing.
  bool bind(const CsvRecord &header, const std::string &csvFile, Findings &findings);

  /// Maps one data record (after bind()) into `out`. Returns every parse problem of the row;
  /// empty = the reservation is complete (it still needs validateReservation()).
  std::vector<RowProblem> map(const CsvRecord &row, Reservation &out) const;

  /// The 1-based column a native field comes from (the first one for derived fields), or 0.
  int sourceColumn(std::string_view nativeField) const;
  /// The header name of that column, or the native field name when there is none.
  std::string sourceName(std::string_view nativeField) const;
  /// What to call a native field in a message about a row: the header name when the field is
  /// read from one column as it stands, else the native field name (a constant, a line number
  /// or a date derived from several columns is not any one column's value).
  std::string columnName(std::string_view nativeField) const;

  /// How one native field is sourced (parsed from the profile, then bound to the header).
  struct FieldSpec {
    enum class Kind { None, Column, Constant, LineNumber, DateParts, FromField };
    Kind kind = Kind::None;
    std::string column;                        ///< Column
    bool optional = false;                     ///< Column: a missing column leaves the field empty
    std::string dateFormat;                    ///< Column of a date field; empty = ISO YYYY-MM-DD
    std::map<std::string, std::string> values; ///< Column: value map (unmapped pass through)
    std::string constant;                      ///< Constant
    std::string prefix;                        ///< LineNumber
    std::array<std::string, 3> parts;          ///< DateParts: year, month, day columns
    int fromField = -1;                        ///< FromField: index into kNativeColumns
    std::vector<std::string> plusDays, minusDays;
    std::optional<ReservationStatus> onlyWhen;
    // Bound to the header by bind(): 0-based indices, -1 = absent.
    int index = -1;
    std::array<int, 3> partIndex{-1, -1, -1};
    std::vector<int> plusIndex, minusIndex;
  };

private:
  MappingProfile() = default;
  std::string name_;
  std::string label_;
  char delimiter_ = ',';
  bool warnUnused_ = false;
  std::vector<FieldSpec> specs_; ///< one per kNativeColumns entry
  std::vector<int> order_;       ///< evaluation order: status, then dependencies first
  std::vector<std::string> header_;
};

} // namespace cb
