#include "core/combinedmethods.h"
#include "core/forecastmethod.h"
#include "core/historicalmethods.h"
#include "core/pickupmethods.h"

namespace cb {

std::vector<std::string> methodNames() {
  return {"naive",      "last-year",   "mavg",        "ses",     "holt-winters", "ar", "pickup-add",
          "pickup-adv", "pickup-mult", "pace-extrap", "regress", "blend",        "mlp"};
}

std::unique_ptr<ForecastMethod> makeMethod(std::string_view name, const MethodOptions &options) {
  if (auto m = makeHistoricalMethod(name, options))
    return m;
  if (auto m = makePickupMethod(name, options))
    return m;
  if (auto m = makeCombinedMethod(name, options))
    return m;
  std::string known;
  for (const auto &n : methodNames())
    known += (known.empty() ? "" : ", ") + n;
  throw MethodError("unknown forecast method \"" + std::string(name) + "\" (known: " + known +
                    ", auto)");
}

} // namespace cb
