#include "core/textformat.h"

#include <fmt/format.h>

#include <cmath>

namespace cb {
namespace {

// fmt's "{:L}" grouping depends on the global C++ locale; reports must not, so group by hand.
std::string group(std::string digits) {
  std::string out;
  int n = 0;
  for (auto it = digits.rbegin(); it != digits.rend(); ++it) {
    if (n > 0 && n % 3 == 0)
      out.insert(out.begin(), ',');
    out.insert(out.begin(), *it);
    ++n;
  }
  return out;
}

} // namespace

std::string formatCount(std::int64_t n) {
  std::string digits = std::to_string(n);
  if (n < 0)
    return "-" + group(digits.substr(1));
  return group(digits);
}

std::string formatMoney(double amount, const std::string &currency) {
  double cents = std::round(std::fabs(amount) * 100.0);
  auto whole = static_cast<std::int64_t>(cents / 100.0);
  auto frac = static_cast<int>(cents - static_cast<double>(whole) * 100.0);
  std::string s = fmt::format("{}{}.{:02d}", amount < 0 && cents > 0 ? "-" : "",
                              group(std::to_string(whole)), frac);
  return currency.empty() ? s : currency + " " + s;
}

std::string formatPercent(double share, int decimals) {
  return fmt::format("{:.{}f} %", share * 100.0, decimals);
}

} // namespace cb
