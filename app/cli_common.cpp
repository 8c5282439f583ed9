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

CubeSource::CubeSource(const std::string &path, bool total) : store_(cb::Store::open(path)) {
  if (!total)
    return;
  const std::filesystem::path file = cb::keptCubePathFor(store_->path());
  const std::uint64_t stamp = store_->reservationStamp();
  kept_ = cb::readKeptCube(file, stamp);
  if (kept_) {
    keptStamp_ = stamp;
    return;
  }
  reservations();
  // Kept only when no import came between the stamp and the rows (a new stamp each time): else
  // the file would name rows it was not built from.
  if (store_->reservationStamp() != stamp)
    return;
  try {
    kept_ = cb::keptCubeOf(rows_);
    // Best effort, as the snapshot: a store opened for reading only leaves its folder alone.
    if (kept_ && !store_->readOnly())
      cb::writeKeptCube(file, stamp, *kept_);
  } catch (const std::exception &) {
    // No cube to keep (out of memory, say): the command builds its own from the rows.
  }
}

const std::vector<cb::Reservation> &CubeSource::reservations() {
  if (!loaded_) {
    // After the kept cube was read (the defaults came from it), the rows must be of the same
    // data: a write between the two (another program importing) is refused rather than mixed.
    // The stamp changes with every write, so the same stamp before and after means none.
    auto same = [&] { return !keptStamp_ || store_->reservationStamp() == *keptStamp_; };
    const bool before = same();
    rows_ = store_->reservations();
    if (!before || !same())
      throw std::runtime_error(store_->path().string() +
                               " changed while this command read it (another program wrote "
                               "reservations); run the command again");
    loaded_ = true;
  }
  return rows_;
}

cb::CurveCube CubeSource::cube(const cb::CubeOptions &options) {
  if (kept_) {
    // Exactly the kept cube (`curves` with its defaults): handed over rather than copied.
    const cb::CubeOptions k = kept_->cube.options();
    if (options.by == k.by && options.firstNight == k.firstNight &&
        options.lastNight == k.lastNight && options.maxDba == k.maxDba &&
        options.asOf.value_or(*k.asOf) == *k.asOf) {
      cb::CurveCube c = std::move(kept_->cube);
      kept_.reset();
      return c;
    }
    if (std::optional<cb::CurveCube> c = kept_->cubeFor(options))
      return std::move(*c);
  }
  return cb::CurveCube::build(reservations(), options);
}

cb::CensorSources censorSources(const cb::Store &store) {
  return {store.closures(), store.denials()};
}

bool readTableHeader(cb::CsvReader &reader, cb::CsvRecord &rec, const std::string &path,
                     const std::vector<std::string> &names, std::size_t required,
                     const std::string &needs, std::vector<int> &col, cb::Findings &findings) {
  if (!reader.next(rec)) {
    findings.push_back(reader.fatal()
                           ? *reader.fatal()
                           : cb::Finding{cb::Severity::Error, path, 1, 0, "the file is empty"});
    return false;
  }
  col.assign(names.size(), 0);
  for (std::size_t i = 0; i < rec.size(); ++i)
    for (std::size_t k = 0; k < names.size(); ++k)
      if (rec[i] == names[k])
        col[k] = static_cast<int>(i) + 1;
  bool ok = true;
  for (std::size_t k = 0; k < required; ++k)
    if (col[k] == 0) {
      findings.push_back(
          {cb::Severity::Error, path, rec.line, 0,
           fmt::format("missing column \"{}\" (the header needs {})", names[k], needs)});
      ok = false;
    }
  return ok;
}

bool tableRecordOk(const cb::CsvReader &reader, const cb::CsvRecord &rec, const std::string &path,
                   cb::Findings &findings) {
  if (!rec.problem.empty()) {
    findings.push_back({cb::Severity::Error, path, rec.line, rec.problemField, rec.problem});
    return false;
  }
  if (rec.size() != reader.headerSize()) {
    findings.push_back(
        {cb::Severity::Error, path, rec.line, 0,
         fmt::format("{} fields where the header has {}", rec.size(), reader.headerSize())});
    return false;
  }
  return true;
}

} // namespace cbcli
