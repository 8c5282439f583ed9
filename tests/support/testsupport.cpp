#include "testsupport.h"

#include <cstdio>
#include <fstream>
#include <random>
#include <sstream>
#include <sys/wait.h>

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

std::vector<cb::Reservation> steadyQuarterRows() {
  std::vector<cb::Reservation> rows;
  for (cb::Date s = cb::Date::fromYmd(2026, 1, 1); s <= cb::Date::fromYmd(2026, 3, 31); ++s) {
    cb::Reservation a;
    a.id = "A" + s.toIso();
    a.bookedOn = s - 5;
    a.arrival = s;
    a.departure = s + 1;
    a.rooms = 2;
    a.segment = "CORP";
    cb::Reservation b = a;
    b.id = "B" + s.toIso();
    b.bookedOn = s - 1;
    b.rooms = 1;
    b.segment = "LEIS";
    rows.push_back(a);
    rows.push_back(b);
  }
  return rows;
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

namespace {

CliRun runCommand(const std::string &cmd) {
  CliRun r;
  FILE *p = popen(cmd.c_str(), "r");
  if (!p)
    return r;
  char buf[4096];
  std::size_t n;
  while ((n = fread(buf, 1, sizeof buf, p)) > 0)
    r.out.append(buf, n);
  int status = pclose(p);
  r.code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  return r;
}

cb::Date isoDate(const char *iso) { return *cb::Date::parseIso(iso); }

} // namespace

CliRun runCli(const std::string &cli, const std::string &args) {
  return runCommand("\"" + cli + "\" " + args + " 2>&1");
}

CliRun runCli(const std::string &cli, const std::string &args,
              const std::filesystem::path &errFile) {
  CliRun r = runCommand("\"" + cli + "\" " + args + " 2>\"" + errFile.string() + "\"");
  r.err = readFile(errFile);
  return r;
}

std::string quotePath(const std::filesystem::path &p) { return "\"" + p.string() + "\""; }

cb::Reservation makeReservation(const char *id, const char *booked, const char *arr,
                                const char *dep, int rooms, const char *seg,
                                const char *cancelled) {
  cb::Reservation r;
  r.id = id;
  r.bookedOn = isoDate(booked);
  r.arrival = isoDate(arr);
  r.departure = isoDate(dep);
  r.rooms = rooms;
  r.segment = seg;
  r.channel = "WEB";
  if (cancelled) {
    r.status = cb::ReservationStatus::Cancelled;
    r.cancelledOn = isoDate(cancelled);
  }
  return r;
}

std::vector<cb::Reservation> cutAt(const std::vector<cb::Reservation> &rs, cb::Date t) {
  std::vector<cb::Reservation> out;
  for (cb::Reservation r : rs) {
    if (r.bookedOn > t)
      continue;
    if (r.cancelledOn && *r.cancelledOn > t) {
      r.status = cb::ReservationStatus::Booked;
      r.cancelledOn.reset();
    }
    if (r.status != cb::ReservationStatus::Cancelled && r.arrival > t)
      r.status = cb::ReservationStatus::Booked;
    out.push_back(std::move(r));
  }
  return out;
}

void expectSameCube(const cb::CurveCube &a, const cb::CurveCube &b) {
  ASSERT_EQ(a.series(), b.series());
  ASSERT_EQ(a.asOf(), b.asOf());
  ASSERT_EQ(a.firstNight(), b.firstNight());
  ASSERT_EQ(a.lastNight(), b.lastNight());
  ASSERT_EQ(a.maxDba(), b.maxDba());
  for (std::size_t i = 0; i < a.series().size(); ++i)
    for (cb::Date s = a.firstNight(); s <= a.lastNight(); ++s) {
      for (int h = 0; h <= a.maxDba(); ++h) {
        ASSERT_EQ(a.otbRooms(i, s, h), b.otbRooms(i, s, h)) << i << " " << s.toIso() << " " << h;
        ASSERT_EQ(a.otbRevenue(i, s, h), b.otbRevenue(i, s, h)) << s.toIso() << " d=" << h;
      }
      ASSERT_EQ(a.final(i, s), b.final(i, s)) << s.toIso();
      ASSERT_EQ(a.actual(i, s), b.actual(i, s)) << s.toIso();
    }
}

} // namespace cbtest
