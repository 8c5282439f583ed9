// The cautions every recommendation carries (brief section 6, and the project's rules): advice is
// advisory; local law and company policy decide. One place, so the CLI, the GUI and exports say
// the same words.
#pragma once

#include <string_view>

namespace cb {

/// For protection levels, booking limits, open/close, minimum stays and season classes.
inline constexpr std::string_view kAdvisoryCaution =
    "Advisory only: these figures support a decision, they do not make it. Local law and company "
    "policy decide.";

/// For overbooking levels.
inline constexpr std::string_view kOverbookingCaution =
    "Advisory only: walking a guest has legal and guest-relations consequences. Local law and "
    "company policy decide whether and how far to overbook.";

} // namespace cb
