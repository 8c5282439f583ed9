#include "core/reservationsnapshot.h"

#include "core/cachefile.h"
#include "core/largememory.h"
#include "core/store.h"

#include <fmt/format.h>

#include <algorithm>
#include <array>
#include <chrono>
#include <cstdio>
#include <cstring>
#include <functional>
#include <iterator>
#include <limits>
#include <memory>
#include <string>
#include <string_view>
#include <system_error>
#include <thread>
#include <unordered_map>

// Hand-written: the format is a handful of flat arrays (one per field) behind a header, read in
// place. No Debian library we use offers a columnar file of our own record; SQLite is what it
// caches, and a serialisation library would add a dependency for ~300 lines.
//
// Layout (format 2, the machine's byte order, recorded in the header):
//   header, 64 bytes: magic, format, byte order, stamp, rows n, payload bytes, checksum of the
//     payload, id bytes, zero
//   payload: id lengths u32[n], ids, status u8[n], booked_on, cancelled_on, arrival, departure
//     i32[n] each (days; cancelled_on INT32_MIN when none), rooms i32[n], rate f64[n], room type,
//     segment, channel, currency, block u32[n] each (indexes into the texts), digests
//     2 x u64[n] (digestOf, what an import compares), then the texts: u32 count, and for each
//     u32 length and bytes (index 0 is the empty text).

namespace cb {
namespace fs = std::filesystem;
namespace {

constexpr std::array<char, 8> kMagic = {'C', 'B', 'R', 'S', 'N', 'A', 'P', '\0'};
constexpr std::uint32_t kFormat = 2;
constexpr std::int32_t kNoDate = std::numeric_limits<std::int32_t>::min();
constexpr std::size_t kCodes = 5;
// The bytes of one row outside its id and the texts.
constexpr std::size_t kRowBytes = 4 + 1 + 4 * 4 + 4 + 8 + kCodes * 4 + 16;

/// Where each column starts in the payload, from the row count and the id bytes.
struct Layout {
  std::size_t n = 0;
  std::size_t idLengths = 0, ids = 0, status = 0, dates = 0, rooms = 0, rate = 0, codes = 0,
              digests = 0, texts = 0;
  Layout(std::size_t rows, std::size_t idBytes) : n(rows) {
    ids = idLengths + 4 * n;
    status = ids + idBytes;
    dates = status + n;
    rooms = dates + 4 * 4 * n;
    rate = rooms + 4 * n;
    codes = rate + 8 * n;
    digests = codes + kCodes * 4 * n;
    texts = digests + 16 * n;
  }
  std::size_t date(std::size_t k, std::size_t i) const { return dates + (k * n + i) * 4; }
  std::size_t code(std::size_t k, std::size_t i) const { return codes + (k * n + i) * 4; }
};

template <class T> void store(char *at, const T &value) { std::memcpy(at, &value, sizeof(T)); }
template <class T> T load(const char *at) {
  T value;
  std::memcpy(&value, at, sizeof(T));
  return value;
}

/// A whole snapshot's bytes, built in one pass over the rows.
class Encoded {
public:
  Encoded(std::uint64_t stamp, const std::vector<Reservation> &rows,
          const std::vector<ReservationDigest> *digests) {
    const std::size_t n = rows.size();
    if (digests && digests->size() != n)
      digests = nullptr;
    // First pass: the id bytes, and each distinct code once (rows keep its index). Consecutive
    // rows mostly share their codes, so the map is asked only when a code changes.
    std::vector<std::string_view> texts{std::string_view()};
    std::unordered_map<std::string_view, std::uint32_t> indexOf{{std::string_view(), 0}};
    std::vector<std::array<std::uint32_t, kCodes>> codeOf(n);
    std::array<const std::string *, kCodes> last{};
    std::array<std::uint32_t, kCodes> lastIndex{};
    std::size_t idBytes = 0;
    for (std::size_t i = 0; i < n; ++i) {
      const Reservation &r = rows[i];
      idBytes += r.id.size();
      const std::array<const std::string *, kCodes> code = {&r.roomType, &r.segment, &r.channel,
                                                            &r.currency, &r.blockId};
      for (std::size_t k = 0; k < kCodes; ++k) {
        if (!last[k] || *code[k] != *last[k]) {
          auto [it, added] =
              indexOf.try_emplace(*code[k], static_cast<std::uint32_t>(texts.size()));
          if (added)
            texts.push_back(*code[k]);
          last[k] = code[k];
          lastIndex[k] = it->second;
        }
        codeOf[i][k] = lastIndex[k];
      }
    }
    std::size_t textBytes = 4;
    for (std::string_view t : texts)
      textBytes += 4 + t.size();
    const Layout at(n, idBytes);
    payloadBytes_ = at.texts + textBytes;
    size_ = kCacheHeaderBytes + payloadBytes_;
    // Not zero-filled: every byte is written below.
    bytes_.reset(new char[size_]);
    adviseHugePages(bytes_.get(), size_);
    char *p = bytes_.get() + kCacheHeaderBytes;

    // Second pass: every field into its column.
    std::size_t idPos = at.ids;
    for (std::size_t i = 0; i < n; ++i) {
      const Reservation &r = rows[i];
      store(p + at.idLengths + 4 * i, static_cast<std::uint32_t>(r.id.size()));
      if (!r.id.empty())
        std::memcpy(p + idPos, r.id.data(), r.id.size());
      idPos += r.id.size();
      p[at.status + i] = static_cast<char>(static_cast<std::uint8_t>(r.status));
      store(p + at.date(0, i), r.bookedOn.days());
      store(p + at.date(1, i), r.cancelledOn ? r.cancelledOn->days() : kNoDate);
      store(p + at.date(2, i), r.arrival.days());
      store(p + at.date(3, i), r.departure.days());
      store(p + at.rooms + 4 * i, static_cast<std::int32_t>(r.rooms));
      // -0 as 0, as SQLite stores it, so the snapshot reads back what the table would.
      store(p + at.rate + 8 * i, r.rate == 0.0 ? 0.0 : r.rate);
      for (std::size_t k = 0; k < kCodes; ++k)
        store(p + at.code(k, i), codeOf[i][k]);
      const ReservationDigest d = digests ? (*digests)[i] : digestOf(r);
      store(p + at.digests + 16 * i, d.a);
      store(p + at.digests + 16 * i + 8, d.b);
    }
    char *t = p + at.texts;
    store(t, static_cast<std::uint32_t>(texts.size()));
    t += 4;
    for (std::string_view text : texts) {
      store(t, static_cast<std::uint32_t>(text.size()));
      if (!text.empty()) // an empty view may hold a null pointer, which memcpy must not see
        std::memcpy(t + 4, text.data(), text.size());
      t += 4 + text.size();
    }

    char *h = bytes_.get();
    std::memcpy(h, kMagic.data(), kMagic.size());
    store(h + 8, kFormat);
    store(h + 12, kCacheByteOrder);
    store(h + 16, stamp);
    store(h + 24, static_cast<std::uint64_t>(n));
    store(h + 32, static_cast<std::uint64_t>(payloadBytes_));
    store(h + 40, cacheChecksum(std::string_view(p, payloadBytes_)));
    store(h + 48, static_cast<std::uint64_t>(idBytes));
    store(h + 56, std::uint64_t{0});
  }
  std::string_view bytes() const { return {bytes_.get(), size_}; }

private:
  std::unique_ptr<char[]> bytes_;
  std::size_t size_ = 0, payloadBytes_ = 0;
};

/// A snapshot's bytes checked whole (header, stamp, sizes, checksum, texts) and its columns
/// located; every accessor below then stays inside the bytes.
class Decoded {
public:
  Decoded(std::string_view bytes, std::uint64_t stamp) {
    if (bytes.size() < kCacheHeaderBytes || std::memcmp(bytes.data(), kMagic.data(), kMagic.size()))
      return;
    const char *h = bytes.data();
    const auto count = load<std::uint64_t>(h + 24);
    const auto payloadBytes = load<std::uint64_t>(h + 32);
    const auto idBytes = load<std::uint64_t>(h + 48);
    payload_ = bytes.substr(kCacheHeaderBytes);
    if (load<std::uint32_t>(h + 8) != kFormat || load<std::uint32_t>(h + 12) != kCacheByteOrder ||
        load<std::uint64_t>(h + 16) != stamp || payloadBytes != payload_.size() ||
        load<std::uint64_t>(h + 56) != 0)
      return;
    // Sizes no file of this length could hold are refused before any arithmetic on them.
    if (count > payload_.size() / kRowBytes || idBytes > payload_.size())
      return;
    if (cacheChecksum(payload_) != load<std::uint64_t>(h + 40))
      return;
    layout_ = Layout(static_cast<std::size_t>(count), static_cast<std::size_t>(idBytes));
    const std::size_t n = layout_.n;
    if (layout_.texts + 4 > payload_.size())
      return;
    std::size_t sum = 0;
    for (std::size_t i = 0; i < n; ++i)
      sum += idLength(i);
    if (sum != idBytes)
      return;
    // The texts, to the last byte.
    std::size_t pos = layout_.texts;
    const auto textCount = load<std::uint32_t>(payload_.data() + pos);
    pos += 4;
    // Each text takes at least its 4-byte length: a larger count cannot be whole.
    if (textCount == 0 || textCount > (payload_.size() - pos) / 4)
      return;
    texts_.reserve(textCount);
    for (std::uint32_t k = 0; k < textCount; ++k) {
      if (payload_.size() - pos < 4)
        return;
      const auto length = load<std::uint32_t>(payload_.data() + pos);
      pos += 4;
      if (payload_.size() - pos < length)
        return;
      texts_.emplace_back(payload_.substr(pos, length));
      pos += length;
    }
    if (pos != payload_.size() || !texts_[0].empty())
      return;
    ok_ = true;
  }
  bool ok() const { return ok_; }
  std::size_t size() const { return layout_.n; }
  std::uint32_t idLength(std::size_t i) const {
    return load<std::uint32_t>(payload_.data() + layout_.idLengths + 4 * i);
  }
  /// Calls visit(i, id) for every row in order.
  template <class F> void forEachId(F &&visit) const {
    std::size_t pos = layout_.ids;
    for (std::size_t i = 0; i < layout_.n; ++i) {
      const std::uint32_t length = idLength(i);
      visit(i, payload_.substr(pos, length));
      pos += length;
    }
  }
  ReservationDigest digest(std::size_t i) const {
    const char *d = payload_.data() + layout_.digests + 16 * i;
    return {load<std::uint64_t>(d), load<std::uint64_t>(d + 8)};
  }
  /// Row i without its id; nullopt when a field is out of range (a status or a code index).
  bool fill(std::size_t i, Reservation &r) const {
    const char *p = payload_.data();
    const auto status = static_cast<std::uint8_t>(p[layout_.status + i]);
    if (status > static_cast<std::uint8_t>(ReservationStatus::CheckedOut))
      return false;
    std::array<std::uint32_t, kCodes> code{};
    for (std::size_t k = 0; k < kCodes; ++k) {
      code[k] = load<std::uint32_t>(p + layout_.code(k, i));
      if (code[k] >= texts_.size())
        return false;
    }
    r.status = static_cast<ReservationStatus>(status);
    r.bookedOn = Date::fromDays(load<std::int32_t>(p + layout_.date(0, i)));
    if (const auto cancelled = load<std::int32_t>(p + layout_.date(1, i)); cancelled != kNoDate)
      r.cancelledOn = Date::fromDays(cancelled);
    r.arrival = Date::fromDays(load<std::int32_t>(p + layout_.date(2, i)));
    r.departure = Date::fromDays(load<std::int32_t>(p + layout_.date(3, i)));
    r.rooms = load<std::int32_t>(p + layout_.rooms + 4 * i);
    r.rate = load<double>(p + layout_.rate + 8 * i);
    r.roomType = texts_[code[0]];
    r.segment = texts_[code[1]];
    r.channel = texts_[code[2]];
    r.currency = texts_[code[3]];
    r.blockId = texts_[code[4]];
    return true;
  }

private:
  std::string_view payload_;
  Layout layout_{0, 0};
  std::vector<std::string_view> texts_;
  bool ok_ = false;
};

/// The rows of a checked snapshot, with room for `spare` more; with `digests`, their stored
/// digests too (in the same order, with the same spare room).
std::optional<std::vector<Reservation>> rowsOf(const Decoded &in, std::size_t spare = 0,
                                               std::vector<ReservationDigest> *digests = nullptr) {
  if (!in.ok())
    return std::nullopt;
  std::vector<Reservation> rows;
  reserveLarge(rows, in.size() + spare);
  if (digests) {
    digests->clear();
    digests->reserve(in.size() + spare);
  }
  bool good = true;
  in.forEachId([&](std::size_t i, std::string_view id) {
    if (!good)
      return;
    Reservation &r = rows.emplace_back();
    r.id.assign(id);
    good = in.fill(i, r);
    if (digests)
      digests->push_back(in.digest(i));
  });
  if (!good)
    return std::nullopt;
  return rows;
}

/// The bytes of a mapped snapshot when it is at least a header long and was written for
/// `stamp` (checked first: a snapshot for another stamp is not worth checking whole); else empty.
std::string_view bytesFor(const MappedFile &map, std::uint64_t stamp) {
  const std::string_view bytes = map.bytes();
  if (bytes.size() < kCacheHeaderBytes || load<std::uint64_t>(bytes.data() + 16) != stamp)
    return {};
  return bytes;
}

} // namespace

fs::path snapshotPathFor(const fs::path &store) { return fs::path(store.string() + ".snapshot"); }

std::string encodeReservationSnapshot(std::uint64_t stamp, const std::vector<Reservation> &rows,
                                      const std::vector<ReservationDigest> *digests) {
  return std::string(Encoded(stamp, rows, digests).bytes());
}

std::optional<std::vector<Reservation>> decodeReservationSnapshot(std::string_view bytes,
                                                                  std::uint64_t stamp) {
  return rowsOf(Decoded(bytes, stamp));
}

std::optional<std::vector<Reservation>> readReservationSnapshot(const fs::path &file,
                                                                std::uint64_t stamp) {
  const MappedFile map(file);
  const std::string_view bytes = bytesFor(map, stamp);
  if (bytes.empty())
    return std::nullopt;
  return rowsOf(Decoded(bytes, stamp));
}

bool visitSnapshotDigests(
    const fs::path &file, std::uint64_t stamp,
    const std::function<void(std::string &&id, const ReservationDigest &digest)> &visit,
    const std::function<void(std::size_t rows)> &count) {
  const MappedFile map(file);
  const std::string_view bytes = bytesFor(map, stamp);
  if (bytes.empty())
    return false;
  const Decoded in(bytes, stamp);
  if (!in.ok())
    return false;
  if (count)
    count(in.size());
  in.forEachId([&](std::size_t i, std::string_view id) { visit(std::string(id), in.digest(i)); });
  return true;
}

bool writeReservationSnapshot(const fs::path &file, std::uint64_t stamp,
                              const std::vector<Reservation> &rows,
                              const std::vector<ReservationDigest> *digests) {
  const Encoded encoded(stamp, rows, digests);
  return replaceFile(file, encoded.bytes());
}

bool updateReservationSnapshot(
    const fs::path &file, std::uint64_t before, std::uint64_t after,
    std::vector<Reservation> changed,
    const std::function<void(const std::vector<Reservation> &rows)> &withRows) {
  // Both in id order (the store's ORDER BY id compares bytes, as std::string's < does); a
  // changed row replaces the stored row with its id, a new id is inserted in its place.
  auto byId = [](const Reservation &a, const Reservation &b) { return a.id < b.id; };
  // Stable, and the last row of an id kept: the store too keeps the last write of an id.
  std::stable_sort(changed.begin(), changed.end(), byId);
  changed.erase(
      changed.begin(),
      std::unique(changed.rbegin(), changed.rend(), [](const Reservation &a, const Reservation &b) {
        return a.id == b.id;
      }).base());

  const MappedFile map(file);
  const std::string_view bytes = bytesFor(map, before);
  if (bytes.empty())
    return false;
  const Decoded in(bytes, before);
  if (!in.ok())
    return false;
  // How many changed ids are new, from the ids in place (no row decoded yet): the rows are then
  // decoded once, with room for them, and merged in place from the back. A daily extract
  // changes a few hundred of a million rows: a second million-row vector (232 MB, most of the
  // update's time went on the kernel zeroing its pages) and a digest per row are not needed.
  std::size_t added = 0;
  bool inOrder = true; // what every snapshot holds; without it the merge below would be wrong
  {
    auto c = changed.begin();
    std::string_view previous;
    in.forEachId([&](std::size_t i, std::string_view id) {
      if (i > 0 && !(previous < id))
        inOrder = false;
      previous = id;
      for (; c != changed.end() && std::string_view(c->id) < id; ++c)
        ++added;
      if (c != changed.end() && std::string_view(c->id) == id)
        ++c;
    });
    added += static_cast<std::size_t>(changed.end() - c);
  }
  if (!inOrder)
    return false;
  std::vector<ReservationDigest> digests;
  auto rows = rowsOf(in, added, &digests);
  if (!rows)
    return false;
  std::vector<Reservation> &merged = *rows;
  // Back to front: old rows after the changed id move up by the number of new ids still to
  // place (k − i); a changed row takes its id's place, or the gap above it. The rows before the
  // first changed id stay where they are.
  std::size_t i = merged.size(), k = i + added;
  merged.resize(k);
  digests.resize(k);
  for (auto c = changed.rbegin(); c != changed.rend(); ++c) {
    for (; i > 0 && merged[i - 1].id > c->id; --i, --k)
      if (k != i) {
        merged[k - 1] = std::move(merged[i - 1]);
        digests[k - 1] = digests[i - 1];
      }
    if (i > 0 && merged[i - 1].id == c->id)
      --i;
    digests[k - 1] = digestOf(*c);
    merged[--k] = std::move(*c);
  }
  // The file is written on a second thread while `withRows` works from the same rows (both
  // only read them): at a million rows, 0.3 s of encoding and writing beside the kept cube's
  // 0.1 s. With no thread to be had, one after the other.
  bool written = false;
  auto write = [&]() noexcept {
    try {
      written = writeReservationSnapshot(file, after, merged, &digests);
    } catch (...) {
      written = false; // out of memory, say: only a cache
    }
  };
  std::thread writer;
  try {
    writer = std::thread(write);
  } catch (...) {
    write();
  }
  struct Join {
    std::thread &t;
    ~Join() {
      if (t.joinable())
        t.join();
    }
  } join{writer};
  if (withRows)
    withRows(merged);
  if (writer.joinable())
    writer.join();
  return written;
}

} // namespace cb
