// Shared helpers for every test executable.
#pragma once

#include "core/finding.h"

#include <gtest/gtest.h>

#include <filesystem>
#include <string>

namespace cbtest {

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
::testing::AssertionResult hasFinding(const cb::Findings &findings, const std::string &needle);

} // namespace cbtest
