#include "core/nightindex.h"

#include "core/bookingcurve.h"
#include "core/simulator.h"

#include <gtest/gtest.h>

#include <cstdint>
#include <vector>

namespace {

using cb::Date;

cb::Reservation stay(const char *id, Date arrival, int nights) {
  cb::Reservation r;
  r.id = id;
  r.bookedOn = arrival - 10;
  r.arrival = arrival;
  r.departure = arrival + nights;
  return r;
}

TEST(NightIndex, ListsExactlyTheReservationsCoveringEachNight) {
  const Date d = Date::fromYmd(2026, 3, 1);
  const std::vector<cb::Reservation> rs = {stay("A", d, 3), stay("B", d + 1, 1), stay("C", d, 0),
                                           stay("D", d + 5, 2)};
  cb::NightIndex index(rs);
  auto ids = [&](Date night) {
    std::vector<std::uint32_t> out;
    for (auto i : index.covering(night))
      out.push_back(i);
    return out;
  };
  EXPECT_TRUE(ids(d - 1).empty());
  EXPECT_EQ(ids(d), (std::vector<std::uint32_t>{0})); // the day use C covers no night
  EXPECT_EQ(ids(d + 1), (std::vector<std::uint32_t>{0, 1}));
  EXPECT_EQ(ids(d + 2), (std::vector<std::uint32_t>{0}));
  EXPECT_TRUE(ids(d + 3).empty()); // departure night is not covered
  EXPECT_EQ(ids(d + 6), (std::vector<std::uint32_t>{3}));
  EXPECT_TRUE(ids(d + 7).empty());
  EXPECT_TRUE(cb::NightIndex().covering(d).empty());
  EXPECT_TRUE(cb::NightIndex(std::vector<cb::Reservation>{stay("E", d, 0)}).covering(d).empty());
}

// On the sample property, the index agrees with a scan of every reservation, and a booking curve
// drawn from the covering reservations alone is the curve drawn from all of them.
TEST(NightIndex, AgreesWithAFullScanOnTheSampleProperty) {
  const auto sample = cb::simulateProperty();
  const auto &rs = sample.reservations;
  cb::NightIndex index(rs);
  for (Date night = Date::fromYmd(2023, 10, 25); night <= Date::fromYmd(2027, 11, 5); night += 37) {
    std::vector<std::uint32_t> scan;
    for (std::size_t i = 0; i < rs.size(); ++i)
      if (rs[i].covers(night))
        scan.push_back(static_cast<std::uint32_t>(i));
    const auto got = index.covering(night);
    EXPECT_EQ(std::vector<std::uint32_t>(got.begin(), got.end()), scan) << night.toIso();
    const auto subset = index.reservationsCovering(rs, night);
    for (const char *segment : {"", "CORP"}) {
      const auto all = cb::bookingCurve(rs, night, 120, segment);
      const auto few = cb::bookingCurve(subset, night, 120, segment);
      EXPECT_EQ(all.rooms, few.rooms) << night.toIso();
      EXPECT_EQ(all.revenue, few.revenue) << night.toIso();
    }
  }
}

} // namespace
