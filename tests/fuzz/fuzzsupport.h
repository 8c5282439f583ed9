// Shared by the libFuzzer harnesses: a private scratch folder (the importers read files, so each
// input is written to one), a fresh store per input, and the invariants every import must keep
// whatever the bytes — checked with __builtin_trap() so libFuzzer reports a broken promise as
// a crash, like a sanitizer error.
#pragma once

#include "core/finding.h"
#include "core/reservationimporter.h"
#include "core/store.h"

#include <cstddef>
#include <cstdint>
#include <filesystem>
#include <fstream>
#include <string>
#include <string_view>
#include <unistd.h>

namespace cbfuzz {

/// A folder of this process's own under /dev/shm (RAM) when present, else the temp folder.
inline const std::filesystem::path &scratch() {
  static const std::filesystem::path dir = [] {
    std::filesystem::path base = std::filesystem::exists("/dev/shm")
                                     ? std::filesystem::path("/dev/shm")
                                     : std::filesystem::temp_directory_path();
    auto d = base / ("curvebench-fuzz-" + std::to_string(::getpid()));
    std::filesystem::create_directories(d);
    return d;
  }();
  return dir;
}

inline std::filesystem::path writeFile(const std::string &name, std::string_view bytes) {
  const auto path = scratch() / name;
  std::ofstream out(path, std::ios::binary | std::ios::trunc);
  out.write(bytes.data(), static_cast<std::streamsize>(bytes.size()));
  return path;
}

/// A new, empty store: a copy of one made at the first call (creating the schema every time
/// would cost most of each execution).
inline std::unique_ptr<cb::Store> freshStore() {
  const auto dir = scratch();
  const auto pristine = dir / "pristine.curvebench";
  if (!std::filesystem::exists(pristine)) {
    cb::Property p;
    p.name = "Fuzz";
    p.capacity = 100;
    cb::Store::create(pristine, p); // closed again at once
  }
  const auto path = dir / "fuzz.curvebench";
  std::error_code ec;
  for (const char *suffix : {"-wal", "-shm", "-journal"})
    std::filesystem::remove(path.string() + suffix, ec);
  std::filesystem::copy_file(pristine, path, std::filesystem::copy_options::overwrite_existing);
  return cb::Store::open(path);
}

inline void require(bool ok) {
  if (!ok)
    __builtin_trap();
}

/// What every import promises: every finding is located in the file it read (line and column
/// never negative) and has a message; a strict import with an error writes nothing; an import
/// that wrote logs what it added.
inline void checkImport(const cb::ImportReport &r, cb::ImportMode mode, std::int64_t rowsBefore,
                        std::int64_t rowsAfter) {
  for (const cb::Finding &f : r.findings) {
    require(f.line >= 0 && f.column >= 0);
    require(!f.message.empty());
  }
  if (mode == cb::ImportMode::Strict && cb::hasErrors(r.findings))
    require(!r.written && rowsAfter == rowsBefore);
  if (!r.written)
    require(rowsAfter == rowsBefore);
}

} // namespace cbfuzz
