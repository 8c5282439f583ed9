#include "core/pickupmethods.h"

namespace cb {

// Placeholder until the pickup methods land in this issue.
std::unique_ptr<ForecastMethod> makePickupMethod(std::string_view, const MethodOptions &) {
  return nullptr;
}

} // namespace cb
