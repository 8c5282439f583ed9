// The hotel's total curve cube over every night stayed, kept in a file beside the store
// ("<store>.cube"), so a command that needs the total curves (`curves`, `finals`, `backtest`)
// reads 10 MB instead of loading a million reservations and building the cube again: the daily
// refresh after an import. Each import writes it from the rows it has in hand for the snapshot
// (core/reservationsnapshot.h), beside SQLite's commit; a command that finds none (or one for
// other data) builds it from the reservations and writes it, as for the snapshot.
//
// Like the snapshot, it is a cache keyed by the store's reservation stamp: a file with another
// stamp, another format, a bad checksum or a short file is ignored. The store stays the only
// record. A change to what the cube counts must change kKeptCubeFormat in keptcube.cpp, so the
// files of the old code are ignored.
#pragma once

#include "core/curvecube.h"
#include "core/reservation.h"

#include <cstdint>
#include <filesystem>
#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <vector>

namespace cb {

/// "<store>.cube": where a store's kept cube lives.
std::filesystem::path keptCubePathFor(const std::filesystem::path &store);

/// The total cube over every night stayed, as of the newest booking or cancellation, with the
/// 365 leads the command line shows, and what the commands' defaults need to know of the
/// reservations without reading them.
struct KeptCube {
  static constexpr int kMaxDba = 365;
  ReservationBounds bounds; ///< all four set
  /// Nights from bounds.firstStay to bounds.lastStay, but no later than bounds.newest + kMaxDba
  /// (later nights have no known cell); leads 0 … kMaxDba; reading date bounds.newest.
  CurveCube cube;

  /// The cube CurveCube::build(reservations, options) gives (options.asOf unset: the newest
  /// date), made from this one; nullopt when it cannot be (a split, a reading date after the
  /// newest, more leads than kMaxDba, an empty night range): build that one from the
  /// reservations, which also gives the error message.
  std::optional<CurveCube> cubeFor(CubeOptions options) const;
};

/// The kept cube of these reservations; nullopt when none of them stays a night (or every
/// night stayed is more than kMaxDba days after the newest booking or cancellation).
std::optional<KeptCube> keptCubeOf(const std::vector<Reservation> &reservations);
/// The same from the facts of the same reservations (what a daily import has in hand).
std::optional<KeptCube> keptCubeOf(std::span<const ReservationFacts> rows);

/// The file's bytes for `stamp` (what writeKeptCube writes), for tests.
std::string encodeKeptCube(std::uint64_t stamp, const KeptCube &kept);
/// Decodes bytes made by encodeKeptCube; nullopt when they are not a whole kept cube for
/// `stamp`. Never throws for bad bytes.
std::optional<KeptCube> decodeKeptCube(std::string_view bytes, std::uint64_t stamp);

/// Writes the kept cube for `stamp` to `file` (a temporary file renamed over it). Returns false
/// (and leaves any old file as it was) when the folder cannot be written.
bool writeKeptCube(const std::filesystem::path &file, std::uint64_t stamp, const KeptCube &kept);
/// The kept cube at `file` when it exists, is whole and was written for `stamp`; else nullopt.
std::optional<KeptCube> readKeptCube(const std::filesystem::path &file, std::uint64_t stamp);

} // namespace cb
