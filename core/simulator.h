// A seeded simulator of a fictional hotel: the sample property and test data for every later
// method (it knows the true unconstrained demand, which real data never shows).
#pragma once

#include "core/reservation.h"

#include <cstdint>
#include <filesystem>
#include <string>
#include <vector>

namespace cb {

/// Which segments the simulated property sells to.
enum class SegmentSet {
  Sample,   ///< the sample property's five: FLEX, CORP, ADV, GRP, WHL
  Extended, ///< those five plus PKG (leisure packages), GOV (public sector), CREW (crew contracts)
};

struct SimulatorConfig {
  std::uint64_t seed = 20261201;
  int capacity = 150;
  Date historyStart = Date::fromYmd(2023, 11, 1); ///< first stay night simulated
  Date readingDate = Date::fromYmd(2026, 10, 31); ///< data is cut here ("as of")
  int futureDays = 365;                           ///< nights after the reading date on the books
  /// Multiplies the request rate of every segment, groups included (1 = the sample's model).
  double demandScale = 1.0;
  /// Share of individual (non-group) requests turned into one night for one room, drawn per
  /// request. Short stays give more rows per occupied room-night, so a synthetic property can
  /// reach a large row count at a believable occupancy. 0 = the sample's length-of-stay model.
  double shortStayShare = 0.0;
  /// The sample's five segments, or eight. The three extra segments draw their requests after
  /// the sample's, so choosing Sample leaves every draw (and file) of the sample unchanged.
  SegmentSet segments = SegmentSet::Sample;
};

/// A synthetic property of about one million reservation rows for benchmarks (issue 3): 600
/// rooms, eight segments (SegmentSet::Extended), five years of history to the reading date plus
/// a year on the books, demand 2.17 times the sample's per room and every individual stay one
/// night for one room (groups unchanged). Not a committed sample; about 4 s and 400 MB to
/// simulate.
SimulatorConfig millionBookingConfig();

/// True demand of one night and segment, before capacity turned requests away.
struct TrueDemand {
  Date night;
  std::string segment;
  int unconstrained = 0; ///< room-nights requested for this night
  int sold = 0;          ///< room-nights accepted for this night
};

/// Rooms of one room type in force from `from` on (the type-level detail behind
/// Property::capacityChanges).
struct RoomTypeChange {
  std::string roomType;
  Date from;
  int rooms = 0;
};

/// What the simulator knows of a group block beyond GroupBlock (written to blocks.csv too).
struct BlockDetail {
  Date contractedOn;    ///< the day the block's rooms were first held
  std::string roomType; ///< every room of the block is of this type
};

struct SampleProperty {
  Property property;
  std::string town;
  std::vector<RoomType> roomTypes;
  std::vector<RoomTypeChange> roomTypeChanges;
  std::vector<Segment> segments;
  std::vector<Channel> channels;
  std::vector<EventNote> events;
  std::vector<Reservation> reservations; ///< as of the reading date (no future activity)
  std::vector<GroupBlock> blocks;
  std::vector<BlockDetail> blockDetails; ///< same order as `blocks`
  std::vector<Denial> denials;
  /// Nights historyStart … readingDate, every segment, sorted by night then segment rank.
  std::vector<TrueDemand> trueDemand;
  Date readingDate;

  /// Rooms of `roomType` available on night s (the latest change on or before s, else the
  /// type's base count).
  int roomsOfTypeOn(const std::string &roomType, Date s) const;
};

/// Deterministic for a given config on any platform (own RNG transforms, no std:: distributions).
/// Example: `auto sample = cb::simulateProperty(); sample.reservations.size();`
SampleProperty simulateProperty(const SimulatorConfig &config = {});

/// Writes the sample files (reservations.csv in the native format, blocks.csv, denials.csv,
/// true_demand.csv, events.csv, property.json) into dir, creating it. Byte-identical for the
/// same config: fixed number formats, LF line ends, sorted rows. Throws std::runtime_error when
/// a file cannot be written.
void writeSampleFiles(const SampleProperty &sample, const std::filesystem::path &dir);

} // namespace cb
