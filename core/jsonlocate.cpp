// A small scanner rather than the JSON library: nlohmann::json keeps no source positions, and a
// finding must point at the line of the key that is wrong.
#include "core/jsonlocate.h"

#include <cstddef>

namespace cb {
std::pair<std::int64_t, int> textPosition(std::string_view text, std::size_t at) {
  std::int64_t line = 1;
  int column = 1;
  for (std::size_t i = 0; i < at && i < text.size(); ++i) {
    if (text[i] == '\n') {
      ++line;
      column = 1;
    } else if ((static_cast<unsigned char>(text[i]) & 0xC0) != 0x80) {
      ++column;
    }
  }
  return {line, column};
}

namespace {

/// The split of "a.b.c" at dots.
std::vector<std::string> dotted(std::string_view s) {
  std::vector<std::string> out;
  std::size_t start = 0;
  for (std::size_t i = 0; i <= s.size(); ++i)
    if (i == s.size() || s[i] == '.') {
      if (i > start)
        out.emplace_back(s.substr(start, i - start));
      start = i + 1;
    }
  return out;
}

/// The text between the first pair of double quotes at or after `from`.
std::string quotedAt(std::string_view s, std::size_t from) {
  auto open = s.find('"', from);
  if (open == std::string_view::npos)
    return {};
  auto close = s.find('"', open + 1);
  if (close == std::string_view::npos)
    return {};
  return std::string(s.substr(open + 1, close - open - 1));
}

} // namespace

std::pair<std::int64_t, int> jsonKeyPosition(std::string_view text,
                                             const std::vector<std::string> &path) {
  if (path.empty())
    return {0, 0};
  struct Frame {
    bool object = false;
    bool expectKey = false;
    std::string key;
  };
  std::vector<Frame> stack;
  std::size_t bestDepth = 0, bestAt = 0;
  // Whether every enclosing frame is an object entered through the key the path names.
  auto onPath = [&] {
    if (stack.size() > path.size())
      return false;
    for (std::size_t i = 0; i + 1 < stack.size(); ++i)
      if (!stack[i].object || stack[i].key != path[i])
        return false;
    return stack.back().object;
  };
  for (std::size_t i = 0; i < text.size(); ++i) {
    const char c = text[i];
    if (c == '{' || c == '[') {
      stack.push_back(Frame{c == '{', c == '{', {}});
    } else if (c == '}' || c == ']') {
      if (!stack.empty())
        stack.pop_back();
    } else if (c == ',') {
      if (!stack.empty() && stack.back().object)
        stack.back().expectKey = true;
    } else if (c == '"') {
      const std::size_t start = i;
      std::string s;
      for (++i; i < text.size() && text[i] != '"'; ++i) {
        if (text[i] == '\\' && i + 1 < text.size())
          ++i;
        s += text[i];
      }
      if (!stack.empty() && stack.back().object && stack.back().expectKey) {
        stack.back().expectKey = false;
        stack.back().key = s;
        const std::size_t depth = stack.size();
        if (onPath() && path[depth - 1] == s && depth > bestDepth) {
          bestDepth = depth;
          bestAt = start;
          if (depth == path.size())
            break;
        }
      }
    }
  }
  if (bestDepth == 0)
    return {0, 0};
  return textPosition(text, bestAt);
}

std::vector<std::string> profileKeyPath(std::string_view m) {
  constexpr std::string_view unknown = "unknown key \"";
  if (m.substr(0, unknown.size()) == unknown) {
    const std::string key = quotedAt(m, 0);
    const auto in = m.find("\" in ");
    if (in == std::string_view::npos)
      return {key};
    std::string_view where = m.substr(in + 5);
    if (where.substr(0, 11) == "the profile")
      return {key};
    where = where.substr(0, where.find_first_of(" (:"));
    auto path = dotted(where);
    path.push_back(key);
    return path;
  }
  if (m.substr(0, 7) == "fields.") {
    auto path = dotted(m.substr(0, m.find_first_of(" :")));
    if (auto colon = m.find(": \"");
        colon != std::string_view::npos && m.find("is not allowed here") != std::string_view::npos)
      path.push_back(quotedAt(m, colon));
    return path;
  }
  if (m.find("\" is not a block field") != std::string_view::npos)
    return {"fields", quotedAt(m, 0)};
  if (!m.empty() && m[0] == '"')
    return {quotedAt(m, 0)};
  for (std::string_view key : {"delimiter", "warn_unused_columns", "fields"})
    if (m.substr(0, key.size()) == key)
      return {std::string(key)};
  if (m.find("\"version\"") != std::string_view::npos)
    return {"version"};
  if (m.find("\"fields\"") != std::string_view::npos)
    return {"fields"};
  return {};
}

} // namespace cb
