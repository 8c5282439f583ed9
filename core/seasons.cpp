#include "core/seasons.h"

#include <cmath>
#include <stdexcept>

namespace cb {

std::string_view seasonName(SeasonClass c) {
  switch (c) {
  case SeasonClass::Low: return "low";
  case SeasonClass::Shoulder: return "shoulder";
  case SeasonClass::Peak: return "peak";
  }
  return "low";
}

std::optional<SeasonClass> parseSeason(std::string_view name) {
  for (SeasonClass c : {SeasonClass::Low, SeasonClass::Shoulder, SeasonClass::Peak})
    if (seasonName(c) == name)
      return c;
  return std::nullopt;
}

SeasonClass classifySeason(double demand, double capacity, const SeasonBands &bands) {
  if (!std::isfinite(bands.shoulderFrom) || !std::isfinite(bands.peakFrom) ||
      bands.shoulderFrom < 0 || bands.peakFrom < bands.shoulderFrom)
    throw std::invalid_argument("season bands must satisfy 0 <= shoulder <= peak");
  if (!(capacity > 0) || !std::isfinite(demand))
    return SeasonClass::Low;
  const double ratio = demand / capacity;
  if (ratio >= bands.peakFrom)
    return SeasonClass::Peak;
  if (ratio >= bands.shoulderFrom)
    return SeasonClass::Shoulder;
  return SeasonClass::Low;
}

} // namespace cb
