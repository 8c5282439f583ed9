// The file handling the caches beside a store share (the reservation snapshot, the kept curve
// cube): a file's bytes mapped read-only, and a file replaced in one step.
#pragma once

#include <cstddef>
#include <cstdint>
#include <filesystem>
#include <string>
#include <string_view>

namespace cb {

/// Both caches' headers are this long, and record this mark in the machine's byte order: a file
/// from another byte order is ignored.
constexpr std::size_t kCacheHeaderBytes = 64;
constexpr std::uint32_t kCacheByteOrder = 0x01020304;

/// The checksum of a cache's payload: libstdc++'s 64-bit MurmurHash (std::hash of a string
/// view), fast, and enough to catch a damaged or half-written file.
std::uint64_t cacheChecksum(std::string_view payload);

/// A file's bytes mapped read-only (Linux MAP_POPULATE: the page cache mapped in one call, no
/// copy); read into memory where there is no mmap. Empty when the file is missing or empty.
class MappedFile {
public:
  explicit MappedFile(const std::filesystem::path &file);
  ~MappedFile();
  MappedFile(const MappedFile &) = delete;
  MappedFile &operator=(const MappedFile &) = delete;
  std::string_view bytes() const { return bytes_; }

private:
  void *map_ = nullptr;
  std::string copy_;
  std::string_view bytes_;
};

/// Writes `bytes` to a temporary file in the same folder, then renames it over `file`, so a
/// reader sees the old file or the new one, never part of one. Returns false (the old file left
/// as it was) when the folder cannot be written. Also removes the temporaries of writers killed
/// more than an hour ago.
bool replaceFile(const std::filesystem::path &file, std::string_view bytes);

} // namespace cb
