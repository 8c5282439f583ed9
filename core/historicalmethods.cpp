#include "core/historicalmethods.h"

namespace cb {

// Placeholder until the historical methods land in this issue.
std::unique_ptr<ForecastMethod> makeHistoricalMethod(std::string_view, const MethodOptions &) {
  return nullptr;
}

} // namespace cb
