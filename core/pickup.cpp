#include "core/pickup.h"

#include <fmt/format.h>

#include <algorithm>
#include <stdexcept>

namespace cb {
namespace {

const std::string &codeOf(const Reservation &r, SeriesBy by) {
  switch (by) {
  case SeriesBy::Segment: return r.segment;
  case SeriesBy::Channel: return r.channel;
  case SeriesBy::RoomType: return r.roomType;
  case SeriesBy::Total: break;
  }
  static const std::string none;
  return none;
}

std::string seriesName(const std::string &code) { return code.empty() ? "(none)" : code; }

bool within(std::optional<Date> day, PickupWindow w) {
  return day && w.from < *day && *day <= w.to;
}

void checkWindow(PickupWindow w) {
  if (!(w.from < w.to))
    throw std::invalid_argument(
        fmt::format("pickup window from {} to {} is empty", w.from.toIso(), w.to.toIso()));
}

} // namespace

PickupSplit pickupOf(const std::vector<Reservation> &reservations, Date night, PickupWindow window,
                     SeriesBy by, const std::string &code) {
  checkWindow(window);
  PickupSplit p;
  for (const auto &r : reservations) {
    if (!r.covers(night) || (by != SeriesBy::Total && codeOf(r, by) != code))
      continue;
    p.net +=
        (r.onBooks(night, window.to) ? r.rooms : 0) - (r.onBooks(night, window.from) ? r.rooms : 0);
    if (within(r.bookedOn, window))
      p.gross += r.rooms;
    if (within(r.cancelledOn, window))
      p.cancelled += r.rooms;
  }
  return p;
}

PickupSummary PickupSummary::build(const std::vector<Reservation> &reservations,
                                   const PickupOptions &options) {
  PickupSummary s;
  s.asOf_ = options.asOf;
  s.windows_ = options.windows;
  if (s.windows_.empty())
    for (int days : {1, 7, 15})
      s.windows_.push_back(PickupWindow::lastDays(options.asOf, days));
  for (const auto &w : s.windows_) {
    checkWindow(w);
    if (w.to > options.asOf)
      throw std::invalid_argument(fmt::format("pickup window ends {}, after the reading date {}",
                                              w.to.toIso(), options.asOf.toIso()));
  }

  std::optional<Date> newest, lastCovered;
  std::vector<std::string> codes;
  for (const auto &r : reservations) {
    newest = std::max(newest.value_or(r.bookedOn), r.bookedOn);
    if (r.cancelledOn)
      newest = std::max(*newest, *r.cancelledOn);
    if (r.bookedOn <= options.asOf && !r.isDayUse())
      lastCovered = std::max(lastCovered.value_or(r.departure - 1), r.departure - 1);
    // Codes of rows known at the reading date only, as CurveCube does, so nothing dated later
    // changes even the list of series.
    if (options.by != SeriesBy::Total && r.bookedOn <= options.asOf)
      codes.push_back(codeOf(r, options.by));
  }
  if (newest && options.asOf > *newest)
    throw AsOfError(fmt::format("reading date {} is after the newest booking or cancellation in "
                                "the data ({})",
                                options.asOf.toIso(), newest->toIso()));
  std::sort(codes.begin(), codes.end());
  codes.erase(std::unique(codes.begin(), codes.end()), codes.end());
  s.series_.push_back("ALL");
  for (const auto &code : codes)
    s.series_.push_back(seriesName(code));

  const Date last = options.lastNight ? *options.lastNight : lastCovered.value_or(options.asOf);
  s.nights_ = std::max(0, last - options.asOf);
  const Date first = s.firstNight();

  // Difference arrays: each reservation adds its rooms at its first night in range and takes
  // them off after its last, so the pass costs O(windows) per reservation, not O(nights).
  const std::size_t width = static_cast<std::size_t>(s.nights_) + 1;
  std::vector<PickupSplit> diff(s.series_.size() * s.windows_.size() * width);
  auto add = [&](std::size_t series, std::size_t w, int lo, int hi, const PickupSplit &p) {
    std::size_t base = (series * s.windows_.size() + w) * width;
    diff[base + static_cast<std::size_t>(lo)] += p;
    diff[base + static_cast<std::size_t>(hi)] -= p;
  };
  for (const auto &r : reservations) {
    const int lo = std::max(r.arrival, first) - first;
    const int hi = std::min(r.departure, last + 1) - first;
    if (lo >= hi || r.bookedOn > options.asOf)
      continue;
    std::size_t seriesIdx = 0;
    if (options.by != SeriesBy::Total)
      seriesIdx = 1 + static_cast<std::size_t>(
                          std::lower_bound(codes.begin(), codes.end(), codeOf(r, options.by)) -
                          codes.begin());
    for (std::size_t w = 0; w < s.windows_.size(); ++w) {
      const PickupWindow win = s.windows_[w];
      // Every covered night in range shares the same status, so one test serves them all.
      auto onBooksAt = [&](Date t) {
        return r.bookedOn <= t && !(r.cancelledOn && *r.cancelledOn <= t);
      };
      PickupSplit p;
      p.net = (onBooksAt(win.to) ? r.rooms : 0) - (onBooksAt(win.from) ? r.rooms : 0);
      p.gross = within(r.bookedOn, win) ? r.rooms : 0;
      p.cancelled = within(r.cancelledOn, win) ? r.rooms : 0;
      if (p == PickupSplit{})
        continue;
      add(0, w, lo, hi, p);
      if (seriesIdx != 0)
        add(seriesIdx, w, lo, hi, p);
    }
  }

  s.cells_.resize(s.series_.size() * s.windows_.size() * static_cast<std::size_t>(s.nights_));
  for (std::size_t series = 0; series < s.series_.size(); ++series)
    for (std::size_t w = 0; w < s.windows_.size(); ++w) {
      PickupSplit run;
      std::size_t base = (series * s.windows_.size() + w) * width;
      for (int n = 0; n < s.nights_; ++n) {
        run += diff[base + static_cast<std::size_t>(n)];
        s.cells_[s.index(series, w, n)] = run;
      }
    }
  return s;
}

std::optional<std::size_t> PickupSummary::seriesIndex(const std::string &name) const {
  auto it = std::find(series_.begin(), series_.end(), name);
  if (it == series_.end())
    return std::nullopt;
  return static_cast<std::size_t>(it - series_.begin());
}

std::size_t PickupSummary::index(std::size_t series, std::size_t window, int nightOffset) const {
  return (series * windows_.size() + window) * static_cast<std::size_t>(nights_) +
         static_cast<std::size_t>(nightOffset);
}

PickupSplit PickupSummary::at(std::size_t series, Date night, std::size_t window) const {
  const int n = night - firstNight();
  if (series >= series_.size() || window >= windows_.size() || n < 0 || n >= nights_)
    throw std::out_of_range(fmt::format("no pickup cell for night {}", night.toIso()));
  return cells_[index(series, window, n)];
}

PickupSplit PickupSummary::total(std::size_t series, std::size_t window) const {
  if (series >= series_.size() || window >= windows_.size())
    throw std::out_of_range("no such pickup series or window");
  PickupSplit sum;
  for (int n = 0; n < nights_; ++n) {
    sum += cells_[index(series, window, n)];
  }
  return sum;
}

} // namespace cb
