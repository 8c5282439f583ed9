#include "core/finding.h"

#include <algorithm>

namespace cb {

std::string Finding::toString() const {
  std::string s = file;
  if (line > 0) {
    s += (s.empty() ? "line " : ":") + std::to_string(line);
    if (column > 0)
      s += ":" + std::to_string(column);
  }
  if (!s.empty())
    s += ": ";
  if (severity == Severity::Warning)
    s += "warning: ";
  else if (severity == Severity::Info)
    s += "note: ";
  return s + message;
}

bool hasErrors(const Findings &findings) {
  return std::any_of(findings.begin(), findings.end(),
                     [](const Finding &f) { return f.severity == Severity::Error; });
}

const char *severityName(Severity s) {
  switch (s) {
  case Severity::Info: return "info";
  case Severity::Warning: return "warning";
  case Severity::Error: return "error";
  }
  return "error";
}

} // namespace cb
