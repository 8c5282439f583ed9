// Shared helpers for every test executable.
#pragma once

#include "core/curvecube.h"
#include "core/finding.h"
#include "core/reservation.h"

#include <gtest/gtest.h>

#include <filesystem>
#include <string>
#include <vector>

namespace cbtest {

/// Upper bound for waiting on a background job in a ui test. A wait returns as soon as the job
/// signals, so this only matters when something is slow: the sanitizer build (-O1) on 2 cores
/// took over 30 s for Year Map's year of nights.
inline constexpr int kBackgroundWaitMs = 300000;

/// The repository root, the shared/ folder beside the clone and the build folder.
std::filesystem::path sourceDir();
std::filesystem::path sharedDir();
std::filesystem::path binaryDir();
/// ../shared/data/open/hotel_bookings_city.csv (Antonio, de Almeida & Nunes 2019, CC BY 4.0).
std::filesystem::path openCityCsv();

/// A fresh empty folder, removed when the object goes out of scope.
class TempDir {
public:
  TempDir();
  ~TempDir();
  TempDir(const TempDir &) = delete;
  TempDir &operator=(const TempDir &) = delete;
  const std::filesystem::path &path() const { return path_; }
  std::filesystem::path operator/(const std::string &name) const { return path_ / name; }

private:
  std::filesystem::path path_;
};

/// Writes bytes to a file exactly as given (no newline translation).
void writeFile(const std::filesystem::path &p, const std::string &bytes);
std::string readFile(const std::filesystem::path &p);

/// Passes when some finding's toString() contains `needle`; prints all findings otherwise.
/// A steady hand-worked quarter: every night of Jan–Mar 2026 has 2 CORP rooms booked 5 days
/// ahead ("A<night>") and 1 LEIS room booked the day before ("B<night>"), so Final = 3 and
/// OTB(s, s − h) = 3 at h = 1, 2 at h = 2…5, 0 beyond. Used by the backtest and forecast tests.
std::vector<cb::Reservation> steadyQuarterRows();

::testing::AssertionResult hasFinding(const cb::Findings &findings, const std::string &needle);

/// One run of a command-line executable: exit code (-1 when it did not exit normally), stdout
/// and stderr.
struct CliRun {
  int code = -1;
  std::string out; ///< stdout, and stderr too when no stderr file is given
  std::string err; ///< stderr, when a stderr file is given
};

/// Runs `"cli" args` through the shell. Without `errFile` stderr goes to `out` with stdout;
/// with it stderr is written there and read back into `err`.
CliRun runCli(const std::string &cli, const std::string &args);
CliRun runCli(const std::string &cli, const std::string &args,
              const std::filesystem::path &errFile);

/// The path in double quotes, for a shell command line.
std::string quotePath(const std::filesystem::path &p);

/// A reservation booked on `booked` for nights [arr, dep), segment `seg`, channel WEB, cancelled
/// on `cancelled` when given. Dates are ISO (YYYY-MM-DD).
cb::Reservation makeReservation(const char *id, const char *booked, const char *arr,
                                const char *dep, int rooms, const char *seg,
                                const char *cancelled = nullptr);

/// The reservations as an extract taken at the end of day t would have shown them: rows booked
/// after t are absent, cancellations after t not yet made, and rows not cancelled by t that
/// arrive after t still just Booked (later no-shows and check-outs not yet known).
std::vector<cb::Reservation> cutAt(const std::vector<cb::Reservation> &rs, cb::Date t);

/// Every cell, known or not, and the finals and actuals of the two cubes are the same (and their
/// series, reading date, nights and leads).
void expectSameCube(const cb::CurveCube &a, const cb::CurveCube &b);

} // namespace cbtest
