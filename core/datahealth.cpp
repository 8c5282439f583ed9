#include "core/datahealth.h"

#include "core/curvecube.h"
#include "core/store.h"
#include "core/textformat.h"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <map>
#include <set>

namespace cb {
namespace {

std::string nightRange(Date first, Date last) {
  if (first == last)
    return "night " + first.toIso();
  return fmt::format("nights {} to {}", first.toIso(), last.toIso());
}

/// Room-nights counted by a whole-day quantity (nights into the stay, or days booked ahead),
/// read as "share of all counted room-nights at or above v" — the estimate of what the cut at
/// the start of the data removes.
class TailShare {
public:
  /// Adds `rooms` to every value from `from` to `to` (inclusive).
  void add(int from, int to, int rooms) {
    if (to < from)
      return;
    const auto end = static_cast<std::size_t>(to) + 2;
    if (diff_.size() < end)
      diff_.resize(end, 0);
    diff_[static_cast<std::size_t>(from)] += rooms;
    diff_[static_cast<std::size_t>(to) + 1] -= rooms;
  }
  /// Turns the difference array into "at or above" counts; call once after the last add().
  void finish() {
    std::vector<std::int64_t> count(diff_.size(), 0);
    std::int64_t running = 0;
    for (std::size_t v = 0; v < diff_.size(); ++v) {
      running += diff_[v];
      count[v] = running;
    }
    atLeast_.assign(count.size() + 1, 0);
    for (std::size_t v = count.size(); v-- > 0;)
      atLeast_[v] = atLeast_[v + 1] + count[v];
  }
  double shareAtLeast(int v) const {
    if (atLeast_.empty() || atLeast_[0] == 0 || v < 0)
      return v < 0 ? 1.0 : 0.0;
    const auto i = static_cast<std::size_t>(v);
    if (i >= atLeast_.size())
      return 0.0;
    return static_cast<double>(atLeast_[i]) / static_cast<double>(atLeast_[0]);
  }

private:
  std::vector<std::int64_t> diff_;
  std::vector<std::int64_t> atLeast_;
};

/// Keeps the first `max` findings of one kind and sums up the rest in one more.
class CappedList {
public:
  CappedList(Findings &out, std::size_t max, std::string file)
      : out_(out), max_(max), file_(std::move(file)) {}
  void add(Severity severity, std::string message, Date last) {
    if (listed_ < max_) {
      out_.push_back({severity, file_, 0, 0, std::move(message)});
      ++listed_;
    } else {
      ++more_;
      lastMore_ = last;
    }
  }
  /// "… and 12 more nights over capacity, the last on 2026-08-14".
  void finish(Severity severity, const std::string &what) {
    if (more_ > 0)
      out_.push_back({severity, file_, 0, 0,
                      fmt::format("… and {} more {}, the last on {}", formatCount(more_), what,
                                  lastMore_.toIso())});
  }

private:
  Findings &out_;
  std::size_t max_;
  std::string file_;
  std::size_t listed_ = 0;
  std::int64_t more_ = 0;
  Date lastMore_;
};

} // namespace

Findings checkDataHealth(const std::vector<Reservation> &reservations, const Property &property,
                         const std::vector<Segment> &segments, const HealthOptions &options,
                         const std::string &file) {
  Findings out;
  auto add = [&](Severity severity, std::string message) {
    out.push_back({severity, file, 0, 0, std::move(message)});
  };
  if (reservations.empty()) {
    add(Severity::Info, "no reservations to check");
    return out;
  }

  Date firstArrival = reservations.front().arrival, lastArrival = firstArrival;
  Date firstBooked = reservations.front().bookedOn;
  std::optional<Date> firstNight, lastNight;
  for (const auto &r : reservations) {
    firstArrival = std::min(firstArrival, r.arrival);
    lastArrival = std::max(lastArrival, r.arrival);
    firstBooked = std::min(firstBooked, r.bookedOn);
    if (!r.isDayUse()) {
      firstNight = firstNight ? std::min(*firstNight, r.arrival) : r.arrival;
      lastNight = lastNight ? std::max(*lastNight, r.departure - 1) : r.departure - 1;
    }
  }

  // Rooms on the books per night (the finals, and OTB now for future nights), and what the
  // start of the data cut off, both as shares of all counted room-nights:
  // - inHouse: by night of the stay k = s − arrival (night A0 + k lacks offsets above k);
  // - bookedEarlier[i]: room-nights that, moved to night A0 + i with the same arrival lead L
  //   and offset k, arrive on or after A0 yet were booked before B0. With c = A0 − B0 that is
  //   k ≤ i ≤ k + L − 1 − c, one interval per counted room-night (a difference array).
  std::vector<std::int64_t> rooms, bookedEarlier;
  TailShare inHouse;
  std::int64_t counted = 0;
  if (firstNight) {
    const Date base = *firstNight;
    std::vector<std::int64_t> diff(static_cast<std::size_t>(*lastNight - base) + 2, 0);
    const int span = *lastNight - firstArrival + 1; // nights A0 … last (A0 ≤ first night)
    bookedEarlier.assign(static_cast<std::size_t>(span) + 1, 0);
    const int c = firstArrival - firstBooked;
    for (const auto &r : reservations) {
      // Counted night s: arrival ≤ s < departure, booked on or before s, not cancelled on or
      // before s (OTB(s, s), brief section 4).
      const Date from = std::max(r.arrival, r.bookedOn);
      const Date to = r.cancelledOn ? std::min(r.departure, *r.cancelledOn) : r.departure;
      if (to <= from)
        continue;
      diff[static_cast<std::size_t>(from - base)] += r.rooms;
      diff[static_cast<std::size_t>(to - base)] -= r.rooms;
      counted += static_cast<std::int64_t>(r.rooms) * (to - from);
      inHouse.add(from - r.arrival, to - 1 - r.arrival, r.rooms);
      const int lead = r.arrival - r.bookedOn;
      if (lead > c)
        for (int k = from - r.arrival; k < to - r.arrival && k < span; ++k) {
          bookedEarlier[static_cast<std::size_t>(k)] += r.rooms;
          bookedEarlier[static_cast<std::size_t>(std::min(k + lead - c, span))] -= r.rooms;
        }
    }
    rooms.resize(diff.size() - 1);
    std::int64_t running = 0;
    for (std::size_t i = 0; i < rooms.size(); ++i)
      rooms[i] = running += diff[i];
    running = 0;
    for (auto &v : bookedEarlier)
      v = running += v;
    inHouse.finish();
  }
  auto roomsOn = [&](Date s) { return rooms[static_cast<std::size_t>(s - *firstNight)]; };

  // (1) The start of the data. A rule from the data's own length-of-stay and lead-time
  // distributions rather than a comparison with later weeks: occupancy moves with the season
  // (July to August in the open city dataset), so "low compared with a few weeks later" would
  // flag honest nights and miss real cuts, while the share of stays a cut removes follows from
  // the stays that are there.
  if (firstNight && counted > 0) {
    const double threshold = options.rampUpShare;
    int k = 0;
    while (firstArrival + k <= *lastNight && inHouse.shareAtLeast(k + 1) >= threshold)
      ++k;
    if (k > 0) {
      const Date last = firstArrival + (k - 1);
      add(Severity::Warning,
          fmt::format("{} are incomplete: the data has no arrivals before {}, so guests who "
                      "arrived earlier and were still in house are missing (an estimated {} of "
                      "the rooms on {}, {} on {})",
                      nightRange(firstArrival, last), firstArrival.toIso(),
                      formatPercent(inHouse.shareAtLeast(1)), firstArrival.toIso(),
                      formatPercent(inHouse.shareAtLeast(k)), last.toIso()));
    }
    // Reservations booked before B0 that the arrivals from A0 on would be expected to have,
    // from the arrival lead times of every reservation (cancelled ones were booked too).
    TailShare arrivalLeads;
    std::vector<std::int64_t> arrivals(static_cast<std::size_t>(lastArrival - firstArrival) + 1);
    for (const auto &r : reservations) {
      arrivalLeads.add(r.arrival - r.bookedOn, r.arrival - r.bookedOn, 1);
      ++arrivals[static_cast<std::size_t>(r.arrival - firstArrival)];
    }
    arrivalLeads.finish();
    const int c = firstArrival - firstBooked;
    double expected = 0.0;
    for (std::size_t i = 0; i < arrivals.size(); ++i)
      expected +=
          static_cast<double>(arrivals[i]) * arrivalLeads.shareAtLeast(c + static_cast<int>(i) + 1);

    auto share = [&](std::size_t i) {
      return static_cast<double>(bookedEarlier[i]) / static_cast<double>(counted);
    };
    std::optional<std::size_t> first, last, peak;
    for (std::size_t i = 0; i + 1 < bookedEarlier.size(); ++i)
      if (share(i) >= threshold) {
        first = first ? first : i;
        last = i;
        if (!peak || share(i) > share(*peak))
          peak = i;
      }
    if (first && expected >= options.minExpectedMissing) {
      auto night = [&](std::size_t i) { return firstArrival + static_cast<int>(i); };
      add(Severity::Warning,
          fmt::format("{} may be incomplete: the data has no bookings made before {}, yet the "
                      "lead times of the others suggest about {} for arrivals from {} on (an "
                      "estimated {} of the rooms on {} missing, {} on {})",
                      nightRange(night(*first), night(*last)), firstBooked.toIso(),
                      formatCount(std::llround(expected)), firstArrival.toIso(),
                      formatPercent(share(*peak)), night(*peak).toIso(),
                      formatPercent(share(*last)), night(*last).toIso()));
    }
  }

  // (2) The end of the data: nights after the last arrival date hold only stays that arrived
  // before it. Normal for the future of a live extract, so a note, not a warning.
  if (lastNight && *lastNight > lastArrival)
    add(Severity::Info,
        fmt::format("{} come after the last arrival date {}: they hold only stays that arrived "
                    "earlier",
                    nightRange(lastArrival + 1, *lastNight), lastArrival.toIso()));

  // (3) Days with no booking made. Checked from the first arrival date on: before it only the
  // long-lead bookings of the first nights exist, which are sparse in any honest extract.
  {
    std::set<Date> bookedDays;
    for (const auto &r : reservations)
      if (r.bookedOn >= firstArrival)
        bookedDays.insert(r.bookedOn);
    CappedList list(out, options.maxListed, file);
    Date previous = firstArrival - 1;
    for (Date booked : bookedDays) {
      const int days = booked - previous - 1;
      if (days >= options.gapDays)
        list.add(Severity::Warning,
                 fmt::format("no bookings made from {} to {} ({} days)", (previous + 1).toIso(),
                             (booked - 1).toIso(), days),
                 booked - 1);
      previous = booked;
    }
    list.finish(Severity::Warning, "gaps with no bookings");
  }

  // (4) Nights with no rooms at all between nights that have some, up to the data's reading
  // date: a future night with nothing on the books yet is ordinary.
  const Date readingDate = *newestActivity(reservations);
  if (firstNight && readingDate >= *firstNight) {
    CappedList list(out, options.maxListed, file);
    // A run counts once a night with rooms came before it, and is reported when the next
    // night with rooms ends it; empty nights at either end are not gaps.
    Date emptyFrom = *firstNight;
    bool seenRooms = false, inRun = false;
    for (Date s = *firstNight; s <= std::min(*lastNight, readingDate); ++s) {
      if (roomsOn(s) == 0) {
        if (seenRooms && !inRun)
          emptyFrom = s;
        inRun = seenRooms;
        continue;
      }
      seenRooms = true;
      if (inRun) {
        const int n = s - emptyFrom;
        list.add(Severity::Warning,
                 fmt::format("no rooms on the books for {} ({} {}), between nights that have "
                             "some",
                             nightRange(emptyFrom, s - 1), n, n == 1 ? "night" : "nights"),
                 s - 1);
      }
      inRun = false;
    }
    list.finish(Severity::Warning, "runs of empty nights");
  }

  // (5) Nights over capacity.
  if (property.capacity <= 0 && property.capacityChanges.empty()) {
    add(Severity::Info, "capacity is not set, so nights over capacity were not checked");
  } else if (firstNight) {
    CappedList list(out, options.maxListed, file);
    for (Date s = *firstNight; s <= *lastNight; ++s) {
      const int cap = property.capacityOn(s);
      if (roomsOn(s) > cap)
        list.add(Severity::Warning,
                 fmt::format("night {}: {} rooms on the books, capacity {} ({} over)", s.toIso(),
                             formatCount(roomsOn(s)), formatCount(cap),
                             formatCount(roomsOn(s) - cap)),
                 s);
    }
    list.finish(Severity::Warning, "nights over capacity");
  }

  // (6) Segments on reservations that were never set up. The importer creates a bare code for
  // every new segment so the store's keys hold; a code with no name and no yield rank is one
  // nobody has configured, and rank-based decisions cannot place it.
  {
    std::set<std::string> configured;
    for (const auto &g : segments)
      if (!g.name.empty() || g.yieldRank != 0)
        configured.insert(g.code);
    std::map<std::string, std::int64_t> unknown;
    for (const auto &r : reservations)
      if (!configured.contains(r.segment))
        ++unknown[r.segment];
    for (const auto &[code, count] : unknown)
      add(Severity::Warning,
          code.empty()
              ? fmt::format("{} {} no segment", formatCount(count),
                            count == 1 ? "reservation has" : "reservations have")
              : fmt::format("segment \"{}\" is not set up (no name, no yield rank): {} "
                            "{}",
                            code, formatCount(count), count == 1 ? "reservation" : "reservations"));
  }
  return out;
}

Findings checkDataHealth(const Store &store, const HealthOptions &options) {
  return checkDataHealth(store.reservations(), store.property(), store.segments(), options,
                         store.path().string());
}

} // namespace cb
