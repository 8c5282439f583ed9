// Pickup forecast methods: pickup-add, pickup-adv, pickup-mult, pace-extrap.
#pragma once

#include "core/forecastmethod.h"

namespace cb {

/// The pickup method called `name`, or nullptr when the name is not one of them.
std::unique_ptr<ForecastMethod> makePickupMethod(std::string_view name,
                                                 const MethodOptions &options);

} // namespace cb
