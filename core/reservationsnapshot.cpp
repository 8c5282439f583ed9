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
#include <span>
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

/// A whole snapshot's bytes: from rows (in one pass over them), or by a merge (see
/// updateReservationSnapshot) that fills them row by row through allocate(), putRow(),
/// copyRow() and finish().
class Encoded {
public:
  using Codes = std::array<std::uint32_t, kCodes>;
  Encoded() = default;
  Encoded(std::uint64_t stamp, const std::vector<Reservation> &rows,
          const std::vector<ReservationDigest> *digests) {
    const std::size_t n = rows.size();
    if (digests && digests->size() != n)
      digests = nullptr;
    // First pass: the id bytes, and each distinct code once (rows keep its index). Consecutive
    // rows mostly share their codes, so the map is asked only when a code changes.
    std::vector<std::string_view> texts{std::string_view()};
    std::unordered_map<std::string_view, std::uint32_t> indexOf{{std::string_view(), 0}};
    std::vector<Codes> codeOf(n);
    std::array<const std::string *, kCodes> last{};
    Codes lastIndex{};
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
    allocate(n, idBytes, texts);
    // Second pass: every field into its column.
    for (std::size_t i = 0; i < n; ++i)
      putRow(rows[i], codeOf[i], digests ? (*digests)[i] : digestOf(rows[i]));
    finish(stamp, texts);
  }

  /// Room for n rows with idBytes of ids in all and these texts (index 0 the empty one).
  void allocate(std::size_t n, std::size_t idBytes, const std::vector<std::string_view> &texts) {
    std::size_t textBytes = 4;
    for (std::string_view t : texts)
      textBytes += 4 + t.size();
    at_ = Layout(n, idBytes);
    idBytes_ = idBytes;
    payloadBytes_ = at_.texts + textBytes;
    size_ = kCacheHeaderBytes + payloadBytes_;
    // Not zero-filled: every byte is written before finish() returns.
    bytes_.reset(new char[size_]);
    adviseHugePages(bytes_.get(), size_);
    row_ = 0;
    idPos_ = at_.ids;
  }
  /// The next row, from a reservation, its code indexes and its digest.
  void putRow(const Reservation &r, const Codes &codes, const ReservationDigest &d) {
    char *p = bytes_.get() + kCacheHeaderBytes;
    const std::size_t i = row_++;
    store(p + at_.idLengths + 4 * i, static_cast<std::uint32_t>(r.id.size()));
    if (!r.id.empty())
      std::memcpy(p + idPos_, r.id.data(), r.id.size());
    idPos_ += r.id.size();
    p[at_.status + i] = static_cast<char>(static_cast<std::uint8_t>(r.status));
    store(p + at_.date(0, i), r.bookedOn.days());
    store(p + at_.date(1, i), r.cancelledOn ? r.cancelledOn->days() : kNoDate);
    store(p + at_.date(2, i), r.arrival.days());
    store(p + at_.date(3, i), r.departure.days());
    store(p + at_.rooms + 4 * i, static_cast<std::int32_t>(r.rooms));
    // -0 as 0, as SQLite stores it, so the snapshot reads back what the table would.
    store(p + at_.rate + 8 * i, r.rate == 0.0 ? 0.0 : r.rate);
    for (std::size_t k = 0; k < kCodes; ++k)
      store(p + at_.code(k, i), codes[k]);
    store(p + at_.digests + 16 * i, d.a);
    store(p + at_.digests + 16 * i + 8, d.b);
  }
  /// The next row, copied from row o of another snapshot's payload (laid out as `from`) whose
  /// texts are the first ones of this one's, so its code indexes stay as they are.
  void copyRow(const char *from, const Layout &in, std::size_t o, std::string_view id) {
    char *p = bytes_.get() + kCacheHeaderBytes;
    const std::size_t i = row_++;
    store(p + at_.idLengths + 4 * i, static_cast<std::uint32_t>(id.size()));
    if (!id.empty())
      std::memcpy(p + idPos_, id.data(), id.size());
    idPos_ += id.size();
    p[at_.status + i] = from[in.status + o];
    for (std::size_t k = 0; k < 4; ++k)
      std::memcpy(p + at_.date(k, i), from + in.date(k, o), 4);
    std::memcpy(p + at_.rooms + 4 * i, from + in.rooms + 4 * o, 4);
    std::memcpy(p + at_.rate + 8 * i, from + in.rate + 8 * o, 8);
    for (std::size_t k = 0; k < kCodes; ++k)
      std::memcpy(p + at_.code(k, i), from + in.code(k, o), 4);
    std::memcpy(p + at_.digests + 16 * i, from + in.digests + 16 * o, 16);
  }
  /// After the last row: the texts and the header. False (and no bytes) when the rows put do
  /// not fill what allocate() made room for.
  bool finish(std::uint64_t stamp, const std::vector<std::string_view> &texts) {
    if (row_ != at_.n || idPos_ != at_.ids + idBytes_) {
      bytes_.reset();
      size_ = 0;
      return false;
    }
    char *p = bytes_.get() + kCacheHeaderBytes;
    char *t = p + at_.texts;
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
    store(h + 24, static_cast<std::uint64_t>(at_.n));
    store(h + 32, static_cast<std::uint64_t>(payloadBytes_));
    store(h + 40, cacheChecksum(std::string_view(p, payloadBytes_)));
    store(h + 48, static_cast<std::uint64_t>(idBytes_));
    store(h + 56, std::uint64_t{0});
    return true;
  }
  std::string_view bytes() const { return {bytes_.get(), size_}; }

private:
  std::unique_ptr<char[]> bytes_;
  std::size_t size_ = 0, payloadBytes_ = 0, idBytes_ = 0, row_ = 0, idPos_ = 0;
  Layout at_{0, 0};
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
  /// False when a field of row i is out of range (its status or a code index).
  bool valid(std::size_t i) const {
    const char *p = payload_.data();
    if (static_cast<std::uint8_t>(p[layout_.status + i]) >
        static_cast<std::uint8_t>(ReservationStatus::CheckedOut))
      return false;
    for (std::size_t k = 0; k < kCodes; ++k)
      if (load<std::uint32_t>(p + layout_.code(k, i)) >= texts_.size())
        return false;
    return true;
  }
  /// Row i's dates, rooms, rate and status; requires valid(i).
  ReservationFacts facts(std::size_t i) const {
    const char *p = payload_.data();
    ReservationFacts f;
    f.status = static_cast<ReservationStatus>(static_cast<std::uint8_t>(p[layout_.status + i]));
    f.bookedOn = Date::fromDays(load<std::int32_t>(p + layout_.date(0, i)));
    if (const auto cancelled = load<std::int32_t>(p + layout_.date(1, i)); cancelled != kNoDate)
      f.cancelledOn = Date::fromDays(cancelled);
    f.arrival = Date::fromDays(load<std::int32_t>(p + layout_.date(2, i)));
    f.departure = Date::fromDays(load<std::int32_t>(p + layout_.date(3, i)));
    f.rooms = load<std::int32_t>(p + layout_.rooms + 4 * i);
    f.rate = load<double>(p + layout_.rate + 8 * i);
    return f;
  }
  /// Row i without its id; false when a field is out of range (see valid()).
  bool fill(std::size_t i, Reservation &r) const {
    if (!valid(i))
      return false;
    const ReservationFacts f = facts(i);
    r.status = f.status;
    r.bookedOn = f.bookedOn;
    r.cancelledOn = f.cancelledOn;
    r.arrival = f.arrival;
    r.departure = f.departure;
    r.rooms = f.rooms;
    r.rate = f.rate;
    const char *p = payload_.data();
    std::string *const code[kCodes] = {&r.roomType, &r.segment, &r.channel, &r.currency,
                                       &r.blockId};
    for (std::size_t k = 0; k < kCodes; ++k)
      *code[k] = texts_[load<std::uint32_t>(p + layout_.code(k, i))];
    return true;
  }
  const char *payload() const { return payload_.data(); }
  const Layout &layout() const { return layout_; }
  const std::vector<std::string_view> &texts() const { return texts_; }

private:
  std::string_view payload_;
  Layout layout_{0, 0};
  std::vector<std::string_view> texts_;
  bool ok_ = false;
};

std::optional<std::vector<Reservation>> rowsOf(const Decoded &in) {
  if (!in.ok())
    return std::nullopt;
  std::vector<Reservation> rows;
  reserveLarge(rows, in.size());
  bool good = true;
  in.forEachId([&](std::size_t i, std::string_view id) {
    if (!good)
      return;
    Reservation &r = rows.emplace_back();
    r.id.assign(id);
    good = in.fill(i, r);
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

struct SnapshotDigests::Impl {
  Impl(const fs::path &file, std::uint64_t stamp, std::size_t minRows)
      : map(file), in(enoughRows(bytesFor(map, stamp), minRows), stamp) {}
  /// `bytes` when their header counts at least minRows rows; else none (Decoded refuses them).
  static std::string_view enoughRows(std::string_view bytes, std::size_t minRows) {
    if (bytes.size() < kCacheHeaderBytes || load<std::uint64_t>(bytes.data() + 24) < minRows)
      return {};
    return bytes;
  }
  MappedFile map;
  Decoded in;
  /// Where each id starts in the payload, and one past the last.
  std::vector<std::size_t> starts;
  std::string_view id(std::size_t i) const {
    return {in.payload() + starts[i], starts[i + 1] - starts[i]};
  }
};

SnapshotDigests::SnapshotDigests(std::unique_ptr<Impl> impl) : impl_(std::move(impl)) {}
SnapshotDigests::~SnapshotDigests() = default;

std::unique_ptr<SnapshotDigests> SnapshotDigests::open(const fs::path &file, std::uint64_t stamp,
                                                       std::size_t minRows) {
  auto impl = std::make_unique<Impl>(file, stamp, minRows);
  if (!impl->in.ok())
    return nullptr;
  const Decoded &in = impl->in;
  impl->starts.reserve(in.size() + 1);
  bool inOrder = true;
  std::string_view previous;
  std::size_t end = in.layout().ids;
  in.forEachId([&](std::size_t i, std::string_view id) {
    if (i > 0 && !(previous < id))
      inOrder = false;
    previous = id;
    impl->starts.push_back(end);
    end += id.size();
  });
  impl->starts.push_back(end);
  if (!inOrder)
    return nullptr;
  return std::unique_ptr<SnapshotDigests>(new SnapshotDigests(std::move(impl)));
}

std::size_t SnapshotDigests::size() const { return impl_->in.size(); }

std::optional<ReservationDigest> SnapshotDigests::find(std::string_view id) const {
  std::size_t lo = 0, hi = size(); // the first row with an id >= `id` is in [lo, hi]
  while (lo < hi) {
    const std::size_t mid = lo + (hi - lo) / 2;
    if (impl_->id(mid) < id)
      lo = mid + 1;
    else
      hi = mid;
  }
  if (lo == size() || impl_->id(lo) != id)
    return std::nullopt;
  return impl_->in.digest(lo);
}

bool writeReservationSnapshot(const fs::path &file, std::uint64_t stamp,
                              const std::vector<Reservation> &rows,
                              const std::vector<ReservationDigest> *digests) {
  const Encoded encoded(stamp, rows, digests);
  return replaceFile(file, encoded.bytes());
}

namespace {
/// Into `out`: the snapshot of stamp `before` at `file` with `changed` (in id order, one row per
/// id) merged in by id, for stamp `after`; into `facts`, when given, the facts of its rows in
/// the same order. False when there is no such snapshot, or its ids are out of order, or one of
/// its rows is out of range. The old file's mapping ends here, before the new bytes are written.
bool mergeSnapshot(const fs::path &file, std::uint64_t before, std::uint64_t after,
                   const std::vector<Reservation> &changed, Encoded &out,
                   std::vector<ReservationFacts> *facts) {
  const MappedFile map(file);
  const std::string_view bytes = bytesFor(map, before);
  if (bytes.empty())
    return false;
  const Decoded in(bytes, before);
  if (!in.ok())
    return false;
  // The merge copies the old columns row by row into the new file's and puts the changed rows
  // among them; no row is decoded into a Reservation. A daily extract changes a few hundred of
  // a million rows: decoding them all (232 MB, most of it the kernel zeroing fresh pages) and
  // encoding them again took most of the update's time.
  //
  // First pass over the ids: are they in order (what every snapshot holds; the merge needs
  // it), and how many changed ids are new, with how many bytes.
  std::size_t added = 0, addedIdBytes = 0;
  bool inOrder = true;
  {
    auto c = changed.begin();
    std::string_view previous;
    in.forEachId([&](std::size_t i, std::string_view id) {
      if (i > 0 && !(previous < id))
        inOrder = false;
      previous = id;
      for (; c != changed.end() && std::string_view(c->id) < id; ++c) {
        ++added;
        addedIdBytes += c->id.size();
      }
      if (c != changed.end() && std::string_view(c->id) == id)
        ++c;
    });
    for (; c != changed.end(); ++c) {
      ++added;
      addedIdBytes += c->id.size();
    }
  }
  if (!inOrder)
    return false;
  // The old texts keep their indexes (the copied rows' code columns stay valid); the changed
  // rows' codes that are new come after them.
  std::vector<std::string_view> texts = in.texts();
  std::unordered_map<std::string_view, std::uint32_t> indexOf;
  for (std::size_t k = 0; k < texts.size(); ++k)
    indexOf.try_emplace(texts[k], static_cast<std::uint32_t>(k));
  std::vector<Encoded::Codes> codesOf(changed.size());
  for (std::size_t j = 0; j < changed.size(); ++j) {
    const Reservation &r = changed[j];
    const std::array<const std::string *, kCodes> code = {&r.roomType, &r.segment, &r.channel,
                                                          &r.currency, &r.blockId};
    for (std::size_t k = 0; k < kCodes; ++k) {
      auto [it, isNew] = indexOf.try_emplace(*code[k], static_cast<std::uint32_t>(texts.size()));
      if (isNew)
        texts.push_back(*code[k]);
      codesOf[j][k] = it->second;
    }
  }
  const std::size_t oldIdBytes = in.layout().status - in.layout().ids;

  const std::size_t n = in.size() + added;
  out.allocate(n, oldIdBytes + addedIdBytes, texts);
  if (facts)
    reserveLarge(*facts, n);
  bool good = true;
  std::size_t j = 0;
  auto putChanged = [&] {
    out.putRow(changed[j], codesOf[j], digestOf(changed[j]));
    if (facts)
      facts->push_back(ReservationFacts::of(changed[j]));
    ++j;
  };
  in.forEachId([&](std::size_t o, std::string_view id) {
    if (!good)
      return;
    while (j < changed.size() && std::string_view(changed[j].id) < id)
      putChanged();
    if (j < changed.size() && std::string_view(changed[j].id) == id) {
      putChanged(); // replaces stored row o
      return;
    }
    if (!in.valid(o)) {
      good = false;
      return;
    }
    out.copyRow(in.payload(), in.layout(), o, id);
    if (facts)
      facts->push_back(in.facts(o));
  });
  while (good && j < changed.size())
    putChanged();
  return good && out.finish(after, texts);
}
} // namespace

bool updateReservationSnapshot(
    const fs::path &file, std::uint64_t before, std::uint64_t after,
    std::vector<Reservation> changed,
    const std::function<void(std::span<const ReservationFacts> rows)> &withRows) {
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

  Encoded out;
  std::vector<ReservationFacts> facts;
  if (!mergeSnapshot(file, before, after, changed, out, withRows ? &facts : nullptr))
    return false;

  // The file is written on a second thread while `withRows` works from the merged facts: at a
  // million rows, writing 77 MB beside the kept cube's 0.1 s. With no thread to be had, one after
  // the other.
  bool written = false;
  auto write = [&]() noexcept {
    try {
      written = replaceFile(file, out.bytes());
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
    withRows(facts);
  if (writer.joinable())
    writer.join();
  return written;
}

} // namespace cb
