#include "core/bookingwindow.h"

#include "core/quantile.h"

#include <fmt/format.h>

#include <algorithm>
#include <map>
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

struct Accumulator {
  std::map<int, std::int64_t> byLead; ///< lead → room-nights
  std::array<double, kLeadBuckets.size()> revenue{};
};

} // namespace

std::size_t leadBucketOf(int days) {
  for (std::size_t i = 0; i + 1 < kLeadBuckets.size(); ++i)
    if (days <= kLeadBuckets[i].lastDay)
      return i;
  return kLeadBuckets.size() - 1;
}

std::vector<BookingWindowStats> bookingWindow(const std::vector<Reservation> &reservations,
                                              const BookingWindowOptions &options) {
  if (options.lastArrival < options.firstArrival)
    throw std::invalid_argument(fmt::format("the arrival range is empty: {} is after {}",
                                            options.firstArrival.toIso(),
                                            options.lastArrival.toIso()));
  for (double p : options.probabilities)
    if (!(p >= 0.0 && p <= 1.0))
      throw std::invalid_argument(fmt::format("quantile probability {} is not in [0, 1]", p));
  if (auto newest = newestActivity(reservations); newest && options.asOf > *newest)
    throw AsOfError(fmt::format("reading date {} is after the newest booking or cancellation in "
                                "the data ({})",
                                options.asOf.toIso(), newest->toIso()));

  std::vector<std::string> codes;
  if (options.by != SeriesBy::Total)
    for (const auto &r : reservations)
      if (r.bookedOn <= options.asOf)
        codes.push_back(codeOf(r, options.by));
  std::sort(codes.begin(), codes.end());
  codes.erase(std::unique(codes.begin(), codes.end()), codes.end());

  std::vector<Accumulator> acc(codes.size() + 1);
  for (const auto &r : reservations) {
    if (r.bookedOn > options.asOf || (r.cancelledOn && *r.cancelledOn <= options.asOf) ||
        r.arrival < options.firstArrival || r.arrival > options.lastArrival || r.isDayUse())
      continue;
    const int lead = std::max(0, r.arrival - r.bookedOn);
    const std::int64_t weight = std::int64_t{r.rooms} * r.nights();
    const std::size_t bucket = leadBucketOf(lead);
    auto addTo = [&](Accumulator &a) {
      a.byLead[lead] += weight;
      a.revenue[bucket] += r.rate * static_cast<double>(weight);
    };
    addTo(acc[0]);
    if (options.by != SeriesBy::Total)
      addTo(acc[1 + static_cast<std::size_t>(
                        std::lower_bound(codes.begin(), codes.end(), codeOf(r, options.by)) -
                        codes.begin())]);
  }

  std::vector<BookingWindowStats> out(acc.size());
  for (std::size_t i = 0; i < acc.size(); ++i) {
    BookingWindowStats &st = out[i];
    st.series = i == 0 ? "ALL" : (codes[i - 1].empty() ? "(none)" : codes[i - 1]);
    std::vector<std::pair<double, std::int64_t>> counted;
    for (const auto &[lead, weight] : acc[i].byLead) {
      st.roomNights += weight;
      st.histogram[leadBucketOf(lead)] += weight;
      counted.emplace_back(lead, weight);
    }
    for (std::size_t b = 0; b < kLeadBuckets.size(); ++b)
      if (st.histogram[b] > 0)
        st.averageRate[b] = acc[i].revenue[b] / static_cast<double>(st.histogram[b]);
    if (st.roomNights > 0)
      for (double p : options.probabilities)
        st.leadQuantiles.push_back(quantileType7Counts(counted, p));
  }
  return out;
}

} // namespace cb
