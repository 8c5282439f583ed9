#include "core/nativeformat.h"

#include <algorithm>
#include <charconv>
#include <cmath>
#include <stdexcept>
#include <string>
#include <system_error>

namespace cb {

bool isRequiredNativeColumn(std::string_view column) {
  return isNativeColumn(column) && column != "room_type" && column != "channel" &&
         column != "currency" && column != "block_id";
}

bool isNativeColumn(std::string_view column) {
  return std::find(kNativeColumns.begin(), kNativeColumns.end(), column) != kNativeColumns.end();
}

std::string formatRate(double rate) {
  if (!std::isfinite(rate))
    throw std::invalid_argument("formatRate: rate is not a finite number");
  if (rate == 0.0)
    rate = 0.0; // folds -0.0 so it is never written as "-0"
  // std::to_chars with a format and no precision gives the shortest round-trip digits, defined
  // by the standard rather than the C library, so the output is the same on every platform;
  // `fixed` keeps exponents out (native rates are plain decimals).
  char buf[400];
  auto res = std::to_chars(buf, buf + sizeof buf, rate, std::chars_format::fixed);
  if (res.ec != std::errc())
    throw std::invalid_argument("formatRate: rate too large");
  return std::string(buf, res.ptr);
}

std::string quoteCsvField(std::string_view field) {
  if (field.find_first_of(",\"\r\n") == std::string_view::npos)
    return std::string(field);
  std::string out = "\"";
  for (char c : field) {
    if (c == '"')
      out += '"';
    out += c;
  }
  out += '"';
  return out;
}

void writeNativeHeader(std::ostream &out) {
  for (std::size_t i = 0; i < kNativeColumns.size(); ++i)
    out << (i ? "," : "") << kNativeColumns[i];
  out << '\n';
}

void writeNativeRow(std::ostream &out, const Reservation &r) {
  out << quoteCsvField(r.id) << ',' << statusName(r.status) << ',' << r.bookedOn.toIso() << ','
      << (r.cancelledOn ? r.cancelledOn->toIso() : std::string()) << ',' << r.arrival.toIso() << ','
      << r.departure.toIso() << ',' << std::to_string(r.rooms) << ',' << quoteCsvField(r.roomType)
      << ',' << quoteCsvField(r.segment) << ',' << quoteCsvField(r.channel) << ','
      << formatRate(r.rate) << ',' << quoteCsvField(r.currency) << ',' << quoteCsvField(r.blockId)
      << '\n';
}

void writeNativeCsv(std::ostream &out, const std::vector<Reservation> &reservations) {
  writeNativeHeader(out);
  for (const auto &r : reservations)
    writeNativeRow(out, r);
}

} // namespace cb
