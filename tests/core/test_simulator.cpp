#include "core/simulator.h"

#include "core/bookingcurve.h"
#include "testsupport.h"

#include <fmt/format.h>
#include <gtest/gtest.h>

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <limits>
#include <map>
#include <set>
#include <string>
#include <tuple>
#include <vector>

namespace {

/// The default sample, simulated once for the whole executable.
const cb::SampleProperty &sample() {
  static const cb::SampleProperty s = [] {
    const auto t0 = std::chrono::steady_clock::now();
    cb::SampleProperty out = cb::simulateProperty();
    const double secs =
        std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    std::printf("simulateProperty(): %.3f s, %zu reservations\n", secs, out.reservations.size());
    return out;
  }();
  return s;
}

const cb::SimulatorConfig kDefault{};

/// Reservations indexed by the nights they cover (from historyStart on).
class NightIndex {
public:
  explicit NightIndex(const cb::SampleProperty &s) : first_(kDefault.historyStart) {
    for (std::size_t i = 0; i < s.reservations.size(); ++i) {
      const auto &r = s.reservations[i];
      for (cb::Date d = r.arrival; d < r.departure; ++d) {
        const auto k = static_cast<std::size_t>(d - first_);
        if (k >= byNight_.size())
          byNight_.resize(k + 1);
        byNight_[k].push_back(i);
      }
    }
  }
  const std::vector<std::size_t> &on(cb::Date night) const {
    static const std::vector<std::size_t> none;
    const auto k = static_cast<std::size_t>(night - first_);
    return k < byNight_.size() ? byNight_[k] : none;
  }

private:
  cb::Date first_;
  std::vector<std::vector<std::size_t>> byNight_;
};

const NightIndex &nightIndex() {
  static const NightIndex idx(sample());
  return idx;
}

/// Rooms on the books for night s as of date t, optionally of one room type / segment.
int otb(cb::Date s, cb::Date t, const std::string &roomType = {}, const std::string &seg = {}) {
  int rooms = 0;
  for (std::size_t i : nightIndex().on(s)) {
    const auto &r = sample().reservations[i];
    if (r.onBooks(s, t) && (roomType.empty() || r.roomType == roomType) &&
        (seg.empty() || r.segment == seg))
      rooms += r.rooms;
  }
  return rooms;
}

const std::vector<std::string> kSampleFiles{"reservations.csv", "blocks.csv", "denials.csv",
                                            "true_demand.csv",  "events.csv", "property.json"};

} // namespace

TEST(Simulator, SameSeedGivesIdenticalOutput) {
  const cb::SampleProperty again = cb::simulateProperty();
  EXPECT_EQ(again.reservations, sample().reservations);
  EXPECT_EQ(again.blocks, sample().blocks);
  EXPECT_EQ(again.denials, sample().denials);
  cbtest::TempDir a, b;
  cb::writeSampleFiles(sample(), a.path());
  cb::writeSampleFiles(again, b.path());
  for (const auto &f : kSampleFiles)
    EXPECT_EQ(cbtest::readFile(a / f), cbtest::readFile(b / f)) << f;
}

TEST(Simulator, DifferentSeedGivesDifferentOutput) {
  cb::SimulatorConfig other;
  other.seed = kDefault.seed + 1;
  const cb::SampleProperty s = cb::simulateProperty(other);
  EXPECT_NE(s.reservations, sample().reservations);
  EXPECT_FALSE(s.reservations.empty());
}

TEST(Simulator, EveryReservationIsValidAndCutAtTheReadingDate) {
  const cb::Date t = sample().readingDate;
  ASSERT_EQ(t, kDefault.readingDate);
  ASSERT_GT(sample().reservations.size(), 10000u);
  std::set<std::string> segments, channels, types;
  for (const auto &s : sample().segments)
    segments.insert(s.code);
  for (const auto &c : sample().channels)
    channels.insert(c.code);
  for (const auto &rt : sample().roomTypes)
    types.insert(rt.code);
  cb::Date previousBooking;
  for (std::size_t i = 0; i < sample().reservations.size(); ++i) {
    const auto &r = sample().reservations[i];
    SCOPED_TRACE(r.id);
    ASSERT_EQ(cb::validateReservation(r), "");
    // Ids number the reservations in order of booking.
    ASSERT_EQ(r.id, fmt::format("HQ{:06}", i + 1));
    ASSERT_GE(r.bookedOn, previousBooking);
    previousBooking = r.bookedOn;
    ASSERT_LE(r.bookedOn, t);
    ASSERT_GE(r.nights(), 1);
    ASSERT_TRUE(segments.count(r.segment) && channels.count(r.channel) && types.count(r.roomType));
    switch (r.status) {
    case cb::ReservationStatus::Cancelled:
      ASSERT_LE(*r.cancelledOn, t); // later cancellations are not known yet
      ASSERT_LE(*r.cancelledOn, r.arrival);
      break;
    case cb::ReservationStatus::CheckedOut: ASSERT_LE(r.departure, t); break;
    case cb::ReservationStatus::NoShow: ASSERT_LE(r.arrival, t); break;
    case cb::ReservationStatus::Booked: ASSERT_GT(r.departure, t); break; // future or in house
    }
  }
  EXPECT_GE(sample().reservations.front().arrival, kDefault.historyStart);
}

TEST(Simulator, FinalsNeverExceedCapacityOfHotelOrRoomType) {
  const cb::Date t = sample().readingDate;
  const cb::Date last = t + kDefault.futureDays;
  int soldOut = 0;
  for (cb::Date s = kDefault.historyStart; s <= last; ++s) {
    const cb::Date asOf = std::min(s, t); // finals for the past, OTB now for the future
    const int cap = sample().property.capacityOn(s);
    const int total = otb(s, asOf);
    ASSERT_LE(total, cap) << s.toIso();
    int typeSum = 0;
    for (const auto &rt : sample().roomTypes) {
      const int typeCap = sample().roomsOfTypeOn(rt.code, s);
      ASSERT_LE(otb(s, asOf, rt.code), typeCap) << s.toIso() << " " << rt.code;
      typeSum += typeCap;
    }
    ASSERT_EQ(typeSum, cap) << s.toIso(); // room types add up to the hotel
    soldOut += total == cap;
  }
  EXPECT_GT(soldOut, 0); // the history is censored: some nights sold every room
}

TEST(Simulator, DenialsOnlyWhenNoRoomTypeHadSpaceOnSomeNight) {
  // Replays the capacity check from the files alone: on the request date, every room type the
  // request could use must have been full on at least one of its nights. Rooms held for a
  // group block count from its contract date until its cutoff, in the block's room type;
  // reservations picked up inside a holding block are inside that hold, not on top of it.
  const auto &s = sample();
  ASSERT_EQ(s.blocks.size(), s.blockDetails.size());
  std::map<std::string, std::size_t> blockIndex;
  for (std::size_t i = 0; i < s.blocks.size(); ++i)
    blockIndex[s.blocks[i].id] = i;
  auto holding = [&](std::size_t b, cb::Date d) {
    return s.blockDetails[b].contractedOn <= d && d < s.blocks[b].cutoff;
  };
  auto heldOfType = [&](const std::string &type, cb::Date night, cb::Date d) {
    int rooms = 0;
    for (std::size_t i : nightIndex().on(night)) {
      const auto &r = s.reservations[i];
      if (r.roomType != type || !r.onBooks(night, d))
        continue;
      if (!r.blockId.empty() && holding(blockIndex.at(r.blockId), d))
        continue;
      rooms += r.rooms;
    }
    for (std::size_t b = 0; b < s.blocks.size(); ++b)
      if (s.blockDetails[b].roomType == type && holding(b, d) && s.blocks[b].arrival <= night &&
          night < s.blocks[b].departure)
        rooms += s.blocks[b].roomsPerNight;
    return rooms;
  };
  ASSERT_FALSE(s.denials.empty());
  int hotelFull = 0;
  for (const auto &den : s.denials) {
    SCOPED_TRACE(den.requestedOn.toIso() + " " + den.arrival.toIso() + " " + den.segment);
    EXPECT_EQ(den.kind, cb::DenialKind::Denial);
    ASSERT_LE(den.requestedOn, s.readingDate);
    ASSERT_LE(den.requestedOn, den.arrival);
    for (const auto &type : {"STD", "SUP", "FAM", "STE"}) {
      bool full = false;
      for (cb::Date n = den.arrival; n < den.departure && !full; ++n)
        full = heldOfType(type, n, den.requestedOn) + den.rooms > s.roomsOfTypeOn(type, n);
      EXPECT_TRUE(full) << type << " had room on every night";
    }
    // In hotel terms: the tightest night of the stay was at or near capacity. Mostly the
    // whole hotel had fewer free rooms than requested; the rest are multi-night requests that
    // no single room type could take although a few rooms of mixed types were free. "Near" is
    // within 10 % of capacity, a threshold of ours.
    int tightest = std::numeric_limits<int>::max(); // free rooms left after the request
    for (cb::Date n = den.arrival; n < den.departure; ++n) {
      int all = 0;
      for (const auto &rt : s.roomTypes)
        all += heldOfType(rt.code, n, den.requestedOn);
      tightest = std::min(tightest, s.property.capacityOn(n) - all - den.rooms);
    }
    EXPECT_LE(tightest, s.property.capacity / 10);
    hotelFull += tightest < 0;
  }
  EXPECT_GE(hotelFull, static_cast<int>(0.9 * static_cast<double>(s.denials.size())));
}

TEST(Simulator, TrueDemandCoversSoldAndSoldIsTheFinals) {
  const auto &s = sample();
  const int nights = s.readingDate - kDefault.historyStart + 1;
  ASSERT_EQ(s.trueDemand.size(), static_cast<std::size_t>(nights) * s.segments.size());
  long spill = 0;
  int censoredRows = 0;
  for (const auto &d : s.trueDemand) {
    SCOPED_TRACE(d.night.toIso() + " " + d.segment);
    ASSERT_GE(d.unconstrained, d.sold);
    ASSERT_EQ(d.sold, otb(d.night, d.night, {}, d.segment)); // Final(s) per brief section 4
    spill += d.unconstrained - d.sold;
    censoredRows += d.unconstrained > d.sold;
  }
  EXPECT_GT(spill, 0);
  EXPECT_GT(censoredRows, 0);
  // The same finals through the definition-level booking curve, on a few nights.
  for (const auto &d : s.trueDemand) {
    if (d.night.day() != 15 || d.segment != "FLEX")
      continue;
    const cb::NightCurve c = cb::bookingCurve(s.reservations, d.night, 0, d.segment);
    EXPECT_EQ(c.rooms[0], d.sold) << d.night.toIso();
  }
}

TEST(Simulator, GroupBlocksHaveCutoffWashAndPickups) {
  const auto &s = sample();
  ASSERT_GT(s.blocks.size(), 20u);
  std::map<std::string, std::map<cb::Date, int>> picked; // block → night → rooms picked up
  for (const auto &r : s.reservations) {
    if (r.blockId.empty())
      continue;
    ASSERT_EQ(r.segment, "GRP");
    const auto it = std::find_if(s.blocks.begin(), s.blocks.end(),
                                 [&](const cb::GroupBlock &b) { return b.id == r.blockId; });
    ASSERT_NE(it, s.blocks.end()) << r.id;
    ASSERT_LT(r.bookedOn, it->cutoff) << r.id; // rooming lists close at the cutoff
    ASSERT_EQ(r.arrival, it->arrival);
    ASSERT_EQ(r.departure, it->departure);
    ASSERT_EQ(r.roomType, s.blockDetails[static_cast<std::size_t>(it - s.blocks.begin())].roomType);
    if (r.status != cb::ReservationStatus::Cancelled)
      for (cb::Date n = r.arrival; n < r.departure; ++n)
        picked[r.blockId][n] += r.rooms;
  }
  int washed = 0, tentative = 0;
  for (std::size_t i = 0; i < s.blocks.size(); ++i) {
    const auto &b = s.blocks[i];
    SCOPED_TRACE(b.id);
    EXPECT_EQ(b.segment, "GRP");
    const int cutoffLead = b.arrival - b.cutoff;
    EXPECT_GE(cutoffLead, 21);
    EXPECT_LE(cutoffLead, 30);
    EXPECT_LT(s.blockDetails[i].contractedOn, b.cutoff);
    int most = 0;
    for (const auto &[night, rooms] : picked[b.id])
      most = std::max(most, rooms);
    EXPECT_LE(most, b.roomsPerNight);
    if (b.cutoff <= s.readingDate)
      washed += most < b.roomsPerNight;
    if (b.status == cb::BlockStatus::Tentative) {
      ++tentative;
      EXPECT_GT(b.arrival, s.readingDate); // only future blocks can still be tentative
    }
  }
  EXPECT_GT(washed, 0);
  EXPECT_GT(tentative, 0);
}

TEST(Simulator, ScenarioFiguresStayInTheirDesignedRange) {
  // Design targets of the sample (sample_property/README.md), not outside facts: about three
  // quarters full on average and a minority of peak-season nights sold out.
  const auto &s = sample();
  double occupancy = 0.0;
  int nights = 0, peakNights = 0, peakSoldOut = 0;
  for (cb::Date n = kDefault.historyStart; n <= s.readingDate; ++n) {
    const int cap = s.property.capacityOn(n);
    const int final = otb(n, n);
    occupancy += static_cast<double>(final) / cap;
    ++nights;
    const bool peak = (n.month() == 6 && n.day() >= 15) || n.month() == 7 || n.month() == 8;
    if (peak) {
      ++peakNights;
      peakSoldOut += final >= cap * (1.0 - s.property.selloutMargin);
    }
  }
  occupancy /= nights;
  const double peakShare = static_cast<double>(peakSoldOut) / peakNights;
  std::printf("average occupancy %.1f %%, peak nights sold out %d of %d (%.1f %%), denials %zu\n",
              100.0 * occupancy, peakSoldOut, peakNights, 100.0 * peakShare, s.denials.size());
  EXPECT_GT(occupancy, 0.70);
  EXPECT_LT(occupancy, 0.80);
  EXPECT_GE(peakShare, 0.05);
  EXPECT_LE(peakShare, 0.15);
}

TEST(Simulator, WrittenFilesMatchTheCommittedSample) {
  // Regenerate with `curvebench sample sample_property` after a deliberate model change.
  cbtest::TempDir dir;
  cb::writeSampleFiles(sample(), dir.path());
  const auto committed = cbtest::sourceDir() / "sample_property";
  for (const auto &f : kSampleFiles) {
    ASSERT_TRUE(std::filesystem::exists(committed / f)) << f;
    const std::string want = cbtest::readFile(committed / f);
    const std::string got = cbtest::readFile(dir / f);
    EXPECT_EQ(got.size(), want.size()) << f;
    EXPECT_TRUE(got == want) << f << " differs from the committed sample";
  }
}

TEST(Simulator, DefaultConfigSellsTheSamplesFiveSegments) {
  std::vector<std::string> codes;
  for (const auto &g : sample().segments)
    codes.push_back(g.code);
  EXPECT_EQ(codes, (std::vector<std::string>{"FLEX", "CORP", "ADV", "GRP", "WHL"}));
  std::set<std::string> booked;
  for (const auto &r : sample().reservations)
    booked.insert(r.segment);
  EXPECT_EQ(booked.size(), 5u);
}

TEST(Simulator, MillionBookingConfigSellsEightSegmentsEachWithItsShare) {
  const cb::SimulatorConfig full = cb::millionBookingConfig();
  EXPECT_EQ(full.segments, cb::SegmentSet::Extended);
  EXPECT_EQ(full.capacity, 600);
  // The same property on one year of history and a month on the books: the full five years
  // (about 1,000,000 rows) take seconds and ~400 MB, too much for a unit test.
  cb::SimulatorConfig c = full;
  c.historyStart = cb::Date::fromYmd(2025, 11, 1);
  c.futureDays = 30;
  const cb::SampleProperty s = cb::simulateProperty(c);

  // The segments in yield-rank order, highest-paying first.
  std::vector<std::string> codes;
  for (std::size_t k = 0; k < s.segments.size(); ++k) {
    codes.push_back(s.segments[k].code);
    EXPECT_EQ(s.segments[k].yieldRank, static_cast<int>(k) + 1);
  }
  EXPECT_EQ(codes,
            (std::vector<std::string>{"FLEX", "PKG", "CORP", "ADV", "GRP", "GOV", "WHL", "CREW"}));
  EXPECT_EQ(s.trueDemand.size(),
            static_cast<std::size_t>(s.readingDate - c.historyStart + 1) * codes.size());

  // Every segment books a non-trivial share of the rows (the smallest, groups, about 2 %).
  std::map<std::string, std::size_t> rows;
  for (const auto &r : s.reservations)
    ++rows[r.segment];
  ASSERT_EQ(rows.size(), 8u);
  for (const auto &[code, n] : rows) {
    const double share = static_cast<double>(n) / static_cast<double>(s.reservations.size());
    std::printf("%-4s %6zu rows (%.1f %%)\n", code.c_str(), n, 100.0 * share);
    EXPECT_GE(share, 0.01) << code;
  }

  // Distinct behaviour by design: packages are sold at least 30 days ahead, crews mostly a day
  // or two ahead, and the negotiated segments pay one rate per room type and year.
  std::vector<int> crewLeads;
  std::map<std::tuple<std::string, std::string, int>, std::set<double>> flatRates;
  for (const auto &r : s.reservations) {
    if (r.segment == "PKG") {
      EXPECT_GE(r.arrival - r.bookedOn, 30) << r.id;
    }
    if (r.segment == "CREW")
      crewLeads.push_back(r.arrival - r.bookedOn);
    if (r.segment == "CORP" || r.segment == "GOV" || r.segment == "CREW")
      flatRates[{r.segment, r.roomType, r.arrival.year()}].insert(r.rate);
  }
  ASSERT_FALSE(crewLeads.empty());
  std::nth_element(crewLeads.begin(), crewLeads.begin() + crewLeads.size() / 2, crewLeads.end());
  EXPECT_LE(crewLeads[crewLeads.size() / 2], 2);
  for (const auto &[key, rates] : flatRates)
    EXPECT_EQ(rates.size(), 1u) << std::get<0>(key) << " " << std::get<1>(key) << " "
                                << std::get<2>(key);
}
