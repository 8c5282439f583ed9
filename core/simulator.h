// A seeded simulator of a fictional hotel: the sample property and test data for every later
// method (it knows the true unconstrained demand, which real data never shows).
#pragma once

#include "core/reservation.h"

#include <cstdint>
#include <filesystem>
#include <string>
#include <vector>

namespace cb {

struct SimulatorConfig {
  std::uint64_t seed = 20261201;
  int capacity = 150;
  Date historyStart = Date::fromYmd(2023, 11, 1); ///< first stay night simulated
  Date readingDate = Date::fromYmd(2026, 10, 31); ///< data is cut here ("as of")
  int futureDays = 365;                           ///< nights after the reading date on the books
};

/// True demand of one night and segment, before capacity turned requests away.
struct TrueDemand {
  Date night;
  std::string segment;
  int unconstrained = 0; ///< room-nights requested for this night
  int sold = 0;          ///< room-nights accepted for this night
};

struct SampleProperty {
  Property property;
  std::vector<RoomType> roomTypes;
  std::vector<Segment> segments;
  std::vector<Channel> channels;
  std::vector<EventNote> events;
  std::vector<Reservation> reservations; ///< as of the reading date (no future activity)
  std::vector<GroupBlock> blocks;
  std::vector<Denial> denials;
  std::vector<TrueDemand> trueDemand; ///< nights up to the reading date, by segment
  Date readingDate;
};

/// Deterministic for a given config on any platform (own RNG transforms, no std:: distributions).
SampleProperty simulateProperty(const SimulatorConfig &config = {});

/// Writes the sample files (reservations.csv in the native format, blocks.csv, denials.csv,
/// true_demand.csv, property.json) into dir, creating it. Byte-identical for the same config.
void writeSampleFiles(const SampleProperty &sample, const std::filesystem::path &dir);

} // namespace cb
