// Combined forecast methods: regress, blend, mlp.
#pragma once

#include "core/forecastmethod.h"

namespace cb {

/// The combined method called `name`, or nullptr when the name is not one of them.
std::unique_ptr<ForecastMethod> makeCombinedMethod(std::string_view name,
                                                   const MethodOptions &options);

} // namespace cb
