// The property's decision settings (PropertySettings) as the JSON text kept in the store's
// property.settings column. Unknown keys are ignored and missing keys keep their defaults, so
// a store written by an older or newer Curvebench still opens.
#pragma once

#include "core/reservation.h"
#include "core/unconstrain.h"

#include <optional>

#include <stdexcept>
#include <string>
#include <string_view>

namespace cb {

/// Thrown for settings that are not valid JSON or hold an invalid value.
class SettingsError : public std::invalid_argument {
public:
  using std::invalid_argument::invalid_argument;
};

/// Example: {"late_cancel_days":2,"season_peak_from":0.9,"season_shoulder_from":0.7,
/// "tentative_probability":0.5,"unconstrain_history":true,"unconstrain_method":"em",
/// "walk_cost":0}
std::string settingsToJson(const PropertySettings &s);
/// Throws SettingsError naming the key at fault ("season_peak_from must be at least
/// season_shoulder_from").
PropertySettings settingsFromJson(std::string_view json);
/// Checks the rules; returns an empty string when valid, else the message.
std::string validateSettings(const PropertySettings &s);

/// The unconstraining the property's settings ask the forecast methods to train on: nullopt
/// when unconstrainHistory is off or the method is "naive"; else the method with the property's
/// season bands. `observed` = true (a command's --naive-history) also gives nullopt.
std::optional<UnconstrainOptions> historyOptions(const Property &p, bool observed = false);

} // namespace cb
