// Calendar dates as whole days, the unit of every booking-curve figure.
#pragma once

#include <array>
#include <compare>
#include <cstdint>
#include <optional>
#include <string>
#include <string_view>

namespace cb {

/// A calendar date (proleptic Gregorian), stored as days since 1970-01-01.
/// Example: `Date::fromYmd(2026, 12, 1) - Date::fromYmd(2026, 11, 1) == 30`.
class Date {
public:
  constexpr Date() = default;
  static constexpr Date fromDays(std::int32_t days) { return Date(days); }
  static Date fromYmd(int year, unsigned month, unsigned day);
  /// Parses `YYYY-MM-DD` exactly; nullopt for anything else or an impossible date.
  static std::optional<Date> parseIso(std::string_view text);
  /// Parses with a strftime-like pattern of %Y %m %d %b %B only (e.g. "%d/%m/%Y").
  static std::optional<Date> parse(std::string_view text, std::string_view pattern);

  constexpr std::int32_t days() const { return days_; }
  int year() const;
  unsigned month() const;
  unsigned day() const;
  /// ISO weekday: 1 = Monday … 7 = Sunday.
  unsigned isoWeekday() const;
  std::string toIso() const;
  /// The same 10 characters without an allocation (binding a million dates in an import).
  std::array<char, 10> toIsoChars() const;

  constexpr Date operator+(int n) const { return Date(days_ + n); }
  constexpr Date operator-(int n) const { return Date(days_ - n); }
  constexpr int operator-(Date o) const { return days_ - o.days_; }
  constexpr Date &operator+=(int n) {
    days_ += n;
    return *this;
  }
  constexpr Date &operator++() {
    ++days_;
    return *this;
  }
  constexpr auto operator<=>(const Date &) const = default;

private:
  constexpr explicit Date(std::int32_t d) : days_(d) {}
  std::int32_t days_ = 0;
};

/// Month number 1–12 from an English month name or its 3-letter abbreviation (case-insensitive).
std::optional<unsigned> monthFromEnglishName(std::string_view name);

} // namespace cb
