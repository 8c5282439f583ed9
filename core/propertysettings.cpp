#include "core/propertysettings.h"

#include <nlohmann/json.hpp>

#include <cmath>

namespace cb {

std::string validateSettings(const PropertySettings &s) {
  const SeasonBands &b = s.seasons;
  if (!std::isfinite(b.shoulderFrom) || b.shoulderFrom < 0)
    return "season_shoulder_from must be a number of at least 0";
  if (!std::isfinite(b.peakFrom) || b.peakFrom < b.shoulderFrom)
    return "season_peak_from must be at least season_shoulder_from";
  if (s.unconstrainMethod != "em" && s.unconstrainMethod != "pd" && s.unconstrainMethod != "naive")
    return "unconstrain_method must be em, pd or naive";
  if (!std::isfinite(s.walkCost) || s.walkCost < 0)
    return "walk_cost must be a number of at least 0";
  if (s.lateCancelDays < 0 || s.lateCancelDays > 365)
    return "late_cancel_days must be between 0 and 365";
  if (!std::isfinite(s.tentativeProbability) || s.tentativeProbability < 0 ||
      s.tentativeProbability > 1)
    return "tentative_probability must be between 0 and 1";
  return {};
}

std::string settingsToJson(const PropertySettings &s) {
  const nlohmann::json j{{"season_shoulder_from", s.seasons.shoulderFrom},
                         {"season_peak_from", s.seasons.peakFrom},
                         {"unconstrain_history", s.unconstrainHistory},
                         {"unconstrain_method", s.unconstrainMethod},
                         {"walk_cost", s.walkCost},
                         {"late_cancel_days", s.lateCancelDays},
                         {"tentative_probability", s.tentativeProbability}};
  return j.dump();
}

PropertySettings settingsFromJson(std::string_view text) {
  PropertySettings s;
  nlohmann::json j;
  try {
    j = nlohmann::json::parse(text);
  } catch (const nlohmann::json::exception &e) {
    throw SettingsError(std::string("property settings are not valid JSON: ") + e.what());
  }
  if (!j.is_object())
    throw SettingsError("property settings must be a JSON object");
  auto read = [&](const char *key, auto &target) {
    auto it = j.find(key);
    if (it == j.end())
      return;
    try {
      it->get_to(target);
    } catch (const nlohmann::json::exception &) {
      throw SettingsError(std::string("property setting ") + key + " has the wrong type");
    }
  };
  read("season_shoulder_from", s.seasons.shoulderFrom);
  read("season_peak_from", s.seasons.peakFrom);
  read("unconstrain_history", s.unconstrainHistory);
  read("unconstrain_method", s.unconstrainMethod);
  read("walk_cost", s.walkCost);
  read("late_cancel_days", s.lateCancelDays);
  read("tentative_probability", s.tentativeProbability);
  if (auto msg = validateSettings(s); !msg.empty())
    throw SettingsError(msg);
  return s;
}

std::optional<UnconstrainOptions> historyOptions(const Property &p, bool observed) {
  if (observed || !p.settings.unconstrainHistory)
    return std::nullopt;
  const auto method = parseUnconstrainMethod(p.settings.unconstrainMethod);
  if (!method || *method == UnconstrainMethod::None)
    return std::nullopt;
  UnconstrainOptions o;
  o.method = *method;
  o.seasons = p.settings.seasons;
  return o;
}

} // namespace cb
