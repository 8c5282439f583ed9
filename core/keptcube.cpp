#include "core/keptcube.h"

#include "core/cachefile.h"

#include <algorithm>
#include <array>
#include <cstring>
#include <functional>
#include <limits>
#include <type_traits>

// Hand-written for the reason the snapshot is (core/reservationsnapshot.cpp): a few flat arrays
// behind a header, and no Debian library we use writes our own record.
//
// Layout (format 1, the machine's byte order, recorded in the header):
//   header, 64 bytes: magic, format, byte order, stamp, payload bytes, checksum of the payload,
//     zero
//   payload: newest, first arrival, first stay, last stay (i32 days each); the cube's first
//     night, last night, reading date and longest lead (i32 each); series kind, late no-show
//     flag, series count (u32 each); each series' name (u32 length, bytes); each series' first
//     booking (i32); no-show rooms i32[series][night]; rooms i32[series][night][lead]; revenue
//     in millionths i64, same layout.

namespace cb {
namespace fs = std::filesystem;

namespace {
constexpr std::array<char, 8> kMagic = {'C', 'B', 'C', 'U', 'B', 'E', '\0', '\0'};
constexpr std::uint32_t kKeptCubeFormat = 1;

class Writer {
public:
  template <class T> void put(const T &value) {
    const auto *p = reinterpret_cast<const char *>(&value);
    bytes_.append(p, sizeof(T));
  }
  template <class T, class Alloc> void putArray(const std::vector<T, Alloc> &values) {
    bytes_.append(reinterpret_cast<const char *>(values.data()), values.size() * sizeof(T));
  }
  void putText(const std::string &text) {
    put(static_cast<std::uint32_t>(text.size()));
    bytes_ += text;
  }
  std::string &bytes() { return bytes_; }

private:
  std::string bytes_;
};

/// Reads the payload front to back; any read past its end sets failed() and yields zeros.
class Reader {
public:
  explicit Reader(std::string_view bytes) : rest_(bytes) {}
  template <class T> T get() {
    T value{};
    if (rest_.size() < sizeof(T)) {
      failed_ = true;
      return value;
    }
    std::memcpy(&value, rest_.data(), sizeof(T));
    rest_.remove_prefix(sizeof(T));
    return value;
  }
  template <class T, class Alloc> void getArray(std::vector<T, Alloc> &out, std::size_t n) {
    if (n > rest_.size() / sizeof(T)) {
      failed_ = true;
      return;
    }
    out.resize(n);
    std::memcpy(out.data(), rest_.data(), n * sizeof(T));
    rest_.remove_prefix(n * sizeof(T));
  }
  std::string getText() {
    const auto n = get<std::uint32_t>();
    if (failed_ || n > rest_.size()) {
      failed_ = true;
      return {};
    }
    std::string text(rest_.substr(0, n));
    rest_.remove_prefix(n);
    return text;
  }
  Date getDate() { return Date::fromDays(get<std::int32_t>()); }
  bool failed() const { return failed_; }
  bool atEnd() const { return rest_.empty(); }

private:
  std::string_view rest_;
  bool failed_ = false;
};

} // namespace

/// The cube's private arrays to bytes and back (a friend of CurveCube).
class KeptCubeCodec {
public:
  static std::string encode(std::uint64_t stamp, const KeptCube &kept) {
    Writer w;
    w.bytes().assign(kCacheHeaderBytes, '\0');
    const CurveCube &c = kept.cube;
    for (Date d : {*kept.bounds.newest, *kept.bounds.firstArrival, *kept.bounds.firstStay,
                   *kept.bounds.lastStay, c.first_, c.last_, c.asOf_})
      w.put(d.days());
    w.put(static_cast<std::int32_t>(c.maxDba_));
    w.put(static_cast<std::uint32_t>(c.by_));
    w.put(static_cast<std::uint32_t>(c.lateNoShow_ ? 1 : 0));
    w.put(static_cast<std::uint32_t>(c.series_.size()));
    for (const std::string &name : c.series_)
      w.putText(name);
    for (Date d : c.firstBooked_)
      w.put(d.days());
    w.putArray(c.noShow_);
    w.putArray(c.rooms_);
    w.putArray(c.revenue_);

    std::string &bytes = w.bytes();
    const std::string_view payload = std::string_view(bytes).substr(kCacheHeaderBytes);
    char *h = bytes.data();
    std::memcpy(h, kMagic.data(), kMagic.size());
    std::memcpy(h + 8, &kKeptCubeFormat, 4);
    std::memcpy(h + 12, &kCacheByteOrder, 4);
    std::memcpy(h + 16, &stamp, 8);
    const std::uint64_t size = payload.size();
    std::memcpy(h + 24, &size, 8);
    const std::uint64_t sum = cacheChecksum(payload);
    std::memcpy(h + 32, &sum, 8);
    return std::move(bytes);
  }

  static std::optional<KeptCube> decode(std::string_view bytes, std::uint64_t stamp) {
    if (bytes.size() < kCacheHeaderBytes || std::memcmp(bytes.data(), kMagic.data(), 8) != 0)
      return std::nullopt;
    Reader header(bytes.substr(8));
    const auto format = header.get<std::uint32_t>();
    const auto order = header.get<std::uint32_t>();
    const auto fileStamp = header.get<std::uint64_t>();
    const auto size = header.get<std::uint64_t>();
    const auto sum = header.get<std::uint64_t>();
    const std::string_view payload = bytes.substr(kCacheHeaderBytes);
    if (format != kKeptCubeFormat || order != kCacheByteOrder || fileStamp != stamp ||
        size != payload.size() || sum != cacheChecksum(payload))
      return std::nullopt;

    Reader r(payload);
    KeptCube kept;
    kept.bounds.newest = r.getDate();
    kept.bounds.firstArrival = r.getDate();
    kept.bounds.firstStay = r.getDate();
    kept.bounds.lastStay = r.getDate();
    CurveCube &c = kept.cube;
    c.first_ = r.getDate();
    c.last_ = r.getDate();
    c.asOf_ = r.getDate();
    c.maxDba_ = r.get<std::int32_t>();
    const auto by = r.get<std::uint32_t>();
    c.lateNoShow_ = r.get<std::uint32_t>() != 0;
    const auto series = r.get<std::uint32_t>();
    // What keptCubeOf makes, checked in 64-bit day numbers (a damaged date must not overflow):
    // the total, every night stayed up to the newest date + kMaxDba, as of the newest date.
    auto day = [](std::optional<Date> d) { return static_cast<std::int64_t>(d->days()); };
    const std::int64_t first = c.first_.days(), last = c.last_.days();
    const std::int64_t nights = last - first + 1;
    if (r.failed() || by != static_cast<std::uint32_t>(SeriesBy::Total) || series != 1 ||
        c.maxDba_ != KeptCube::kMaxDba || first != day(kept.bounds.firstStay) ||
        c.asOf_ != *kept.bounds.newest || day(kept.bounds.firstArrival) > first ||
        kept.bounds.lastStay->days() < first ||
        last != std::min<std::int64_t>(kept.bounds.lastStay->days(),
                                       day(kept.bounds.newest) + KeptCube::kMaxDba) ||
        nights < 1 || nights > std::numeric_limits<std::int32_t>::max())
      return std::nullopt;
    c.nights_ = static_cast<int>(nights);
    c.by_ = static_cast<SeriesBy>(by);
    for (std::uint32_t k = 0; k < series && !r.failed(); ++k)
      c.series_.push_back(r.getText());
    for (std::uint32_t k = 0; k < series && !r.failed(); ++k)
      c.firstBooked_.push_back(r.getDate());
    const std::size_t perSeries =
        static_cast<std::size_t>(nights) * (static_cast<std::size_t>(c.maxDba_) + 1);
    r.getArray(c.noShow_, static_cast<std::size_t>(nights) * series);
    r.getArray(c.rooms_, perSeries * series);
    r.getArray(c.revenue_, perSeries * series);
    if (r.failed() || !r.atEnd())
      return std::nullopt;
    return kept;
  }
};

fs::path keptCubePathFor(const fs::path &store) { return fs::path(store.string() + ".cube"); }

std::optional<CurveCube> KeptCube::cubeFor(CubeOptions options) const {
  if (!options.asOf)
    options.asOf = bounds.newest;
  if (!cube.canNarrowTo(options, CurveCube::Outside::Empty))
    return std::nullopt;
  return cube.narrowed(options, CurveCube::Outside::Empty);
}

namespace {
template <class Rows> std::optional<KeptCube> keptCubeOfRows(const Rows &reservations) {
  KeptCube kept;
  kept.bounds = boundsOf(reservations);
  if (!kept.bounds.firstStay)
    return std::nullopt;
  CubeOptions o;
  o.firstNight = *kept.bounds.firstStay;
  o.lastNight = std::min(*kept.bounds.lastStay, *kept.bounds.newest + KeptCube::kMaxDba);
  if (o.lastNight < o.firstNight)
    return std::nullopt;
  o.maxDba = KeptCube::kMaxDba;
  o.by = SeriesBy::Total;
  o.asOf = kept.bounds.newest;
  o.newest = kept.bounds.newest;
  if constexpr (std::is_same_v<Rows, std::vector<Reservation>>)
    kept.cube = CurveCube::build(reservations, o);
  else
    kept.cube = CurveCube::buildTotal(reservations, o);
  return kept;
}
} // namespace

std::optional<KeptCube> keptCubeOf(const std::vector<Reservation> &reservations) {
  return keptCubeOfRows(reservations);
}

std::optional<KeptCube> keptCubeOf(std::span<const ReservationFacts> rows) {
  return keptCubeOfRows(rows);
}

std::string encodeKeptCube(std::uint64_t stamp, const KeptCube &kept) {
  return KeptCubeCodec::encode(stamp, kept);
}

std::optional<KeptCube> decodeKeptCube(std::string_view bytes, std::uint64_t stamp) {
  return KeptCubeCodec::decode(bytes, stamp);
}

bool writeKeptCube(const fs::path &file, std::uint64_t stamp, const KeptCube &kept) {
  return replaceFile(file, encodeKeptCube(stamp, kept));
}

std::optional<KeptCube> readKeptCube(const fs::path &file, std::uint64_t stamp) {
  const MappedFile map(file);
  // The stamp first: a cube for other data is not worth checking whole.
  const std::string_view bytes = map.bytes();
  std::uint64_t fileStamp = 0;
  if (bytes.size() < kCacheHeaderBytes)
    return std::nullopt;
  std::memcpy(&fileStamp, bytes.data() + 16, 8);
  if (fileStamp != stamp)
    return std::nullopt;
  return decodeKeptCube(bytes, stamp);
}

} // namespace cb
