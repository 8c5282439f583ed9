#include "testsupport.h"

#include <fstream>
#include <random>
#include <sstream>

namespace cbtest {

std::filesystem::path sourceDir() { return CURVEBENCH_SOURCE_DIR; }
std::filesystem::path binaryDir() { return CURVEBENCH_BINARY_DIR; }
std::filesystem::path sharedDir() {
  if (const char *env = std::getenv("CURVEBENCH_SHARED_DIR"))
    return env;
  return CURVEBENCH_SHARED_DIR;
}
std::filesystem::path openCityCsv() {
  return sharedDir() / "data" / "open" / "hotel_bookings_city.csv";
}

TempDir::TempDir() {
  std::random_device rd;
  auto base = std::filesystem::temp_directory_path();
  for (;;) {
    path_ = base / ("curvebench-test-" + std::to_string(rd()));
    if (std::filesystem::create_directory(path_))
      break;
  }
}

TempDir::~TempDir() {
  std::error_code ec;
  std::filesystem::remove_all(path_, ec);
}

void writeFile(const std::filesystem::path &p, const std::string &bytes) {
  std::ofstream out(p, std::ios::binary | std::ios::trunc);
  out.write(bytes.data(), static_cast<std::streamsize>(bytes.size()));
}

std::string readFile(const std::filesystem::path &p) {
  std::ifstream in(p, std::ios::binary);
  std::ostringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

::testing::AssertionResult hasFinding(const cb::Findings &findings, const std::string &needle) {
  std::string all;
  for (const auto &f : findings) {
    auto s = f.toString();
    if (s.find(needle) != std::string::npos)
      return ::testing::AssertionSuccess();
    all += "\n  " + s;
  }
  return ::testing::AssertionFailure() << "no finding contains \"" << needle
                                       << "\"; findings:" << (all.empty() ? " (none)" : all);
}

} // namespace cbtest
