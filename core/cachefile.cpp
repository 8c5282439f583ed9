#include "core/cachefile.h"

#include <fmt/format.h>

#include <chrono>
#include <fstream>
#include <functional>
#include <random>
#include <system_error>

#if defined(__unix__) || defined(__APPLE__)
#include <fcntl.h>
#include <sys/mman.h>
#include <sys/stat.h>
#include <unistd.h>
#define CURVEBENCH_HAS_MMAP 1
#else
#define CURVEBENCH_HAS_MMAP 0
#include <sstream>
#endif

namespace cb {
namespace fs = std::filesystem;

std::uint64_t cacheChecksum(std::string_view payload) {
  return static_cast<std::uint64_t>(std::hash<std::string_view>{}(payload));
}

MappedFile::MappedFile(const fs::path &file) {
#if CURVEBENCH_HAS_MMAP
  const int fd = ::open(file.c_str(), O_RDONLY | O_CLOEXEC);
  if (fd < 0)
    return;
  struct stat info {};
  if (::fstat(fd, &info) == 0 && info.st_size > 0) {
    const auto size = static_cast<std::size_t>(info.st_size);
#ifdef MAP_POPULATE
    constexpr int kFlags = MAP_PRIVATE | MAP_POPULATE; // Linux: map the page cache in one call
#else
    constexpr int kFlags = MAP_PRIVATE;
#endif
    void *p = ::mmap(nullptr, size, PROT_READ, kFlags, fd, 0);
    if (p != MAP_FAILED) {
      map_ = p;
      bytes_ = std::string_view(static_cast<const char *>(p), size);
    }
  }
  ::close(fd);
#else
  std::ifstream in(file, std::ios::binary);
  std::ostringstream os;
  if (in && (os << in.rdbuf())) {
    copy_ = os.str();
    bytes_ = copy_;
  }
#endif
}

MappedFile::~MappedFile() {
#if CURVEBENCH_HAS_MMAP
  if (map_)
    ::munmap(map_, bytes_.size());
#endif
}

namespace {

// A writer killed between writing its temporary file and the rename leaves "<file>.XXXXXXXX.tmp"
// behind. Each successful write removes those older than an hour; younger ones may belong to a
// writer still at work in another program.
void removeStaleTemporaries(const fs::path &file) {
  std::error_code ec;
  const fs::path dir = file.has_parent_path() ? file.parent_path() : fs::path(".");
  const std::string prefix = file.filename().string() + ".";
  const auto cutoff = fs::file_time_type::clock::now() - std::chrono::hours(1);
  for (fs::directory_iterator it(dir, ec), end; !ec && it != end; it.increment(ec)) {
    const std::string name = it->path().filename().string();
    if (name.size() != prefix.size() + 12 || name.compare(0, prefix.size(), prefix) != 0 ||
        name.compare(name.size() - 4, 4, ".tmp") != 0)
      continue;
    std::error_code timeError;
    const auto written = it->last_write_time(timeError);
    if (!timeError && written < cutoff)
      fs::remove(it->path(), timeError);
  }
}

} // namespace

bool replaceFile(const fs::path &file, std::string_view bytes) {
  // A name no other writer uses, so two programs refreshing the same file never mix bytes;
  // the rename then replaces the file in one step.
  const fs::path temp =
      fs::path(fmt::format("{}.{:08x}.tmp", file.string(), std::random_device{}()));
  {
    std::ofstream out(temp, std::ios::binary | std::ios::trunc);
    if (!out)
      return false;
    out.write(bytes.data(), static_cast<std::streamsize>(bytes.size()));
    out.close();
    if (!out) {
      std::error_code ignored;
      fs::remove(temp, ignored);
      return false;
    }
  }
  std::error_code ec;
  fs::rename(temp, file, ec);
  if (ec) {
    fs::remove(temp, ec);
    return false;
  }
  removeStaleTemporaries(file);
  return true;
}

} // namespace cb
