// Data findings: what the user must see about their data, located to file:line:column.
#pragma once

#include <cstdint>
#include <string>
#include <vector>

namespace cb {

enum class Severity { Info, Warning, Error };

/// One problem found in the user's data. Errors reject a row (or a whole file);
/// warnings and infos never lose data. `line` and `column` are 1-based; 0 = not applicable.
struct Finding {
  Severity severity = Severity::Error;
  std::string file;
  std::int64_t line = 0;
  int column = 0;
  std::string message;

  /// "file:line:column: message" (parts that are 0 are left out), the form every tool prints.
  std::string toString() const;
};

using Findings = std::vector<Finding>;

bool hasErrors(const Findings &findings);
const char *severityName(Severity s);

/// Progress and cancel: called with (done, total) where total may be 0 when unknown; return
/// false to cancel. Long computations in core take one of these.
using ProgressFn = bool (*)(void *context, std::int64_t done, std::int64_t total);

} // namespace cb
