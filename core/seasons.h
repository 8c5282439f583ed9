// Season classes (brief section 6): each night is peak, shoulder or low by unconstrained demand
// over capacity, with the property's bands (SeasonBands; defaults are common practice).
#pragma once

#include "core/reservation.h"

#include <optional>
#include <string_view>

namespace cb {

enum class SeasonClass { Low, Shoulder, Peak };

/// "low", "shoulder", "peak".
std::string_view seasonName(SeasonClass c);
std::optional<SeasonClass> parseSeason(std::string_view name);

/// Classes demand / capacity: ≥ peakFrom → Peak, ≥ shoulderFrom → Shoulder, else Low. A
/// capacity ≤ 0 classes as Low. Throws std::invalid_argument when the bands are not
/// 0 ≤ shoulderFrom ≤ peakFrom or not finite.
SeasonClass classifySeason(double demand, double capacity, const SeasonBands &bands);

} // namespace cb
