// Historical forecast methods: naive, last-year, mavg, ses, holt-winters, ar.
#pragma once

#include "core/forecastmethod.h"

namespace cb {

/// The historical method called `name`, or nullptr when the name is not one of them.
std::unique_ptr<ForecastMethod> makeHistoricalMethod(std::string_view name,
                                                     const MethodOptions &options);

} // namespace cb
