#include "core/reservationsnapshot.h"

#include "core/largememory.h"

#include <fmt/format.h>

#include <algorithm>
#include <array>
#include <cstdio>
#include <cstring>
#include <fstream>
#include <functional>
#include <iterator>
#include <limits>
#include <random>
#include <string>
#include <string_view>
#include <system_error>
#include <unordered_map>

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

// Hand-written: the format is a handful of flat arrays (one per field) behind a header, read with
// memcpy. No Debian library we use offers a columnar file of our own record; SQLite is what it
// caches, and a serialisation library would add a dependency for ~150 lines.

namespace cb {
namespace fs = std::filesystem;
namespace {

constexpr std::array<char, 8> kMagic = {'C', 'B', 'R', 'S', 'N', 'A', 'P', '\0'};
constexpr std::uint32_t kFormat = 1;
constexpr std::uint32_t kByteOrder = 0x01020304; // a file from another byte order is ignored
constexpr std::int32_t kNoDate = std::numeric_limits<std::int32_t>::min();
constexpr std::size_t kHeaderBytes = 48;

template <class T> void put(std::string &out, const T &value) {
  char bytes[sizeof(T)];
  std::memcpy(bytes, &value, sizeof(T));
  out.append(bytes, sizeof(T));
}

template <class T> void putArray(std::string &out, const std::vector<T> &values) {
  out.append(reinterpret_cast<const char *>(values.data()), values.size() * sizeof(T));
}

/// Bounds-checked reading of the payload: every take fails, rather than reads past the end, on
/// a short or damaged file.
class Cursor {
public:
  explicit Cursor(std::string_view bytes) : bytes_(bytes) {}
  template <class T> bool take(T &value) {
    if (bytes_.size() - pos_ < sizeof(T))
      return false;
    std::memcpy(&value, bytes_.data() + pos_, sizeof(T));
    pos_ += sizeof(T);
    return true;
  }
  bool takeText(std::string_view &text, std::size_t n) {
    if (n > bytes_.size() - pos_)
      return false;
    text = bytes_.substr(pos_, n);
    pos_ += n;
    return true;
  }
  bool atEnd() const { return pos_ == bytes_.size(); }

private:
  std::string_view bytes_;
  std::size_t pos_ = 0;
};

// The fewest bytes a row takes in the payload: id length, status, four dates, rooms, rate and
// five code indexes (an id of no bytes).
constexpr std::size_t kMinRowBytes = 4 + 1 + 4 * 4 + 4 + 8 + 5 * 4;

/// Element i of a column of T read in place (the file gives no alignment).
template <class T> T load(std::string_view column, std::size_t i) {
  T value;
  std::memcpy(&value, column.data() + i * sizeof(T), sizeof(T));
  return value;
}

/// The file's bytes mapped read-only (MAP_POPULATE: the page cache mapped in one call, no copy);
/// read into memory where there is no mmap.
class MappedFile {
public:
  explicit MappedFile(const fs::path &file) {
#if CURVEBENCH_HAS_MMAP
    const int fd = ::open(file.c_str(), O_RDONLY | O_CLOEXEC);
    if (fd < 0)
      return;
    struct stat info {};
    if (::fstat(fd, &info) == 0 && info.st_size > 0) {
      const auto size = static_cast<std::size_t>(info.st_size);
      void *p = ::mmap(nullptr, size, PROT_READ, MAP_PRIVATE | MAP_POPULATE, fd, 0);
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
  ~MappedFile() {
#if CURVEBENCH_HAS_MMAP
    if (map_)
      ::munmap(map_, bytes_.size());
#endif
  }
  MappedFile(const MappedFile &) = delete;
  MappedFile &operator=(const MappedFile &) = delete;
  bool ok() const { return bytes_.data() != nullptr; }
  std::string_view bytes() const { return bytes_; }

private:
  void *map_ = nullptr;
  std::string copy_;
  std::string_view bytes_;
};

std::uint64_t checksumOf(std::string_view payload) {
  // libstdc++'s std::hash of a string view is a 64-bit MurmurHash: fast, and enough to catch a
  // damaged or half-written file (the rename makes the latter unlikely anyway).
  return static_cast<std::uint64_t>(std::hash<std::string_view>{}(payload));
}

} // namespace

fs::path snapshotPathFor(const fs::path &store) { return fs::path(store.string() + ".snapshot"); }

std::string encodeReservationSnapshot(std::uint64_t stamp, const std::vector<Reservation> &rows) {
  const std::size_t n = rows.size();
  // Codes (room type, segment, channel, currency, block) are a few distinct texts repeated a
  // million times: each is written once and rows keep its index. Index 0 is the empty text.
  std::vector<std::string_view> texts{std::string_view()};
  std::unordered_map<std::string_view, std::uint32_t> indexOf{{std::string_view(), 0}};
  auto intern = [&](const std::string &s) {
    auto [it, added] = indexOf.try_emplace(s, static_cast<std::uint32_t>(texts.size()));
    if (added)
      texts.push_back(s);
    return it->second;
  };
  std::vector<std::uint8_t> status(n);
  std::vector<std::int32_t> bookedOn(n), cancelledOn(n), arrival(n), departure(n), rooms(n);
  std::vector<double> rate(n);
  std::vector<std::uint32_t> roomType(n), segment(n), channel(n), currency(n), block(n),
      idLength(n);
  std::size_t idBytes = 0;
  for (std::size_t i = 0; i < n; ++i) {
    const Reservation &r = rows[i];
    status[i] = static_cast<std::uint8_t>(r.status);
    bookedOn[i] = r.bookedOn.days();
    cancelledOn[i] = r.cancelledOn ? r.cancelledOn->days() : kNoDate;
    arrival[i] = r.arrival.days();
    departure[i] = r.departure.days();
    rooms[i] = r.rooms;
    rate[i] = r.rate;
    roomType[i] = intern(r.roomType);
    segment[i] = intern(r.segment);
    channel[i] = intern(r.channel);
    currency[i] = intern(r.currency);
    block[i] = intern(r.blockId);
    idLength[i] = static_cast<std::uint32_t>(r.id.size());
    idBytes += r.id.size();
  }

  std::string payload;
  payload.reserve(64 + idBytes + n * 53);
  put(payload, static_cast<std::uint32_t>(texts.size()));
  for (std::string_view t : texts) {
    put(payload, static_cast<std::uint32_t>(t.size()));
    payload.append(t);
  }
  putArray(payload, idLength);
  for (const Reservation &r : rows)
    payload.append(r.id);
  putArray(payload, status);
  for (const auto *column : {&bookedOn, &cancelledOn, &arrival, &departure, &rooms})
    putArray(payload, *column);
  putArray(payload, rate);
  for (const auto *column : {&roomType, &segment, &channel, &currency, &block})
    putArray(payload, *column);

  std::string out;
  out.reserve(kHeaderBytes + payload.size());
  out.append(kMagic.data(), kMagic.size());
  put(out, kFormat);
  put(out, kByteOrder);
  put(out, stamp);
  put(out, static_cast<std::uint64_t>(n));
  put(out, static_cast<std::uint64_t>(payload.size()));
  put(out, checksumOf(payload));
  out += payload;
  return out;
}

std::optional<std::vector<Reservation>> decodeReservationSnapshot(std::string_view bytes,
                                                                  std::uint64_t stamp) {
  if (bytes.size() < kHeaderBytes || std::memcmp(bytes.data(), kMagic.data(), kMagic.size()) != 0)
    return std::nullopt;
  Cursor head(bytes.substr(kMagic.size(), kHeaderBytes - kMagic.size()));
  std::uint32_t format = 0, order = 0;
  std::uint64_t fileStamp = 0, count = 0, payloadBytes = 0, checksum = 0;
  if (!head.take(format) || !head.take(order) || !head.take(fileStamp) || !head.take(count) ||
      !head.take(payloadBytes) || !head.take(checksum))
    return std::nullopt;
  const std::string_view payload = bytes.substr(kHeaderBytes);
  if (format != kFormat || order != kByteOrder || fileStamp != stamp ||
      payloadBytes != payload.size() || checksumOf(payload) != checksum)
    return std::nullopt;

  Cursor in(payload);
  std::uint32_t textCount = 0;
  if (!in.take(textCount) || textCount == 0)
    return std::nullopt;
  std::vector<std::string> texts(textCount);
  for (auto &t : texts) {
    std::uint32_t length = 0;
    std::string_view view;
    if (!in.take(length) || !in.takeText(view, length))
      return std::nullopt;
    t.assign(view);
  }
  // A count no file of this size could hold is refused before anything is allocated for it.
  if (count > payload.size() / kMinRowBytes)
    return std::nullopt;
  const auto n = static_cast<std::size_t>(count);
  // The columns are read in place (no copy of the file's bytes): first find where each starts.
  std::string_view idLengths, ids, status, dates[4], rooms, rate, codes[5];
  if (!in.takeText(idLengths, n * 4))
    return std::nullopt;
  std::size_t idBytes = 0;
  for (std::size_t i = 0; i < n; ++i)
    idBytes += load<std::uint32_t>(idLengths, i);
  if (!in.takeText(ids, idBytes) || !in.takeText(status, n))
    return std::nullopt;
  for (auto &column : dates)
    if (!in.takeText(column, n * 4))
      return std::nullopt;
  if (!in.takeText(rooms, n * 4) || !in.takeText(rate, n * 8))
    return std::nullopt;
  for (auto &column : codes)
    if (!in.takeText(column, n * 4))
      return std::nullopt;
  if (!in.atEnd())
    return std::nullopt;

  std::vector<Reservation> rows;
  reserveLarge(rows, n);
  std::size_t idPos = 0;
  for (std::size_t i = 0; i < n; ++i) {
    const auto st = static_cast<std::uint8_t>(status[i]);
    std::array<std::uint32_t, 5> code{};
    for (std::size_t k = 0; k < code.size(); ++k) {
      code[k] = load<std::uint32_t>(codes[k], i);
      if (code[k] >= textCount)
        return std::nullopt;
    }
    if (st > static_cast<std::uint8_t>(ReservationStatus::CheckedOut))
      return std::nullopt;
    Reservation &r = rows.emplace_back();
    const std::uint32_t idLength = load<std::uint32_t>(idLengths, i);
    r.id.assign(ids.substr(idPos, idLength));
    idPos += idLength;
    r.status = static_cast<ReservationStatus>(st);
    r.bookedOn = Date::fromDays(load<std::int32_t>(dates[0], i));
    if (const auto cancelled = load<std::int32_t>(dates[1], i); cancelled != kNoDate)
      r.cancelledOn = Date::fromDays(cancelled);
    r.arrival = Date::fromDays(load<std::int32_t>(dates[2], i));
    r.departure = Date::fromDays(load<std::int32_t>(dates[3], i));
    r.rooms = load<std::int32_t>(rooms, i);
    r.rate = load<double>(rate, i);
    r.roomType = texts[code[0]];
    r.segment = texts[code[1]];
    r.channel = texts[code[2]];
    r.currency = texts[code[3]];
    r.blockId = texts[code[4]];
  }
  return rows;
}

std::optional<std::vector<Reservation>> readReservationSnapshot(const fs::path &file,
                                                                std::uint64_t stamp) {
  MappedFile map(file);
  if (!map.ok() || map.bytes().size() < kHeaderBytes)
    return std::nullopt;
  // The header first: a snapshot for another stamp is not worth checking whole.
  std::uint64_t fileStamp = 0;
  std::memcpy(&fileStamp, map.bytes().data() + 16, sizeof fileStamp);
  if (fileStamp != stamp)
    return std::nullopt;
  return decodeReservationSnapshot(map.bytes(), stamp);
}

bool writeReservationSnapshot(const fs::path &file, std::uint64_t stamp,
                              const std::vector<Reservation> &rows) {
  const std::string bytes = encodeReservationSnapshot(stamp, rows);
  // A name no other writer uses, so two programs refreshing the same snapshot never mix bytes;
  // the rename then replaces the file in one step.
  const fs::path temp =
      fs::path(fmt::format("{}.{:016x}.tmp", file.string(), std::random_device{}()));
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
  return true;
}

bool updateReservationSnapshot(const fs::path &file, std::uint64_t before, std::uint64_t after,
                               std::vector<Reservation> changed) {
  auto base = readReservationSnapshot(file, before);
  if (!base)
    return false;
  // Both in id order (the store's ORDER BY id compares bytes, as std::string's < does); a
  // changed row replaces the stored row with its id, a new id is inserted in its place.
  auto byId = [](const Reservation &a, const Reservation &b) { return a.id < b.id; };
  std::sort(changed.begin(), changed.end(), byId);
  std::vector<Reservation> merged;
  merged.reserve(base->size() + changed.size());
  auto old = base->begin();
  for (auto &c : changed) {
    while (old != base->end() && old->id < c.id)
      merged.push_back(std::move(*old++));
    if (old != base->end() && old->id == c.id)
      ++old;
    merged.push_back(std::move(c));
  }
  std::move(old, base->end(), std::back_inserter(merged));
  return writeReservationSnapshot(file, after, merged);
}

} // namespace cb
