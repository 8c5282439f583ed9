#include "core/combinedmethods.h"

namespace cb {

// Placeholder until the combined methods land in this issue.
std::unique_ptr<ForecastMethod> makeCombinedMethod(std::string_view, const MethodOptions &) {
  return nullptr;
}

} // namespace cb
