#include "core/mappingprofile.h"

#include "core/jsonlocate.h"
#include "core/nativeformat.h"

#include <fmt/format.h>
#include <nlohmann/json.hpp>

#include <algorithm>
#include <charconv>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <functional>
#include <set>
#include <sstream>
#include <tuple>
#include <utility>

namespace cb {
namespace {

struct ShippedProfile {
  std::string_view name;
  std::string_view text;
};

// Generated at configure time from resources/profiles/*.json (core/CMakeLists.txt), so the
// program finds its profiles without an install path.
constexpr ShippedProfile kShipped[] = {
#include "shipped_profiles.inc"
};

using Spec = MappingProfile::FieldSpec;
using Json = nlohmann::json;

constexpr int kId = 0, kStatus = 1, kBookedOn = 2, kCancelledOn = 3, kArrival = 4, kDeparture = 5,
              kRooms = 6, kRoomType = 7, kSegment = 8, kChannel = 9, kRate = 10, kCurrency = 11,
              kBlockId = 12;
constexpr int kFieldCount = static_cast<int>(kNativeColumns.size());

int fieldIndex(std::string_view name) {
  for (int i = 0; i < kFieldCount; ++i)
    if (kNativeColumns[static_cast<std::size_t>(i)] == name)
      return i;
  return -1;
}

std::string fieldName(int i) { return std::string(kNativeColumns[static_cast<std::size_t>(i)]); }

bool isDateField(int i) {
  return i == kBookedOn || i == kCancelledOn || i == kArrival || i == kDeparture;
}

std::string joined(const std::vector<std::string> &items) {
  std::string s;
  for (const auto &i : items)
    s += (s.empty() ? "" : ", ") + i;
  return s;
}

/// "%d/%m/%Y" → "DD/MM/YYYY": how a date pattern reads to someone fixing a spreadsheet.
std::string humanDateFormat(std::string_view pattern) {
  if (pattern.empty())
    return "YYYY-MM-DD";
  std::string s;
  for (std::size_t i = 0; i < pattern.size(); ++i) {
    if (pattern[i] == '%' && i + 1 < pattern.size()) {
      char f = pattern[++i];
      s += f == 'Y' ? "YYYY" : f == 'm' ? "MM" : f == 'd' ? "DD" : f == 'b' ? "Mon" : "Month";
    } else {
      s += pattern[i];
    }
  }
  return s;
}

bool validDatePattern(std::string_view p) {
  bool y = false, m = false, d = false;
  for (std::size_t i = 0; i < p.size(); ++i) {
    if (p[i] != '%')
      continue;
    if (i + 1 >= p.size())
      return false;
    char f = p[++i];
    if (f == 'Y')
      y = true;
    else if (f == 'm' || f == 'b' || f == 'B')
      m = true;
    else if (f == 'd')
      d = true;
    else
      return false;
  }
  return y && m && d;
}

std::optional<long long> parseInteger(std::string_view s) {
  if (s.empty())
    return std::nullopt;
  std::size_t start = s[0] == '-' ? 1 : 0;
  if (start == s.size())
    return std::nullopt;
  for (std::size_t i = start; i < s.size(); ++i)
    if (s[i] < '0' || s[i] > '9')
      return std::nullopt;
  long long v = 0;
  auto res = std::from_chars(s.data(), s.data() + s.size(), v);
  if (res.ec != std::errc() || res.ptr != s.data() + s.size())
    return std::nullopt;
  return v;
}

/// Plain decimals only ("-12", "89.5"): no exponent, no thousands separator, no comma.
std::optional<double> parseDecimal(std::string_view s) {
  std::size_t i = s.empty() || s[0] != '-' ? 0 : 1;
  std::size_t digits = 0, fraction = 0;
  while (i < s.size() && s[i] >= '0' && s[i] <= '9')
    ++i, ++digits;
  if (i < s.size() && s[i] == '.') {
    ++i;
    while (i < s.size() && s[i] >= '0' && s[i] <= '9')
      ++i, ++fraction;
    if (fraction == 0)
      return std::nullopt;
  }
  if (digits == 0 || i != s.size())
    return std::nullopt;
  double v = 0;
  auto res = std::from_chars(s.data(), s.data() + s.size(), v, std::chars_format::fixed);
  if (res.ec != std::errc() || !std::isfinite(v))
    return std::nullopt;
  return v;
}

/// Reads profile JSON into specs, collecting findings on the profile file.
class ProfileParser {
public:
  ProfileParser(std::string label, Findings &findings)
      : label_(std::move(label)), findings_(findings) {}

  /// The profile's text, so a finding without a position can point at the key it is about.
  void setText(std::string_view text) { text_ = text; }

  void error(std::string message, std::int64_t line = 0, int column = 0) {
    if (line == 0)
      std::tie(line, column) = jsonKeyPosition(text_, profileKeyPath(message));
    findings_.push_back(Finding{Severity::Error, label_, line, column, std::move(message)});
    ok_ = false;
  }
  bool ok() const { return ok_; }

  bool checkKeys(const Json &obj, const std::string &where,
                 std::initializer_list<std::string_view> allowed) {
    bool good = true;
    for (auto it = obj.begin(); it != obj.end(); ++it) {
      if (std::find(allowed.begin(), allowed.end(), it.key()) != allowed.end())
        continue;
      std::vector<std::string> names(allowed.begin(), allowed.end());
      error(fmt::format("unknown key \"{}\" in {} (allowed: {})", it.key(), where, joined(names)));
      good = false;
    }
    return good;
  }

  std::optional<std::string> string(const Json &obj, const char *key, const std::string &where) {
    auto it = obj.find(key);
    if (it == obj.end())
      return std::nullopt;
    if (!it->is_string()) {
      error(fmt::format("{}.{} must be a string", where, key));
      return std::nullopt;
    }
    return it->get<std::string>();
  }

  std::vector<std::string> stringList(const Json &obj, const char *key, const std::string &where) {
    std::vector<std::string> out;
    auto it = obj.find(key);
    if (it == obj.end())
      return out;
    if (it->is_string())
      return {it->get<std::string>()};
    if (!it->is_array()) {
      error(fmt::format("{}.{} must be a column name or a list of column names", where, key));
      return out;
    }
    for (const auto &v : *it) {
      if (!v.is_string()) {
        error(fmt::format("{}.{} must list column names (strings)", where, key));
        return {};
      }
      out.push_back(v.get<std::string>());
    }
    return out;
  }

  Spec fieldSpec(int field, const Json &j) {
    const std::string where = "fields." + fieldName(field);
    Spec s;
    if (!j.is_object()) {
      error(where + " must be an object such as {\"column\": \"NAME\"}");
      return s;
    }
    checkKeys(j, where,
              {"column", "optional", "date_format", "values", "constant", "line_number", "prefix",
               "date_parts", "from_field", "plus_days", "minus_days", "only_when_status", "note"});
    int sources = 0;
    for (const char *k : {"column", "constant", "line_number", "date_parts", "from_field"})
      sources += j.contains(k) ? 1 : 0;
    if (sources != 1) {
      error(fmt::format("{} needs exactly one source: column, constant, line_number, "
                        "date_parts or from_field",
                        where));
      return s;
    }
    auto onlyWith = [&](const char *key, Spec::Kind kind, const char *source) {
      if (j.contains(key) && s.kind != kind)
        error(fmt::format("{}.{} only goes with \"{}\"", where, key, source));
    };
    if (auto c = string(j, "column", where)) {
      s.kind = Spec::Kind::Column;
      s.column = *c;
    } else if (j.contains("constant")) {
      s.kind = Spec::Kind::Constant;
      const Json &value = j["constant"];
      if (value.is_string())
        s.constant = value.get<std::string>();
      else if (value.is_number())
        s.constant = value.dump();
      else
        error(where + ".constant must be a string or a number");
      if (isDateField(field) && !s.constant.empty() && !Date::parseIso(s.constant))
        error(fmt::format("{}.constant \"{}\" is not a date (expected YYYY-MM-DD)", where,
                          s.constant));
      if (field == kStatus && !parseStatus(s.constant))
        error(fmt::format("{}.constant \"{}\" is not a status (booked, cancelled, no-show or "
                          "checked-out)",
                          where, s.constant));
    } else if (j.contains("line_number")) {
      s.kind = Spec::Kind::LineNumber;
      if (j["line_number"] != Json(true))
        error(where + ".line_number must be true");
      if (isDateField(field) || field == kRooms || field == kRate || field == kStatus)
        error(where + " cannot be a line number");
    } else if (j.contains("date_parts")) {
      s.kind = Spec::Kind::DateParts;
      const Json &p = j["date_parts"];
      if (!isDateField(field))
        error(where + ".date_parts only goes with a date field");
      if (!p.is_object()) {
        error(where + ".date_parts must be {\"year\": …, \"month\": …, \"day\": …}");
      } else {
        checkKeys(p, where + ".date_parts", {"year", "month", "day"});
        const char *keys[] = {"year", "month", "day"};
        for (std::size_t i = 0; i < 3; ++i) {
          auto v = string(p, keys[i], where + ".date_parts");
          if (!v)
            error(fmt::format("{}.date_parts needs \"{}\" (a column name)", where, keys[i]));
          else
            s.parts[i] = *v;
        }
      }
    } else if (auto f = string(j, "from_field", where)) {
      s.kind = Spec::Kind::FromField;
      s.fromField = fieldIndex(*f);
      if (!isDateField(field))
        error(where + ".from_field only goes with a date field");
      if (s.fromField < 0 || !isDateField(s.fromField) || s.fromField == field)
        error(fmt::format("{}.from_field \"{}\" must name another date field (booked_on, "
                          "cancelled_on, arrival, departure)",
                          where, *f));
      s.plusDays = stringList(j, "plus_days", where);
      s.minusDays = stringList(j, "minus_days", where);
      if (s.plusDays.empty() && s.minusDays.empty())
        error(where + " with from_field needs plus_days or minus_days (column names)");
    }
    onlyWith("optional", Spec::Kind::Column, "column");
    onlyWith("date_format", Spec::Kind::Column, "column");
    onlyWith("values", Spec::Kind::Column, "column");
    onlyWith("prefix", Spec::Kind::LineNumber, "line_number");
    onlyWith("plus_days", Spec::Kind::FromField, "from_field");
    onlyWith("minus_days", Spec::Kind::FromField, "from_field");
    if (auto it = j.find("optional"); it != j.end()) {
      if (!it->is_boolean())
        error(where + ".optional must be true or false");
      else
        s.optional = it->get<bool>();
    }
    if (auto fmtText = string(j, "date_format", where)) {
      if (!isDateField(field))
        error(where + ".date_format only goes with a date field");
      else if (!validDatePattern(*fmtText))
        error(fmt::format("{}.date_format \"{}\" must use %Y, %m (or %b / %B) and %d, e.g. "
                          "\"%d/%m/%Y\"",
                          where, *fmtText));
      s.dateFormat = *fmtText;
    }
    if (auto it = j.find("values"); it != j.end()) {
      if (!it->is_object()) {
        error(where + ".values must map file values to ours, e.g. {\"Canceled\": \"cancelled\"}");
      } else {
        for (auto v = it->begin(); v != it->end(); ++v) {
          if (!v->is_string()) {
            error(fmt::format("{}.values.{} must be a string", where, v.key()));
            continue;
          }
          auto target = v->get<std::string>();
          if (field == kStatus && !parseStatus(target))
            error(fmt::format("{}.values maps \"{}\" to \"{}\", which is not a status (booked, "
                              "cancelled, no-show or checked-out)",
                              where, v.key(), target));
          s.values[v.key()] = target;
        }
      }
    }
    if (auto p = string(j, "prefix", where))
      s.prefix = *p;
    if (auto st = string(j, "only_when_status", where)) {
      s.onlyWhen = parseStatus(*st);
      if (!s.onlyWhen)
        error(fmt::format("{}.only_when_status \"{}\" is not a status (booked, cancelled, "
                          "no-show or checked-out)",
                          where, *st));
      if (field == kStatus)
        error(where + " cannot depend on the status itself");
    }
    return s;
  }

private:
  std::string label_;
  Findings &findings_;
  std::string_view text_;
  bool ok_ = true;
};

} // namespace

std::vector<std::string> MappingProfile::shippedNames() {
  std::vector<std::string> names;
  for (const auto &p : kShipped)
    names.emplace_back(p.name);
  std::sort(names.begin(), names.end());
  return names;
}

std::string_view MappingProfile::shippedText(std::string_view name) {
  for (const auto &p : kShipped)
    if (p.name == name)
      return p.text;
  return {};
}

std::optional<MappingProfile> MappingProfile::load(const std::string &nameOrPath,
                                                   Findings &findings) {
  if (auto text = shippedText(nameOrPath); !text.empty())
    return parse(text, nameOrPath + ".json (shipped)", findings);
  std::ifstream in(nameOrPath, std::ios::binary);
  if (!in) {
    findings.push_back(Finding{
        Severity::Error, nameOrPath, 0, 0,
        fmt::format("no shipped mapping profile has this name ({}) and no such file can be read",
                    joined(shippedNames()))});
    return std::nullopt;
  }
  std::ostringstream ss;
  ss << in.rdbuf();
  return parse(ss.str(), nameOrPath, findings);
}

std::optional<MappingProfile> MappingProfile::parse(std::string_view json, const std::string &label,
                                                    Findings &findings) {
  ProfileParser p(label, findings);
  p.setText(json);
  Json j;
  try {
    j = Json::parse(json);
  } catch (const Json::parse_error &e) {
    // what() is "[json.exception.parse_error.101] parse error at line 2, column 13: syntax
    // error …"; the position goes into the finding's prefix, so keep only the explanation.
    std::string what = e.what();
    if (auto cut = what.find("] "); cut != std::string::npos)
      what.erase(0, cut + 2);
    if (what.rfind("parse error", 0) == 0)
      if (auto cut = what.find(": "); cut != std::string::npos)
        what.erase(0, cut + 2);
    // e.byte: 1-based index of the last character read, or one past the end.
    auto [line, column] = textPosition(json, e.byte == 0 ? 0 : e.byte - 1);
    p.error("the profile is not valid JSON: " + what, line, column);
    return std::nullopt;
  } catch (const Json::exception &e) {
    // Valid syntax the parser still refuses, e.g. a number too large for a double (found by
    // fuzz_profile): reported, not thrown.
    std::string what = e.what();
    if (auto cut = what.find("] "); cut != std::string::npos)
      what.erase(0, cut + 2);
    p.error("the profile is not usable JSON: " + what, 0, 0);
    return std::nullopt;
  }
  if (!j.is_object()) {
    p.error("a mapping profile must be a JSON object with \"fields\"", 1, 1);
    return std::nullopt;
  }
  p.checkKeys(j, "the profile",
              {"version", "name", "description", "delimiter", "warn_unused_columns", "fields"});
  MappingProfile prof;
  prof.label_ = label;
  prof.name_ = std::filesystem::path(label).stem().string();
  if (auto it = j.find("version"); it != j.end() && *it != Json(1))
    p.error("this program reads mapping profiles of \"version\": 1");
  if (auto n = p.string(j, "name", "the profile"))
    prof.name_ = *n;
  if (auto d = p.string(j, "delimiter", "the profile")) {
    if (d->size() != 1 || *d == "\"" || *d == "\n" || *d == "\r")
      p.error(
          fmt::format("delimiter \"{}\" must be one character such as \",\" \";\" or \"\\t\"", *d));
    else
      prof.delimiter_ = (*d)[0];
  }
  if (auto it = j.find("warn_unused_columns"); it != j.end()) {
    if (!it->is_boolean())
      p.error("warn_unused_columns must be true or false");
    else
      prof.warnUnused_ = it->get<bool>();
  }
  prof.specs_.resize(kNativeColumns.size());
  auto fields = j.find("fields");
  if (fields == j.end() || !fields->is_object()) {
    p.error("the profile needs \"fields\": an object mapping native fields to their sources");
    return std::nullopt;
  }
  for (auto it = fields->begin(); it != fields->end(); ++it) {
    int f = fieldIndex(it.key());
    if (f < 0) {
      std::vector<std::string> names(kNativeColumns.begin(), kNativeColumns.end());
      p.error(
          fmt::format("unknown key \"{}\" in fields (native fields: {})", it.key(), joined(names)));
      continue;
    }
    prof.specs_[static_cast<std::size_t>(f)] = p.fieldSpec(f, it.value());
  }
  for (int f = 0; f < kFieldCount; ++f)
    if (isRequiredNativeColumn(kNativeColumns[static_cast<std::size_t>(f)]) &&
        prof.specs_[static_cast<std::size_t>(f)].kind == Spec::Kind::None &&
        !fields->contains(fieldName(f)))
      p.error(fmt::format("fields has no entry for the required field \"{}\"", fieldName(f)));

  // Evaluation order: status first (conditions read it), then each date after its from_field.
  std::vector<int> state(kNativeColumns.size(), 0); // 0 new, 1 visiting, 2 done
  std::function<void(int)> visit = [&](int f) {
    auto &st = state[static_cast<std::size_t>(f)];
    if (st == 2)
      return;
    if (st == 1) {
      p.error(fmt::format("fields.{}.from_field goes round in a circle", fieldName(f)));
      return;
    }
    st = 1;
    const Spec &s = prof.specs_[static_cast<std::size_t>(f)];
    if (s.kind == Spec::Kind::FromField && s.fromField >= 0) {
      if (prof.specs_[static_cast<std::size_t>(s.fromField)].kind == Spec::Kind::None)
        p.error(fmt::format("fields.{}.from_field names \"{}\", which the profile does not map",
                            fieldName(f), fieldName(s.fromField)));
      else
        visit(s.fromField);
    }
    st = 2;
    prof.order_.push_back(f);
  };
  visit(kStatus);
  for (int f = 0; f < kFieldCount; ++f)
    visit(f);
  if (!p.ok())
    return std::nullopt;
  return prof;
}

bool MappingProfile::bind(const CsvRecord &header, const std::string &csvFile, Findings &findings) {
  header_.clear();
  for (const auto &f : header.fields)
    header_.push_back(f.text);
  std::map<std::string, std::vector<int>> where;
  for (int i = 0; i < static_cast<int>(header_.size()); ++i)
    where[header_[static_cast<std::size_t>(i)]].push_back(i);
  std::set<int> used;
  std::set<std::string> repeated; // reported once each, and never also as unused
  bool ok = true;
  auto at = [&](Severity sev, int column, std::string message) {
    findings.push_back(Finding{sev, csvFile, header.line, column, std::move(message)});
  };
  auto resolve = [&](const std::string &column, int field, bool optional) -> int {
    auto it = where.find(column);
    if (it == where.end()) {
      if (optional)
        return -1;
      ok = false;
      if (name_ == "native")
        at(Severity::Error, 0,
           fmt::format("required column \"{}\" is missing from the header", column));
      else
        at(Severity::Error, 0,
           fmt::format("mapping profile {} reads {} from column \"{}\", which is not in the "
                       "file's header",
                       label_, fieldName(field), column));
      return -1;
    }
    if (it->second.size() > 1 && repeated.insert(column).second) {
      ok = false;
      at(Severity::Error, it->second[1] + 1,
         fmt::format("column \"{}\" appears more than once in the header (columns {} and {}); "
                     "rename one so the import knows which to use",
                     column, it->second[0] + 1, it->second[1] + 1));
    }
    used.insert(it->second[0]);
    return it->second[0];
  };
  for (int f = 0; f < kFieldCount; ++f) {
    Spec &s = specs_[static_cast<std::size_t>(f)];
    switch (s.kind) {
    case Spec::Kind::Column: s.index = resolve(s.column, f, s.optional); break;
    case Spec::Kind::DateParts:
      for (std::size_t i = 0; i < 3; ++i)
        s.partIndex[i] = resolve(s.parts[i], f, false);
      break;
    case Spec::Kind::FromField:
      s.plusIndex.clear();
      s.minusIndex.clear();
      for (const auto &c : s.plusDays)
        s.plusIndex.push_back(resolve(c, f, false));
      for (const auto &c : s.minusDays)
        s.minusIndex.push_back(resolve(c, f, false));
      break;
    default: break;
    }
  }
  if (warnUnused_)
    for (int i = 0; i < static_cast<int>(header_.size()); ++i)
      if (!used.count(i) && !repeated.count(header_[static_cast<std::size_t>(i)]))
        at(Severity::Warning, i + 1,
           fmt::format("column \"{}\" is not a native column; it is ignored",
                       header_[static_cast<std::size_t>(i)]));
  return ok;
}

std::vector<RowProblem> MappingProfile::map(const CsvRecord &row, Reservation &out) const {
  std::vector<RowProblem> problems;
  out = Reservation{};
  std::array<std::optional<Date>, kNativeColumns.size()> dates;
  std::array<bool, kNativeColumns.size()> failed{};
  std::array<int, kNativeColumns.size()> column{};
  bool statusOk = false;

  auto cell = [&](int idx) -> std::string_view {
    return idx >= 0 && static_cast<std::size_t>(idx) < row.size()
               ? std::string_view(row[static_cast<std::size_t>(idx)])
               : std::string_view();
  };
  auto colName = [&](int idx) { return header_[static_cast<std::size_t>(idx)]; };
  auto problem = [&](int f, int idx, std::string message) {
    failed[static_cast<std::size_t>(f)] = true;
    problems.push_back(RowProblem{idx + 1, std::move(message)});
  };
  auto integerAt = [&](int f, int idx, const char *what) -> std::optional<long long> {
    auto text = cell(idx);
    auto v = parseInteger(text);
    if (!v)
      problem(f, idx,
              text.empty() ? fmt::format("{} is empty (expected {})", colName(idx), what)
                           : fmt::format("{} \"{}\" is not {}", colName(idx), text, what));
    return v;
  };

  for (int f : order_) {
    const auto fi = static_cast<std::size_t>(f);
    const Spec &s = specs_[fi];
    if (s.kind == Spec::Kind::None)
      continue;
    if (s.onlyWhen && (!statusOk || out.status != *s.onlyWhen))
      continue;
    std::string text;
    std::string name = fieldName(f);
    int idx = -1;
    if (s.kind == Spec::Kind::Column) {
      if (s.index < 0)
        continue; // an optional column the file does not have
      idx = s.index;
      name = colName(idx);
      text = std::string(cell(idx));
      if (auto v = s.values.find(text); v != s.values.end())
        text = v->second;
    } else if (s.kind == Spec::Kind::Constant) {
      text = s.constant;
    } else if (s.kind == Spec::Kind::LineNumber) {
      text = s.prefix + std::to_string(row.line);
    }
    column[fi] = idx + 1;

    if (isDateField(f)) {
      if (s.kind == Spec::Kind::DateParts) {
        auto y = integerAt(f, s.partIndex[0], "a year");
        std::optional<unsigned> m;
        auto monthText = cell(s.partIndex[1]);
        if (auto n = parseInteger(monthText); n && *n >= 1 && *n <= 12)
          m = static_cast<unsigned>(*n);
        else
          m = monthFromEnglishName(monthText);
        if (!m)
          problem(f, s.partIndex[1],
                  fmt::format("{} \"{}\" is not a month (expected 1-12 or an English month name)",
                              colName(s.partIndex[1]), monthText));
        auto d = integerAt(f, s.partIndex[2], "a day of the month");
        column[fi] = s.partIndex[0] + 1;
        if (y && m && d) {
          auto iso = fmt::format("{:04}-{:02}-{:02}", *y, *m, *d);
          dates[fi] =
              *y >= 1 && *y <= 9999 && *d >= 1 && *d <= 31 ? Date::parseIso(iso) : std::nullopt;
          if (!dates[fi])
            problem(f, s.partIndex[2],
                    fmt::format("{} {}, {} {}, {} {}: there is no such date",
                                colName(s.partIndex[0]), *y, colName(s.partIndex[1]), monthText,
                                colName(s.partIndex[2]), *d));
        }
      } else if (s.kind == Spec::Kind::FromField) {
        const auto base = static_cast<std::size_t>(s.fromField);
        long long days = 0;
        bool good = dates[base].has_value();
        for (int i : s.plusIndex)
          if (auto v = integerAt(f, i, "a whole number of days"))
            days += *v;
          else
            good = false;
        for (int i : s.minusIndex)
          if (auto v = integerAt(f, i, "a whole number of days"))
            days -= *v;
          else
            good = false;
        column[fi] = !s.plusIndex.empty()    ? s.plusIndex[0] + 1
                     : !s.minusIndex.empty() ? s.minusIndex[0] + 1
                                             : 0;
        if (good && std::llabs(days) > 100000)
          problem(f, column[fi] - 1,
                  fmt::format("{}: {} days from {} is out of range", name, days,
                              fieldName(s.fromField)));
        else if (good)
          dates[fi] = *dates[base] + static_cast<int>(days);
        else
          failed[fi] = true; // reported at the day columns or by the base field itself
      } else if (!text.empty()) {
        dates[fi] = s.dateFormat.empty() ? Date::parseIso(text) : Date::parse(text, s.dateFormat);
        if (!dates[fi])
          problem(f, idx,
                  fmt::format("{} \"{}\" is not a date (expected {})", name, text,
                              humanDateFormat(s.dateFormat)));
      }
      if (!dates[fi] && !failed[fi] && f != kCancelledOn)
        problem(
            f, idx,
            fmt::format("{} is empty (expected a date, {})", name, humanDateFormat(s.dateFormat)));
      continue;
    }

    switch (f) {
    case kId:
      if (text.empty())
        problem(f, idx, fmt::format("{} is empty; every reservation needs an id", name));
      out.id = std::move(text);
      break;
    case kStatus:
      if (auto st = parseStatus(text)) {
        out.status = *st;
        statusOk = true;
      } else {
        std::vector<std::string> mapped;
        for (const auto &[from, to] : s.values)
          mapped.push_back(from);
        problem(f, idx,
                fmt::format("{} \"{}\" is not a known status (expected booked, cancelled, "
                            "no-show or checked-out{}{})",
                            name, text,
                            mapped.empty() ? "" : ", or as the profile maps: ", joined(mapped)));
      }
      break;
    case kRooms:
      if (auto v = parseInteger(text); v && *v >= -1000000 && *v <= 1000000)
        out.rooms = static_cast<int>(*v);
      else
        problem(f, idx,
                text.empty() ? fmt::format("{} is empty (expected a whole number of rooms)", name)
                             : fmt::format("{} \"{}\" is not a whole number of rooms", name, text));
      break;
    case kRate:
      if (auto v = parseDecimal(text))
        out.rate = *v;
      else
        problem(f, idx,
                text.empty()
                    ? fmt::format("{} is empty (expected a rate per room-night, e.g. 89.50)", name)
                    : fmt::format("{} \"{}\" is not a number (expected a decimal with '.', e.g. "
                                  "89.50, without thousands separators)",
                                  name, text));
      break;
    case kSegment:
      if (text.empty())
        problem(f, idx, fmt::format("{} is empty; every reservation needs a segment", name));
      out.segment = std::move(text);
      break;
    case kRoomType: out.roomType = std::move(text); break;
    case kChannel: out.channel = std::move(text); break;
    case kCurrency: out.currency = std::move(text); break;
    case kBlockId: out.blockId = std::move(text); break;
    default: break;
    }
  }
  if (dates[kBookedOn])
    out.bookedOn = *dates[kBookedOn];
  out.cancelledOn = dates[kCancelledOn];
  if (dates[kArrival])
    out.arrival = *dates[kArrival];
  if (dates[kDeparture])
    out.departure = *dates[kDeparture];
  return problems;
}

int MappingProfile::sourceColumn(std::string_view nativeField) const {
  int f = fieldIndex(nativeField);
  if (f < 0)
    return 0;
  const Spec &s = specs_[static_cast<std::size_t>(f)];
  switch (s.kind) {
  case Spec::Kind::Column: return s.index + 1;
  case Spec::Kind::DateParts: return s.partIndex[0] + 1;
  case Spec::Kind::FromField:
    return !s.plusIndex.empty()    ? s.plusIndex[0] + 1
           : !s.minusIndex.empty() ? s.minusIndex[0] + 1
                                   : 0;
  default: return 0;
  }
}

std::string MappingProfile::sourceName(std::string_view nativeField) const {
  int c = sourceColumn(nativeField);
  if (c > 0 && static_cast<std::size_t>(c) <= header_.size())
    return header_[static_cast<std::size_t>(c - 1)];
  return std::string(nativeField);
}

std::string MappingProfile::columnName(std::string_view nativeField) const {
  int f = fieldIndex(nativeField);
  if (f >= 0) {
    const Spec &s = specs_[static_cast<std::size_t>(f)];
    if (s.kind == Spec::Kind::Column && s.index >= 0 &&
        static_cast<std::size_t>(s.index) < header_.size())
      return header_[static_cast<std::size_t>(s.index)];
  }
  return std::string(nativeField);
}

} // namespace cb
