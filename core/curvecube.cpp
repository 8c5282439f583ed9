#include "core/curvecube.h"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <unordered_map>

namespace cb {
namespace {

// Revenue is summed in integer millionths: difference arrays add and later subtract the same
// amount, which in floating point leaves residues (an empty cell reading -1e-12) and makes a
// cell depend on the order of the rows. Integers are exact and order-free.
constexpr double kMicrosPerUnit = 1e6;

std::int64_t rateMicros(double rate) {
  return std::isfinite(rate) ? std::llround(rate * kMicrosPerUnit) : 0;
}

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

} // namespace

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

std::optional<Date> newestActivity(const std::vector<Reservation> &reservations) {
  std::optional<Date> newest;
  for (const auto &r : reservations) {
    Date d = r.cancelledOn ? std::max(r.bookedOn, *r.cancelledOn) : r.bookedOn;
    if (!newest || d > *newest)
      newest = d;
  }
  return newest;
}

CurveCube CurveCube::build(const std::vector<Reservation> &reservations,
                           const CubeOptions &options) {
  if (options.lastNight < options.firstNight)
    throw AsOfError(fmt::format("the night range is empty: {} is after {}",
                                options.firstNight.toIso(), options.lastNight.toIso()));
  if (options.maxDba < 0)
    throw AsOfError(
        fmt::format("max days before arrival must be 0 or more, not {}", options.maxDba));
  const std::optional<Date> newest = newestActivity(reservations);
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
  std::vector<std::int32_t> splitOf; // per reservation: its series index, or -1 when not known
  if (c.by_ != SeriesBy::Total) {
    std::unordered_map<std::string_view, std::int32_t> ids;
    std::vector<std::string_view> codes;
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
        if (added)
          codes.push_back(code);
        lastCode = code;
        lastId = it->second;
      }
      splitOf[i] = lastId;
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
    }
    for (auto &s : splitOf)
      if (s >= 0)
        s = rank[static_cast<std::size_t>(s)];
  }

  const std::size_t stride = static_cast<std::size_t>(c.maxDba_) + 1;
  const std::size_t perSeries = static_cast<std::size_t>(c.nights_) * stride;
  const std::size_t cells = perSeries * c.series_.size();
  if (static_cast<double>(perSeries) * static_cast<double>(c.series_.size()) >
      static_cast<double>(kMaxCells))
    throw AsOfError(fmt::format("the cube would hold {} cells (nights × leads × series); narrow "
                                "the night range, the lead range or the split",
                                static_cast<double>(cells)));
  c.rooms_.assign(cells, 0);
  c.revenue_.assign(cells, 0);
  c.noShow_.assign(static_cast<std::size_t>(c.nights_) * c.series_.size(), 0);

  // One pass: each reservation is on the books for night s on an interval of leads
  // d ∈ [max(0, s − cancelled_on + 1), min(D, s − booked_on)]; cells read after the reading
  // date (d < s − asOf) are left out, so they stay 0 and later rows never leak in. Each interval
  // is two entries of a difference array along d, summed below.
  const int maxDba = c.maxDba_;
  for (std::size_t i = 0; i < reservations.size(); ++i) {
    const Reservation &r = reservations[i];
    if (r.bookedOn > asOf)
      continue;
    const Date from = std::max(r.arrival, c.first_);
    const Date to = std::min(r.departure, c.last_ + 1); // exclusive
    if (from >= to)
      continue; // outside the range, or a day use (0 nights occupy no night)
    const std::size_t series = splitOf.empty() ? 0 : static_cast<std::size_t>(splitOf[i]);
    const std::int32_t rooms = r.rooms;
    const std::int64_t revenue = rateMicros(r.rate) * r.rooms;
    const bool noShow = r.status == ReservationStatus::NoShow;
    for (Date s = from; s < to; ++s) {
      int lo = std::max(0, s - asOf);
      if (r.cancelledOn)
        lo = std::max(lo, s - *r.cancelledOn + 1);
      const int hi = std::min(maxDba, s - r.bookedOn);
      const std::size_t night = static_cast<std::size_t>(s - c.first_);
      if (noShow && s <= asOf)
        c.noShow_[series * static_cast<std::size_t>(c.nights_) + night] += rooms;
      if (lo > hi)
        continue;
      const std::size_t row = series * perSeries + night * stride;
      c.rooms_[row + static_cast<std::size_t>(lo)] += rooms;
      c.revenue_[row + static_cast<std::size_t>(lo)] += revenue;
      if (hi < maxDba) {
        c.rooms_[row + static_cast<std::size_t>(hi) + 1] -= rooms;
        c.revenue_[row + static_cast<std::size_t>(hi) + 1] -= revenue;
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

std::optional<std::size_t> CurveCube::seriesIndex(const std::string &name) const {
  for (std::size_t i = 0; i < series_.size(); ++i)
    if (series_[i] == name)
      return i;
  return std::nullopt;
}

std::size_t CurveCube::cell(std::size_t series, Date night, int dba) const {
  if (series >= series_.size() || night < first_ || night > last_ || dba < 0 || dba > maxDba_)
    throw std::out_of_range(fmt::format("curve cube cell (series {}, night {}, lead {}) is outside "
                                        "{} series, nights {}…{}, leads 0…{}",
                                        series, night.toIso(), dba, series_.size(), first_.toIso(),
                                        last_.toIso(), maxDba_));
  return (series * static_cast<std::size_t>(nights_) + static_cast<std::size_t>(night - first_)) *
             (static_cast<std::size_t>(maxDba_) + 1) +
         static_cast<std::size_t>(dba);
}

int CurveCube::otbRooms(std::size_t series, Date night, int dba) const {
  return rooms_[cell(series, night, dba)];
}

double CurveCube::otbRevenue(std::size_t series, Date night, int dba) const {
  return static_cast<double>(revenue_[cell(series, night, dba)]) / kMicrosPerUnit;
}

std::optional<int> CurveCube::final(std::size_t series, Date night) const {
  const std::size_t k = cell(series, night, 0);
  if (night > asOf_)
    return std::nullopt;
  return rooms_[k];
}

std::optional<int> CurveCube::actual(std::size_t series, Date night) const {
  std::optional<int> f = final(series, night);
  if (!f)
    return std::nullopt;
  return *f - noShow_[series * static_cast<std::size_t>(nights_) +
                      static_cast<std::size_t>(night - first_)];
}

} // namespace cb
