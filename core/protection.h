// Segment protection (brief section 6): Littlewood's two-fare rule, EMSR-a and EMSR-b nested
// protection levels over segments ranked by average rate, booking limits and open/close given
// the rooms already sold. Check values: check-values.md §1 and §2.
#pragma once

#include <optional>
#include <string>
#include <vector>

namespace cb {

/// Littlewood, normal high-fare demand: y1* = mu + sigma·Φ⁻¹(1 − pLo/pHi) (continuous, not
/// rounded). Requires 0 < pLo < pHi, sigma ≥ 0 (else std::invalid_argument). Example: 200, 120,
/// 70, 29 → 62.652934 (check-values.md §1b).
double littlewoodNormal(double pHi, double pLo, double mu, double sigma);
/// Littlewood, Poisson high-fare demand: smallest Q with F(Q) ≥ (pHi − pLo)/pHi. Example: 225,
/// 159, 27.3 → 24 (check-values.md §1a).
int littlewoodPoisson(double pHi, double pLo, double mean);

/// Demand still to come for one segment (a fare class), normal.
struct ClassDemand {
  std::string code;
  double rate = 0; ///< average rate per room-night; ranks the classes (highest first)
  double mean = 0;
  double sd = 0;
};

enum class ProtectionMethod { EmsrB, EmsrA };

/// Nested protection levels y_1 … y_{n−1} (continuous) for classes already sorted by rate,
/// highest first: y_j protects classes 1…j against class j+1 (check-values.md §2 formulas).
/// A class whose rate is not below the previous one's is an error (std::invalid_argument): sort
/// and merge equal rates first; so are a rate ≤ 0, a negative mean or sd and a non-finite figure.
/// A level may be negative (protect nothing). sd 0 everywhere above gives y_j = the sum of means.
/// Example (Fiig et al. 2010, 6 classes): EMSR-b → 20.364878, 35.404703, 54.338987, 80.073517,
/// 117.435845.
std::vector<double> emsrbProtection(const std::vector<ClassDemand> &sorted);
std::vector<double> emsraProtection(const std::vector<ClassDemand> &sorted);

struct ProtectionInput {
  int capacity = 0; ///< rooms of the night
  int sold = 0;     ///< rooms already on the books (all segments)
  ProtectionMethod method = ProtectionMethod::EmsrB;
  std::vector<ClassDemand> classes; ///< any order; ranked by rate inside protect()
};

/// One segment's line of the decision, ranked (1 = highest rate).
struct ProtectionLine {
  ClassDemand demand;
  int rank = 0;
  /// y_rank: rooms protected for this class and every higher one against the next lower class,
  /// continuous; nullopt for the lowest class.
  std::optional<double> protectionLevel;
  /// protectionLevel rounded to the nearest room (half up: 62.5 → 63), raised to at least the
  /// protected rooms of the rank above (and so at least 0): nested levels never fall down the
  /// ranking. nullopt for the lowest class.
  std::optional<int> protectedRooms;
  /// Rooms this class may still sell: remaining − the protected rooms of the classes above
  /// (rank 1: all remaining), floored at 0. With 0 sold this equals the textbook booking limit
  /// C − round(y_{rank−1}) (check-values.md §2a: 100, 80, 65, 46, 20, 0).
  int bookingLimit = 0;
  bool open = false; ///< bookingLimit > 0
};

struct ProtectionResult {
  int remaining = 0;                 ///< max(0, capacity − sold)
  std::vector<ProtectionLine> lines; ///< by rank
};

/// Ranks the classes by rate, computes the protection levels from the demand to come and sets
/// booking limits and open/close for the remaining rooms. A negative mean (a forecast below what
/// is already on the books) counts as no demand to come.
/// Equal rates: the classes keep the order listed (the earlier gets the better rank) and are one
/// fare for the levels: their demand is merged (means add, variances add) and the levels are
/// computed between distinct rates only. Nothing is protected between two equal-rate classes, so
/// the protectionLevel of a class followed by an equal-rate class is that of the rates above it
/// (0 when none), and tied classes share one booking limit.
/// Throws std::invalid_argument for capacity < 0, sold < 0, an empty class list, a rate ≤ 0,
/// sd < 0 or a non-finite figure.
ProtectionResult protect(const ProtectionInput &input);

} // namespace cb
