// Native blocks layout and JSON block profiles: parsing, binding to a header, mapping rows.
#include "core/blockprofile.h"

#include "core/jsonlocate.h"

#include <fmt/format.h>
#include <nlohmann/json.hpp>

#include <algorithm>
#include <charconv>
#include <fstream>
#include <sstream>

namespace cb {
namespace {

using Json = nlohmann::json;

int fieldIndex(std::string_view name) {
  auto it = std::find(kBlockColumns.begin(), kBlockColumns.end(), name);
  return it == kBlockColumns.end() ? -1 : static_cast<int>(it - kBlockColumns.begin());
}

bool isDateField(std::string_view f) {
  return f == "arrival" || f == "departure" || f == "cutoff" || f == "contracted_on";
}

std::string humanDate(const std::string &pattern) {
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

} // namespace

bool isRequiredBlockField(std::string_view f) {
  return f == "block_id" || f == "arrival" || f == "departure" || f == "rooms_per_night" ||
         f == "cutoff" || f == "status";
}

BlockProfile BlockProfile::native() {
  BlockProfile p;
  p.warnUnused_ = true;
  for (std::size_t i = 0; i < kBlockColumns.size(); ++i) {
    p.specs_[i].column = std::string(kBlockColumns[i]);
    p.specs_[i].optional = !isRequiredBlockField(kBlockColumns[i]);
  }
  return p;
}

std::optional<BlockProfile> BlockProfile::load(const std::string &nameOrPath, Findings &findings) {
  if (nameOrPath.empty() || nameOrPath == "native")
    return native();
  std::ifstream in(nameOrPath, std::ios::binary);
  if (!in) {
    findings.push_back(Finding{Severity::Error, nameOrPath, 0, 0,
                               "cannot open the blocks profile (give \"native\" or a JSON file)"});
    return std::nullopt;
  }
  std::ostringstream text;
  text << in.rdbuf();
  return parse(text.str(), nameOrPath, findings);
}

std::optional<BlockProfile> BlockProfile::parse(std::string_view json, const std::string &label,
                                                Findings &findings) {
  bool ok = true;
  auto error = [&](std::string message) {
    // Point at the key the message is about (line 0 when it names none).
    const auto [line, column] = jsonKeyPosition(json, profileKeyPath(message));
    findings.push_back(Finding{Severity::Error, label, line, column, std::move(message)});
    ok = false;
  };
  Json j;
  try {
    j = Json::parse(json.begin(), json.end());
  } catch (const Json::parse_error &e) {
    // Located like a reservation profile's syntax error: the line and column where it broke.
    std::string what = e.what();
    if (auto cut = what.rfind(": "); cut != std::string::npos)
      what.erase(0, cut + 2);
    const auto [line, column] = textPosition(json, e.byte == 0 ? 0 : e.byte - 1);
    findings.push_back(Finding{Severity::Error, label, line, column,
                               "the blocks profile is not valid JSON: " + what});
    return std::nullopt;
  } catch (const Json::exception &e) {
    // Valid syntax the parser still refuses, e.g. a number too large for a double (found by
    // fuzz_profile): reported, not thrown.
    std::string what = e.what();
    if (auto cut = what.find("] "); cut != std::string::npos)
      what.erase(0, cut + 2);
    findings.push_back(
        Finding{Severity::Error, label, 0, 0, "the blocks profile is not usable JSON: " + what});
    return std::nullopt;
  }
  if (!j.is_object()) {
    error("the blocks profile is not a JSON object");
    return std::nullopt;
  }
  BlockProfile p;
  p.name_ = label;
  for (auto it = j.begin(); it != j.end(); ++it) {
    const std::string &key = it.key();
    if (key == "name" && it->is_string()) {
      p.name_ = it->get<std::string>();
    } else if (key == "kind") {
      if (!it->is_string() || it->get<std::string>() != "blocks")
        error("\"kind\" must be \"blocks\" (a reservation profile cannot read blocks)");
    } else if (key == "delimiter") {
      if (!it->is_string() || it->get<std::string>().size() != 1)
        error("\"delimiter\" must be one character");
      else
        p.delimiter_ = it->get<std::string>()[0];
    } else if (key == "warn_unused_columns" && it->is_boolean()) {
      p.warnUnused_ = it->get<bool>();
    } else if (key != "fields" && key != "description" && key != "version") {
      error(fmt::format("unknown key \"{}\" in the profile (allowed: kind, name, description, "
                        "delimiter, warn_unused_columns, fields)",
                        key));
    }
  }
  auto fields = j.find("fields");
  if (fields == j.end() || !fields->is_object()) {
    error("the profile has no \"fields\" object");
    return std::nullopt;
  }
  std::array<bool, kBlockColumns.size()> given{};
  for (auto it = fields->begin(); it != fields->end(); ++it) {
    const int f = fieldIndex(it.key());
    if (f < 0) {
      error(fmt::format("\"{}\" is not a block field", it.key()));
      continue;
    }
    const auto fi = static_cast<std::size_t>(f);
    given[fi] = true;
    const Json &spec = *it;
    const std::string where = "fields." + it.key();
    if (!spec.is_object()) {
      error(where + " must be an object");
      continue;
    }
    FieldSpec &s = p.specs_[fi];
    for (auto k = spec.begin(); k != spec.end(); ++k) {
      const std::string &key = k.key();
      if (key == "column" && k->is_string()) {
        s.column = k->get<std::string>();
      } else if (key == "constant" && k->is_string()) {
        s.constant = k->get<std::string>();
      } else if (key == "optional" && k->is_boolean()) {
        s.optional = k->get<bool>();
      } else if (key == "date_format" && k->is_string() && isDateField(it.key())) {
        s.dateFormat = k->get<std::string>();
      } else if (key == "values" && k->is_object()) {
        for (auto v = k->begin(); v != k->end(); ++v) {
          if (!v->is_string())
            error(fmt::format("{}.values must map text to text", where));
          else
            s.values[v.key()] = v->get<std::string>();
        }
      } else {
        error(fmt::format("{}: \"{}\" is not allowed here (column, constant, optional, "
                          "date_format for a date field, values)",
                          where, key));
      }
    }
    if (s.column.empty() == !s.constant.has_value())
      error(where + " needs exactly one of \"column\" and \"constant\"");
  }
  for (std::size_t i = 0; i < kBlockColumns.size(); ++i)
    if (!given[i] && isRequiredBlockField(kBlockColumns[i]))
      error(fmt::format("the profile does not say where \"{}\" comes from", kBlockColumns[i]));
  if (!ok)
    return std::nullopt;
  return p;
}

bool BlockProfile::bind(const CsvRecord &header, const std::string &csvFile, Findings &findings) {
  header_.clear();
  for (const auto &f : header.fields)
    header_.push_back(f.text);
  bool ok = true;
  std::vector<bool> used(header_.size(), false);
  for (std::size_t i = 0; i < kBlockColumns.size(); ++i) {
    FieldSpec &s = specs_[i];
    s.index = -1;
    if (s.column.empty())
      continue;
    std::vector<int> hits;
    for (std::size_t c = 0; c < header_.size(); ++c)
      if (header_[c] == s.column)
        hits.push_back(static_cast<int>(c));
    if (hits.size() > 1) {
      findings.push_back(Finding{Severity::Error, csvFile, header.line, hits[1] + 1,
                                 fmt::format("column \"{}\" appears more than once", s.column)});
      ok = false;
    } else if (hits.empty()) {
      if (!s.optional) {
        findings.push_back(Finding{
            Severity::Error, csvFile, header.line, 0,
            fmt::format("the header has no column \"{}\" (for {})", s.column, kBlockColumns[i])});
        ok = false;
      }
    } else {
      s.index = hits[0];
      used[static_cast<std::size_t>(hits[0])] = true;
    }
  }
  if (warnUnused_)
    for (std::size_t c = 0; c < header_.size(); ++c)
      if (!used[c])
        findings.push_back(Finding{Severity::Warning, csvFile, header.line, static_cast<int>(c) + 1,
                                   fmt::format("column \"{}\" is not read; ignored", header_[c])});
  return ok;
}

std::vector<RowProblem> BlockProfile::map(const CsvRecord &row, BlockRecord &out) const {
  std::vector<RowProblem> problems;
  out = BlockRecord{};
  for (std::size_t i = 0; i < kBlockColumns.size(); ++i) {
    const FieldSpec &s = specs_[i];
    const std::string_view field = kBlockColumns[i];
    std::string text;
    if (s.constant)
      text = *s.constant;
    else if (s.index >= 0 && static_cast<std::size_t>(s.index) < row.size())
      text = row[static_cast<std::size_t>(s.index)];
    if (auto v = s.values.find(text); v != s.values.end())
      text = v->second;
    const int column = s.index + 1;
    const std::string name = columnName(field);
    auto problem = [&](std::string message) {
      problems.push_back(RowProblem{column, std::move(message)});
    };
    if (text.empty()) {
      if (isRequiredBlockField(field))
        problem(fmt::format("{} is empty", name));
      continue;
    }
    if (isDateField(field)) {
      auto d = s.dateFormat.empty() ? Date::parseIso(text) : Date::parse(text, s.dateFormat);
      if (!d) {
        problem(fmt::format("{} \"{}\" is not a date ({})", name, text, humanDate(s.dateFormat)));
        continue;
      }
      if (field == "arrival")
        out.block.arrival = *d;
      else if (field == "departure")
        out.block.departure = *d;
      else if (field == "cutoff")
        out.block.cutoff = *d;
      else
        out.contractedOn = *d;
    } else if (field == "rooms_per_night") {
      int v = 0;
      auto res = std::from_chars(text.data(), text.data() + text.size(), v);
      if (res.ec != std::errc() || res.ptr != text.data() + text.size())
        problem(fmt::format("{} \"{}\" is not a whole number", name, text));
      else
        out.block.roomsPerNight = v;
    } else if (field == "status") {
      if (text == "tentative")
        out.block.status = BlockStatus::Tentative;
      else if (text == "definite")
        out.block.status = BlockStatus::Definite;
      else
        problem(fmt::format("{} \"{}\" is not tentative or definite", name, text));
    } else if (field == "block_id") {
      out.block.id = text;
    } else if (field == "name") {
      out.block.name = text;
    } else if (field == "segment") {
      out.block.segment = text;
    } else if (field == "room_type") {
      out.roomType = text;
    }
  }
  return problems;
}

int BlockProfile::sourceColumn(std::string_view field) const {
  const int f = fieldIndex(field);
  return f < 0 ? 0 : specs_[static_cast<std::size_t>(f)].index + 1;
}

std::string BlockProfile::columnName(std::string_view field) const {
  const int f = fieldIndex(field);
  if (f >= 0) {
    const FieldSpec &s = specs_[static_cast<std::size_t>(f)];
    if (s.index >= 0 && static_cast<std::size_t>(s.index) < header_.size())
      return header_[static_cast<std::size_t>(s.index)];
  }
  return std::string(field);
}

} // namespace cb
