// Number formatting for people: thousands separators and money, the same in CLI and GUI.
#pragma once

#include <cstdint>
#include <string>

namespace cb {

/// 79330 → "79,330"; -1234 → "-1,234". English grouping, the default of every report.
std::string formatCount(std::int64_t n);
/// 20166.88, "EUR" → "EUR 20,166.88" (two decimals, grouped).
std::string formatMoney(double amount, const std::string &currency);
/// 0.4173 → "41.7 %".
std::string formatPercent(double share, int decimals = 1);

} // namespace cb
