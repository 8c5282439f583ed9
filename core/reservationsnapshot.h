// A columnar copy of a store's reservations in a file beside it ("<store>.snapshot"), so the
// commands and the workbench read a million reservations in a fraction of a second instead of
// asking SQLite for every field of every row (measured: 85 % of `curves` at 1M rows went there).
//
// The store stays the only record. The snapshot is a cache keyed by the store's reservation
// stamp (Store::reservationStamp), a random number the store replaces in the same transaction as
// any reservation it writes; a snapshot with another stamp, another format, a bad checksum or a
// short file is ignored and rebuilt from the store. A write to the reservations table that does
// not go through Store (the sqlite3 tool, say) leaves the stamp as it was: delete the snapshot
// then. Writing is best effort and atomic (a temporary file renamed over the old one), so a
// read-only folder or a crash costs only speed.
#pragma once

#include "core/reservation.h"
#include "core/store.h"

#include <cstdint>
#include <filesystem>
#include <functional>
#include <memory>
#include <optional>
#include <span>
#include <string_view>
#include <vector>

namespace cb {

/// "<store>.snapshot": where a store's snapshot lives.
std::filesystem::path snapshotPathFor(const std::filesystem::path &store);

/// The rows of the snapshot at `file` when it exists, is whole and was written for `stamp`;
/// nullopt otherwise (missing, other stamp, damaged, older or newer format). Never throws for a
/// bad file.
std::optional<std::vector<Reservation>> readReservationSnapshot(const std::filesystem::path &file,
                                                                std::uint64_t stamp);

/// Calls `visit` with the id and digest (digestOf) of every row of the snapshot at `file`, in id
/// order, when it is whole and was written for `stamp`, and returns true; false (nothing
/// visited) otherwise. What an import compares its rows with, without reading the rows.
/// `count`, when given, is called first with the number of rows `visit` will see.
bool visitSnapshotDigests(
    const std::filesystem::path &file, std::uint64_t stamp,
    const std::function<void(std::string &&id, const ReservationDigest &digest)> &visit,
    const std::function<void(std::size_t rows)> &count = {});

/// The ids and digests of a snapshot, read in place and looked up by binary search over its
/// sorted ids: what an import of a few hundred rows into a store of a million compares them
/// with, instead of copying every stored id into memory first (a fifth of a second and 100 MB
/// at a million rows).
class SnapshotDigests {
public:
  /// nullptr when the snapshot at `file` is missing, damaged, for another stamp, or its ids are
  /// not in strictly ascending order; also when it holds fewer than `minRows` rows (read from
  /// its header before anything is checked, so a caller that only wants a large one pays little
  /// for a small one).
  static std::unique_ptr<SnapshotDigests> open(const std::filesystem::path &file,
                                               std::uint64_t stamp, std::size_t minRows = 0);
  ~SnapshotDigests();
  SnapshotDigests(const SnapshotDigests &) = delete;
  SnapshotDigests &operator=(const SnapshotDigests &) = delete;
  /// The number of rows (of stored reservations).
  std::size_t size() const;
  /// The digest stored for `id`; nullopt when the snapshot has no such id.
  std::optional<ReservationDigest> find(std::string_view id) const;

private:
  struct Impl;
  explicit SnapshotDigests(std::unique_ptr<Impl> impl);
  std::unique_ptr<Impl> impl_;
};

/// Writes `rows` (in the order given) as the snapshot for `stamp`: to a temporary file in the
/// same folder, then renamed over `file`. Returns false (and leaves any old file as it was) when
/// the folder cannot be written. `digests`, when given, holds digestOf of each row in the same
/// order (an import has worked them out already); when absent, or not one per row, they are
/// worked out here.
bool writeReservationSnapshot(const std::filesystem::path &file, std::uint64_t stamp,
                              const std::vector<Reservation> &rows,
                              const std::vector<ReservationDigest> *digests = nullptr);

/// After a write that took the store from stamp `before` to `after` by adding or replacing the
/// reservations `changed` (and nothing else): when the snapshot at `file` holds the rows of
/// `before`, writes the rows of `after` (the two merged by id) without reading the store, and
/// without decoding the rows it keeps (their columns are copied). So a daily extract that
/// changes a few thousand rows keeps the snapshot current for the next read. Returns false when
/// there was no such snapshot or it could not be written; the next read then rebuilds it from
/// the store. `withRows`, when given, is called with the facts of every row of `after` (in id
/// order), so an import can keep what it derives from them current too (the kept cube); it runs
/// on the calling thread while another thread writes the file.
bool updateReservationSnapshot(
    const std::filesystem::path &file, std::uint64_t before, std::uint64_t after,
    std::vector<Reservation> changed,
    const std::function<void(std::span<const ReservationFacts> rows)> &withRows = {});

/// The snapshot's bytes for `stamp` (what writeReservationSnapshot writes), for tests.
std::string encodeReservationSnapshot(std::uint64_t stamp, const std::vector<Reservation> &rows,
                                      const std::vector<ReservationDigest> *digests = nullptr);
/// Decodes bytes made by encodeReservationSnapshot; nullopt when they are not a whole snapshot
/// for `stamp`.
std::optional<std::vector<Reservation>> decodeReservationSnapshot(std::string_view bytes,
                                                                  std::uint64_t stamp);

} // namespace cb
