#include "core/date.h"

#include <date/date.h>

#include <array>
#include <cctype>
#include <charconv>

namespace cb {
namespace {

date::year_month_day ymd(Date d) {
  return date::year_month_day{date::sys_days{date::days{d.days()}}};
}

std::optional<int> parseDigits(std::string_view s, std::size_t &pos, std::size_t minLen,
                               std::size_t maxLen) {
  std::size_t start = pos;
  while (pos < s.size() && pos - start < maxLen && std::isdigit(static_cast<unsigned char>(s[pos])))
    ++pos;
  if (pos - start < minLen)
    return std::nullopt;
  int v = 0;
  std::from_chars(s.data() + start, s.data() + pos, v);
  return v;
}

std::optional<Date> make(int y, int m, int d) {
  if (y < 1 || y > 9999 || m < 1 || m > 12 || d < 1 || d > 31)
    return std::nullopt;
  date::year_month_day v{date::year{y}, date::month{static_cast<unsigned>(m)},
                         date::day{static_cast<unsigned>(d)}};
  if (!v.ok())
    return std::nullopt;
  return Date::fromDays(static_cast<std::int32_t>(date::sys_days{v}.time_since_epoch().count()));
}

} // namespace

Date Date::fromYmd(int year, unsigned month, unsigned day) {
  date::year_month_day v{date::year{year}, date::month{month}, date::day{day}};
  return Date(static_cast<std::int32_t>(date::sys_days{v}.time_since_epoch().count()));
}

std::optional<Date> Date::parseIso(std::string_view text) {
  if (text.size() != 10 || text[4] != '-' || text[7] != '-')
    return std::nullopt;
  return parse(text, "%Y-%m-%d");
}

std::optional<Date> Date::parse(std::string_view text, std::string_view pattern) {
  int y = -1, m = -1, d = -1;
  std::size_t pos = 0;
  for (std::size_t i = 0; i < pattern.size(); ++i) {
    char c = pattern[i];
    if (c == '%' && i + 1 < pattern.size()) {
      char f = pattern[++i];
      std::optional<int> v;
      if (f == 'Y')
        v = parseDigits(text, pos, 4, 4);
      else if (f == 'm' || f == 'd')
        v = parseDigits(text, pos, 1, 2);
      else if (f == 'b' || f == 'B') {
        std::size_t start = pos;
        while (pos < text.size() && std::isalpha(static_cast<unsigned char>(text[pos])))
          ++pos;
        auto mm = monthFromEnglishName(text.substr(start, pos - start));
        if (!mm)
          return std::nullopt;
        m = static_cast<int>(*mm);
        continue;
      } else
        return std::nullopt;
      if (!v)
        return std::nullopt;
      (f == 'Y' ? y : f == 'm' ? m : d) = *v;
    } else {
      if (pos >= text.size() || text[pos] != c)
        return std::nullopt;
      ++pos;
    }
  }
  if (pos != text.size())
    return std::nullopt;
  return make(y, m, d);
}

int Date::year() const { return static_cast<int>(ymd(*this).year()); }
unsigned Date::month() const { return static_cast<unsigned>(ymd(*this).month()); }
unsigned Date::day() const { return static_cast<unsigned>(ymd(*this).day()); }

unsigned Date::isoWeekday() const {
  return date::weekday{date::sys_days{date::days{days_}}}.iso_encoding();
}

std::string Date::toIso() const {
  const auto buf = toIsoChars();
  return std::string(buf.data(), buf.size());
}

std::array<char, 10> Date::toIsoChars() const {
  auto v = ymd(*this);
  std::array<char, 10> buf{};
  int y = static_cast<int>(v.year());
  unsigned mo = static_cast<unsigned>(v.month()), da = static_cast<unsigned>(v.day());
  buf[0] = static_cast<char>('0' + (y / 1000) % 10);
  buf[1] = static_cast<char>('0' + (y / 100) % 10);
  buf[2] = static_cast<char>('0' + (y / 10) % 10);
  buf[3] = static_cast<char>('0' + y % 10);
  buf[4] = '-';
  buf[5] = static_cast<char>('0' + mo / 10);
  buf[6] = static_cast<char>('0' + mo % 10);
  buf[7] = '-';
  buf[8] = static_cast<char>('0' + da / 10);
  buf[9] = static_cast<char>('0' + da % 10);
  return buf;
}

std::optional<unsigned> monthFromEnglishName(std::string_view name) {
  static constexpr std::array<std::string_view, 12> names = {
      "january", "february", "march",     "april",   "may",      "june",
      "july",    "august",   "september", "october", "november", "december"};
  if (name.size() < 3)
    return std::nullopt;
  std::string lower(name);
  for (char &c : lower)
    c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  for (unsigned i = 0; i < 12; ++i)
    if (lower == names[i] || (lower.size() == 3 && names[i].substr(0, 3) == lower))
      return i + 1;
  return std::nullopt;
}

} // namespace cb
