#include "app/clicommon.h"

#include "core/nativeformat.h"

#include <cstring>
#include <fstream>
#include <stdexcept>

namespace cbcli {

std::string csvText(const std::string &text) {
  if (!text.empty() && std::strchr("=+-@\t\r", text.front()) != nullptr)
    return cb::quoteCsvField("'" + text);
  return cb::quoteCsvField(text);
}

std::string num(std::optional<double> v, int decimals) {
  return v ? fmt::format("{:.{}f}", *v, decimals) : std::string();
}

void emit(const std::string &path, const fmt::memory_buffer &text) {
  if (path.empty()) {
    std::fwrite(text.data(), 1, text.size(), stdout);
    if (std::fflush(stdout) != 0)
      throw std::runtime_error("cannot write standard output");
    return;
  }
  std::ofstream f(path, std::ios::binary);
  f.write(text.data(), static_cast<std::streamsize>(text.size()));
  f.close();
  if (!f)
    throw std::runtime_error("cannot write " + path);
}

std::FILE *notesStream(const std::string &out) { return out.empty() ? stderr : stdout; }

CLI::Validator dateCheck() {
  return CLI::Validator(
      [](std::string &text) {
        return cb::Date::parseIso(text) ? std::string() : "not a date (YYYY-MM-DD): " + text;
      },
      "DATE");
}

const char *weekdayName(cb::Date d) {
  static const char *const names[] = {"Mon", "Tue", "Wed", "Thu", "Fri", "Sat", "Sun"};
  return names[d.isoWeekday() - 1];
}

std::unique_ptr<cb::Store> openWithRows(const std::string &path,
                                        std::vector<cb::Reservation> &rows) {
  auto store = cb::Store::open(path);
  rows = store->reservations();
  if (rows.empty())
    throw std::runtime_error(path + " has no reservations, so there is nothing to forecast from");
  return store;
}

cb::CensorSources censorSources(const cb::Store &store) {
  return {store.closures(), store.denials()};
}

} // namespace cbcli
