// Where a finding about a JSON profile points: the line and column of the key it is about.
#pragma once

#include <cstdint>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

namespace cb {

/// Line and column (1-based; columns count UTF-8 characters, as in CSV findings) of the byte at
/// 0-based offset `at` of `text` (clamped to its end).
std::pair<std::int64_t, int> textPosition(std::string_view text, std::size_t at);

/// Line and column (1-based; columns count UTF-8 characters, as in CSV findings) of the key that
/// `path` names, object keys from the top (e.g. {"fields", "rate", "colum"}); when the whole path
/// is not there, of the deepest part of it that is. {0, 0} when not even the first key is found
/// or the path is empty. The text need not be valid JSON past the key.
std::pair<std::int64_t, int> jsonKeyPosition(std::string_view text,
                                             const std::vector<std::string> &path);

/// The key path a profile finding is about, read from its message: "unknown key \"K\" in
/// fields.rate …" → {fields, rate, K}; "fields.rate.date_format …" → {fields, rate,
/// date_format}; "\"kind\" must …" → {kind}. Empty when the message names none.
std::vector<std::string> profileKeyPath(std::string_view message);

} // namespace cb
