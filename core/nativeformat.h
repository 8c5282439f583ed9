// The native reservation CSV: our column names, what is required, and the writer.
#pragma once

#include "core/reservation.h"

#include <array>
#include <ostream>
#include <string>
#include <string_view>
#include <vector>

namespace cb {

/// Native columns in the order the writer puts them. Readers accept them in any order.
inline constexpr std::array<std::string_view, 13> kNativeColumns = {
    "reservation_id", "status",  "booked_on", "cancelled_on", "arrival",  "departure", "rooms",
    "room_type",      "segment", "channel",   "rate",         "currency", "block_id"};

/// True for the columns a native file must have (the rest may be left out).
bool isRequiredNativeColumn(std::string_view column);
/// True when `column` is one of kNativeColumns.
bool isNativeColumn(std::string_view column);

/// Rate as written in native files: the shortest decimal (no exponent) that reads back to the
/// same double, e.g. 76.5 → "76.5", 100.0 → "100", 0.1 → "0.1". Throws std::invalid_argument
/// for NaN or infinity.
std::string formatRate(double rate);

/// A field quoted per RFC 4180 when it holds a comma, quote, CR or LF (quotes doubled).
std::string quoteCsvField(std::string_view field);

/// Writes the native header and one row per reservation: UTF-8, LF line ends, RFC 4180
/// quoting only where needed, ISO dates, rates via formatRate(). Byte-stable for equal input.
void writeNativeCsv(std::ostream &out, const std::vector<Reservation> &reservations);
/// The header line (with its LF) and one row; writeNativeCsv() is these two in a loop.
void writeNativeHeader(std::ostream &out);
void writeNativeRow(std::ostream &out, const Reservation &r);

} // namespace cb
