#include "core/curvecube.h"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <cstdlib>
#include <limits>
#include <new>
#include <stdexcept>
#include <type_traits>
#include <unordered_map>

#if defined(__linux__)
#include <sys/mman.h>
#endif

namespace cb {
namespace {

// Revenue is summed in integer millionths: difference arrays add and later subtract the same
// amount, which in floating point leaves residues (an empty cell reading -1e-12) and makes a
// cell depend on the order of the rows. Integers are exact and order-free.
constexpr double kMicrosPerUnit = 1e6;

std::int64_t rateMicros(double rate) {
  return std::isfinite(rate) ? std::llround(rate * kMicrosPerUnit) : 0;
}

// Memory for the cube's large arrays. A 1M-booking cube is ~60 MB that is written once, right
// after allocation; on 4 KiB pages the first touch of each page (a page fault) cost more than
// the whole computation in our measurements (0.2 s for 56 MB on a 2-core virtual machine, against
// 0.01 s with transparent huge pages). So blocks of 2 MiB and more are 2 MiB-aligned and
// advised for huge pages where the OS offers it (Linux madvise); smaller ones use the default.
// (The threshold was 4 MiB: the kept cube's 3.2 MB of rooms at a million bookings then took
// some 800 small-page faults at every read, about 10 ms of a 65 ms `curves` on this machine.
// Rounding up to whole huge pages costs under 2 MiB a block.)
class BigBlocks final : public std::pmr::memory_resource {
  static constexpr std::size_t kHuge = std::size_t{2} << 20;
  static constexpr std::size_t kThreshold = kHuge;
  static std::size_t rounded(std::size_t bytes) { return (bytes + kHuge - 1) / kHuge * kHuge; }

  // Blocks from kPopulate up to kThreshold: mapped with their pages present (Linux
  // MAP_POPULATE), one call instead of a page fault per 4 KiB page at first touch. A narrowed
  // cube's rooms (a backtest's, 1-2 MB at a million bookings) took some 650 faults this way.
  static constexpr std::size_t kPopulate = std::size_t{256} << 10;
  static bool populated(std::size_t bytes, std::size_t alignment) {
#if defined(__linux__) && defined(MAP_POPULATE)
    return bytes >= kPopulate && bytes < kThreshold && alignment <= 4096;
#else
    (void)bytes;
    (void)alignment;
    return false;
#endif
  }

  void *do_allocate(std::size_t bytes, std::size_t alignment) override {
#if defined(__linux__) && defined(MAP_POPULATE)
    if (populated(bytes, alignment)) {
      void *p = ::mmap(nullptr, bytes, PROT_READ | PROT_WRITE,
                       MAP_PRIVATE | MAP_ANONYMOUS | MAP_POPULATE, -1, 0);
      if (p == MAP_FAILED)
        throw std::bad_alloc();
      return p;
    }
#endif
    if (bytes < kThreshold || alignment > kHuge)
      return std::pmr::new_delete_resource()->allocate(bytes, alignment);
    void *p = std::aligned_alloc(kHuge, rounded(bytes));
    if (!p)
      throw std::bad_alloc();
#ifdef MADV_HUGEPAGE
    ::madvise(p, rounded(bytes), MADV_HUGEPAGE); // advice only: failure just means small pages
#endif
    return p;
  }
  void do_deallocate(void *p, std::size_t bytes, std::size_t alignment) override {
#if defined(__linux__) && defined(MAP_POPULATE)
    if (populated(bytes, alignment)) {
      ::munmap(p, bytes);
      return;
    }
#endif
    if (bytes < kThreshold || alignment > kHuge)
      std::pmr::new_delete_resource()->deallocate(p, bytes, alignment);
    else
      std::free(p);
  }
  bool do_is_equal(const std::pmr::memory_resource &other) const noexcept override {
    return this == &other;
  }
};

// A bound on the cube's size, so a mistyped range fails with a message instead of exhausting
// memory (each cell costs 12 bytes).
constexpr std::size_t kMaxCells = 250'000'000;

const std::string &codeOf(const Reservation &r, SeriesBy by) {
  switch (by) {
  case SeriesBy::Segment: return r.segment;
  case SeriesBy::Channel: return r.channel;
  case SeriesBy::RoomType: return r.roomType;
  case SeriesBy::Total: break;
  }
  return r.segment; // not reached: Total has no split
}

// One reservation as the build loop needs it, with dates as night indexes from the cube's
// first night (so the loop does integer arithmetic only).
struct Stay {
  std::int64_t revenue; ///< rate × rooms per night, in millionths
  std::int32_t from;    ///< first night covered, clipped to the range
  std::int32_t to;      ///< night after the last one covered, clipped to one past the range
  std::int32_t booked;
  std::int32_t cancelled; ///< a far-future index when not cancelled
  std::int32_t rooms;
  std::uint16_t series;
  bool noShow;
};

/// Rows: std::vector<Reservation> or std::span<const ReservationFacts> (the same field names).
template <class Rows>
std::pmr::vector<Stay> collectStays(const Rows &reservations,
                                    const std::vector<std::int32_t> &splitOf, Date first, Date last,
                                    Date asOf, std::pmr::memory_resource *memory) {
  // Left out: rows not yet booked at the reading date, rows outside the range, day uses.
  auto counts = [&](const auto &r) {
    return r.bookedOn <= asOf && r.arrival <= last && r.departure > first &&
           r.departure > r.arrival;
  };
  const std::size_t nights = static_cast<std::size_t>(last - first + 1);
  std::vector<std::size_t> start(nights + 1, 0);
  for (const auto &r : reservations)
    if (counts(r))
      ++start[static_cast<std::size_t>(std::max(r.arrival, first) - first) + 1];
  for (std::size_t k = 1; k < start.size(); ++k)
    start[k] += start[k - 1];
  std::pmr::vector<Stay> stays(start.back(), memory);
  constexpr std::int32_t kNever = std::numeric_limits<std::int32_t>::max() / 2;
  for (std::size_t i = 0; i < reservations.size(); ++i) {
    const auto &r = reservations[i];
    if (!counts(r))
      continue;
    Stay st{};
    st.from = std::max(r.arrival, first) - first;
    st.to = std::min(r.departure, last + 1) - first;
    st.booked = r.bookedOn - first;
    st.cancelled = r.cancelledOn ? *r.cancelledOn - first : kNever;
    st.rooms = r.rooms;
    st.revenue = rateMicros(r.rate) * r.rooms;
    st.series = splitOf.empty() ? std::uint16_t{0} : static_cast<std::uint16_t>(splitOf[i]);
    st.noShow = r.status == ReservationStatus::NoShow;
    stays[start[static_cast<std::size_t>(st.from)]++] = st;
  }
  return stays;
}

} // namespace

std::pmr::memory_resource *CurveCube::bigBlocks() {
  static BigBlocks blocks;
  return &blocks;
}

std::string_view seriesByName(SeriesBy by) {
  switch (by) {
  case SeriesBy::Total: return "total";
  case SeriesBy::Segment: return "segment";
  case SeriesBy::Channel: return "channel";
  case SeriesBy::RoomType: return "room-type";
  }
  return "total";
}

std::optional<SeriesBy> parseSeriesBy(std::string_view name) {
  for (SeriesBy by : {SeriesBy::Total, SeriesBy::Segment, SeriesBy::Channel, SeriesBy::RoomType})
    if (seriesByName(by) == name)
      return by;
  return std::nullopt;
}

namespace {
/// The reservation's last activity: its booking or its cancellation.
template <class Row> Date lastActivity(const Row &r) {
  return r.cancelledOn ? std::max(r.bookedOn, *r.cancelledOn) : r.bookedOn;
}

template <class Rows> std::optional<Date> newestOf(const Rows &reservations) {
  std::optional<Date> newest;
  for (const auto &r : reservations) {
    const Date d = lastActivity(r);
    if (!newest || d > *newest)
      newest = d;
  }
  return newest;
}

template <class Rows> ReservationBounds boundsOfRows(const Rows &reservations) {
  ReservationBounds b;
  for (const auto &r : reservations) {
    const Date d = lastActivity(r);
    if (!b.newest || d > *b.newest)
      b.newest = d;
    if (!b.firstArrival || r.arrival < *b.firstArrival)
      b.firstArrival = r.arrival;
    if (!r.isDayUse() && (!b.firstStay || r.arrival < *b.firstStay))
      b.firstStay = r.arrival;
    if (!r.isDayUse() && (!b.lastStay || r.departure - 1 > *b.lastStay))
      b.lastStay = r.departure - 1;
  }
  return b;
}
} // namespace

std::optional<Date> newestActivity(const std::vector<Reservation> &reservations) {
  return newestOf(reservations);
}

ReservationBounds boundsOf(const std::vector<Reservation> &reservations) {
  return boundsOfRows(reservations);
}

ReservationBounds boundsOf(std::span<const ReservationFacts> rows) { return boundsOfRows(rows); }

CurveCube CurveCube::build(const std::vector<Reservation> &reservations,
                           const CubeOptions &options) {
  return buildFrom(reservations, options);
}

CurveCube CurveCube::buildTotal(std::span<const ReservationFacts> rows,
                                const CubeOptions &options) {
  if (options.by != SeriesBy::Total)
    throw std::invalid_argument("a cube split by segment, channel or room type needs the "
                                "reservations' codes, not their facts alone");
  return buildFrom(rows, options);
}

template <class Rows>
CurveCube CurveCube::buildFrom(const Rows &reservations, const CubeOptions &options) {
  if (options.lastNight < options.firstNight)
    throw AsOfError(fmt::format("the night range is empty: {} is after {}",
                                options.firstNight.toIso(), options.lastNight.toIso()));
  if (options.maxDba < 0)
    throw AsOfError(
        fmt::format("max days before arrival must be 0 or more, not {}", options.maxDba));
  const std::optional<Date> newest =
      options.newest && !reservations.empty() ? options.newest : newestOf(reservations);
  if (!newest)
    throw AsOfError("the data has no bookings, so no reading date can be set");
  if (options.asOf && *options.asOf > *newest)
    throw AsOfError(
        fmt::format("reading date {} is after the newest booking or cancellation in the data ({})",
                    options.asOf->toIso(), newest->toIso()));

  CurveCube c;
  c.first_ = options.firstNight;
  c.last_ = options.lastNight;
  c.asOf_ = options.asOf.value_or(*newest);
  c.nights_ = c.last_ - c.first_ + 1;
  c.maxDba_ = options.maxDba;
  c.by_ = options.by;
  const Date asOf = c.asOf_;

  // Series: the total, then one per code among the rows known at the reading date (so the list
  // itself does not depend on anything dated later).
  c.series_ = {"ALL"};
  c.firstBooked_ = {Date()};
  std::vector<std::int32_t> splitOf; // per reservation: its series index, or -1 when not known
  if constexpr (std::is_same_v<Rows, std::vector<Reservation>>) {
    if (c.by_ != SeriesBy::Total) {
      std::unordered_map<std::string_view, std::int32_t> ids;
      std::vector<std::string_view> codes;
      std::vector<Date> firstBooked;
      splitOf.assign(reservations.size(), -1);
      std::string_view lastCode;
      std::int32_t lastId = -1;
      for (std::size_t i = 0; i < reservations.size(); ++i) {
        const Reservation &r = reservations[i];
        if (r.bookedOn > asOf)
          continue;
        std::string_view code = codeOf(r, c.by_);
        if (lastId < 0 || code != lastCode) {
          auto [it, added] = ids.try_emplace(code, static_cast<std::int32_t>(codes.size()));
          if (added) {
            codes.push_back(code);
            firstBooked.push_back(r.bookedOn);
          }
          lastCode = code;
          lastId = it->second;
        }
        splitOf[i] = lastId;
        Date &earliest = firstBooked[static_cast<std::size_t>(lastId)];
        earliest = std::min(earliest, r.bookedOn);
      }
      std::vector<std::int32_t> order(codes.size());
      for (std::size_t k = 0; k < order.size(); ++k)
        order[k] = static_cast<std::int32_t>(k);
      std::sort(order.begin(), order.end(), [&](std::int32_t a, std::int32_t b) {
        return codes[static_cast<std::size_t>(a)] < codes[static_cast<std::size_t>(b)];
      });
      std::vector<std::int32_t> rank(codes.size());
      for (std::size_t k = 0; k < order.size(); ++k) {
        rank[static_cast<std::size_t>(order[k])] = static_cast<std::int32_t>(k + 1);
        std::string_view code = codes[static_cast<std::size_t>(order[k])];
        c.series_.push_back(code.empty() ? std::string("(none)") : std::string(code));
        c.firstBooked_.push_back(firstBooked[static_cast<std::size_t>(order[k])]);
      }
      for (auto &s : splitOf)
        if (s >= 0)
          s = rank[static_cast<std::size_t>(s)];
    }
  } else {
    // Facts carry no codes: buildTotal() refuses a split before it gets here.
    static_assert(std::is_same_v<Rows, std::span<const ReservationFacts>>);
    if (c.by_ != SeriesBy::Total)
      throw std::invalid_argument("a split needs the reservations' codes");
  }

  const double wanted =
      static_cast<double>(c.nights_) * (c.maxDba_ + 1.0) * static_cast<double>(c.series_.size());
  if (wanted > static_cast<double>(kMaxCells))
    throw AsOfError(fmt::format("the cube would hold {:.0f} cells (nights × leads × series), more "
                                "than {}; narrow the night range, the lead range or the split",
                                wanted, kMaxCells));
  if (c.series_.size() > std::numeric_limits<std::uint16_t>::max())
    throw AsOfError(fmt::format("{} distinct codes to split by is more than the cube can hold",
                                c.series_.size() - 1));
  const std::size_t stride = static_cast<std::size_t>(c.maxDba_) + 1;
  const std::size_t perSeries = static_cast<std::size_t>(c.nights_) * stride;
  const std::size_t cells = perSeries * c.series_.size();
  c.rooms_.assign(cells, 0);
  c.revenue_.assign(cells, 0);
  c.noShow_.assign(static_cast<std::size_t>(c.nights_) * c.series_.size(), 0);

  // The rows that touch the cube, copied into small records ordered by their first night in
  // range (a counting sort): the scattered writes below then stay within the few nights' rows
  // that sit in cache instead of jumping across the whole cube, and the reads are sequential.
  const std::pmr::vector<Stay> stays =
      collectStays(reservations, splitOf, c.first_, c.last_, asOf, bigBlocks());

  // One pass: a row is on the books for night s on an interval of leads
  // d ∈ [max(0, s − cancelled_on + 1), min(D, s − booked_on)]; cells read after the reading
  // date (d < s − asOf) are left out, so they stay 0 and later rows never leak in. Each interval
  // is two entries of a difference array along d, summed below.
  const int maxDba = c.maxDba_;
  const std::size_t nights = static_cast<std::size_t>(c.nights_);
  const int asOfNight = asOf - c.first_; // the reading date as a night index (may be < 0)
  for (const Stay &st : stays) {
    const std::size_t series = st.series;
    for (int s = st.from; s < st.to; ++s) {
      const int lo = std::max({0, s - asOfNight, s - st.cancelled + 1});
      const int hi = std::min(maxDba, s - st.booked);
      const std::size_t night = static_cast<std::size_t>(s);
      if (st.noShow && s <= asOfNight) {
        c.noShow_[series * nights + night] += st.rooms;
        c.lateNoShow_ = c.lateNoShow_ || st.booked > s;
      }
      if (lo > hi)
        continue;
      const std::size_t row = series * perSeries + night * stride;
      c.rooms_[row + static_cast<std::size_t>(lo)] += st.rooms;
      c.revenue_[row + static_cast<std::size_t>(lo)] += st.revenue;
      if (hi < maxDba) {
        c.rooms_[row + static_cast<std::size_t>(hi) + 1] -= st.rooms;
        c.revenue_[row + static_cast<std::size_t>(hi) + 1] -= st.revenue;
      }
    }
  }

  const std::size_t firstSplit = c.series_.size() > 1 ? 1 : 0;
  for (std::size_t row = firstSplit * perSeries; row < cells; row += stride) {
    for (std::size_t d = 1; d < stride; ++d) {
      c.rooms_[row + d] += c.rooms_[row + d - 1];
      c.revenue_[row + d] += c.revenue_[row + d - 1];
    }
  }
  // The total is the sum of the split, cell by cell (cheaper than a second set of intervals).
  for (std::size_t s = firstSplit; s > 0 && s < c.series_.size(); ++s) {
    for (std::size_t k = 0; k < perSeries; ++k) {
      c.rooms_[k] += c.rooms_[s * perSeries + k];
      c.revenue_[k] += c.revenue_[s * perSeries + k];
    }
    const std::size_t n = static_cast<std::size_t>(c.nights_);
    for (std::size_t k = 0; k < n; ++k)
      c.noShow_[k] += c.noShow_[s * n + k];
  }
  return c;
}

bool CurveCube::canNarrowTo(const CubeOptions &o, Outside outside) const {
  if (!o.asOf || *o.asOf > asOf_ || (*o.asOf < asOf_ && lateNoShow_) || o.by != by_ ||
      o.maxDba < 0 || o.maxDba > maxDba_ || o.lastNight < o.firstNight)
    return false;
  if (outside == Outside::Unknown && (o.firstNight < first_ || o.lastNight > last_))
    return false;
  // build() refuses a cube this large with its message; so does narrowing (the caller builds).
  const double cells = (static_cast<double>(o.lastNight - o.firstNight) + 1.0) * (o.maxDba + 1.0) *
                       static_cast<double>(series_.size());
  return cells <= static_cast<double>(kMaxCells);
}

CurveCube CurveCube::narrowed(const CubeOptions &o, Outside outside) const {
  if (!canNarrowTo(o, outside))
    throw std::invalid_argument("this curve cube cannot give the one asked for: another series "
                                "kind, a longer lead range, or nights or a date it does not hold");
  CurveCube c;
  c.first_ = o.firstNight;
  c.last_ = o.lastNight;
  c.asOf_ = *o.asOf;
  c.nights_ = c.last_ - c.first_ + 1;
  c.maxDba_ = o.maxDba;
  c.by_ = by_;
  c.lateNoShow_ = lateNoShow_;   // kept for the whole range: at worst a later narrowing is refused
  std::vector<std::size_t> from; // the source series of each series kept, in order
  for (std::size_t k = 0; k < series_.size(); ++k)
    if (k == 0 || firstBooked_[k] <= c.asOf_) {
      from.push_back(k);
      c.series_.push_back(series_[k]);
      c.firstBooked_.push_back(firstBooked_[k]);
    }
  const std::size_t stride = static_cast<std::size_t>(c.maxDba_) + 1;
  const std::size_t srcStride = static_cast<std::size_t>(maxDba_) + 1;
  const std::size_t nights = static_cast<std::size_t>(c.nights_);
  const std::size_t srcNights = static_cast<std::size_t>(nights_);
  c.rooms_.resize(nights * stride * from.size()); // zeros: unknown cells and nights outside
  c.revenue_.resize(c.rooms_.size());
  c.noShow_.assign(nights * from.size(), 0);
  const int asOfNight = c.asOf_ - c.first_;
  // The nights of the new range this cube holds; the others stay 0 (Outside::Empty).
  const int lo = std::max(0, first_ - c.first_);
  const int hi = std::min(c.nights_ - 1, last_ - c.first_);
  for (std::size_t j = 0; j < from.size(); ++j)
    for (int n = lo; n <= hi; ++n) {
      const std::size_t srcNight = static_cast<std::size_t>(c.first_ + n - first_);
      const std::size_t src = (from[j] * srcNights + srcNight) * srcStride;
      const std::size_t dst = (j * nights + static_cast<std::size_t>(n)) * stride;
      // Cells d < s − asOf are read after the reading date: unknown, so 0 as build() leaves them.
      const std::size_t known =
          static_cast<std::size_t>(std::clamp(n - asOfNight, 0, static_cast<int>(stride)));
      std::copy_n(rooms_.begin() + static_cast<std::ptrdiff_t>(src + known), stride - known,
                  c.rooms_.begin() + static_cast<std::ptrdiff_t>(dst + known));
      std::copy_n(revenue_.begin() + static_cast<std::ptrdiff_t>(src + known), stride - known,
                  c.revenue_.begin() + static_cast<std::ptrdiff_t>(dst + known));
      if (n <= asOfNight)
        c.noShow_[j * nights + static_cast<std::size_t>(n)] =
            noShow_[from[j] * srcNights + srcNight];
    }
  return c;
}

std::optional<std::size_t> CurveCube::seriesIndex(const std::string &name) const {
  for (std::size_t i = 0; i < series_.size(); ++i)
    if (series_[i] == name)
      return i;
  return std::nullopt;
}

void CurveCube::outOfRange(std::size_t series, Date night, int dba) const {
  throw std::out_of_range(fmt::format("curve cube cell (series {}, night {}, lead {}) is outside "
                                      "{} series, nights {}…{}, leads 0…{}",
                                      series, night.toIso(), dba, series_.size(), first_.toIso(),
                                      last_.toIso(), maxDba_));
}

double CurveCube::otbRevenue(std::size_t series, Date night, int dba) const {
  return static_cast<double>(revenue_[cell(series, night, dba)]) / kMicrosPerUnit;
}

std::optional<int> CurveCube::actual(std::size_t series, Date night) const {
  std::optional<int> f = final(series, night);
  if (!f)
    return std::nullopt;
  return *f - noShow_[series * static_cast<std::size_t>(nights_) +
                      static_cast<std::size_t>(night - first_)];
}

} // namespace cb
