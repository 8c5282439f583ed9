// Timings of the curve cube build (total and by segment) on the sample property, the open city
// dataset and a synthetic property of about 1,000,000 reservations, and of loading a store
// into memory. Each data set is made once, before its first benchmark runs.
#include "core/curvecube.h"
#include "core/reservationimporter.h"
#include "core/samplestore.h"
#include "core/simulator.h"
#include "core/store.h"

#include <benchmark/benchmark.h>

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <memory>
#include <random>
#include <string>
#include <vector>

namespace fs = std::filesystem;

namespace {

/// A scratch folder for the stores the benchmarks build, removed at exit.
class ScratchDir {
public:
  ScratchDir() {
    std::random_device rd;
    for (;;) {
      path_ = fs::temp_directory_path() / ("curvebench-bench-" + std::to_string(rd()));
      if (fs::create_directory(path_))
        break;
    }
  }
  ~ScratchDir() {
    std::error_code ec;
    fs::remove_all(path_, ec);
  }
  const fs::path &path() const { return path_; }

private:
  fs::path path_;
};

ScratchDir &scratch() {
  static ScratchDir dir;
  return dir;
}

double secondsSince(std::chrono::steady_clock::time_point t0) {
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
}

struct DataSet {
  std::string label;
  std::vector<cb::Reservation> reservations;
  std::string missing; ///< why the data set is unavailable, or empty
};

const DataSet &sampleProperty() {
  static const DataSet set = [] {
    DataSet s{"sample property", cb::simulateProperty().reservations, {}};
    return s;
  }();
  return set;
}

fs::path openCityCsv() {
  const char *env = std::getenv("CURVEBENCH_SHARED_DIR");
  return fs::path(env ? env : CURVEBENCH_SHARED_DIR) / "data" / "open" / "hotel_bookings_city.csv";
}

const DataSet &openCity() {
  // Antonio, de Almeida & Nunes, "Hotel booking demand datasets", Data in Brief 22 (2019)
  // 41-49, doi:10.1016/j.dib.2018.11.126 (CC BY 4.0): the city hotel, 79,330 bookings.
  static const DataSet set = [] {
    DataSet s{"open city dataset", {}, {}};
    const fs::path csv = openCityCsv();
    if (!fs::exists(csv)) {
      s.missing = "open dataset not found at " + csv.string() + " (set CURVEBENCH_SHARED_DIR)";
      return s;
    }
    cb::Property p;
    p.name = "City hotel (open data)";
    p.capacity = 235; // the highest count of rooms occupied on a night (see test_datahealth)
    auto store = cb::Store::create(scratch().path() / "city.curvebench", p);
    cb::ImportOptions opt;
    opt.profile = "hotel-bookings-open-data";
    if (!cb::importReservations(*store, csv, opt).written) {
      s.missing = "import of " + csv.string() + " failed";
      return s;
    }
    s.reservations = store->reservations();
    return s;
  }();
  return set;
}

const DataSet &millionBookings() {
  static const DataSet set = [] {
    const auto t0 = std::chrono::steady_clock::now();
    DataSet s{"synthetic 1M", cb::simulateProperty(cb::millionBookingConfig()).reservations, {}};
    std::fprintf(stderr, "simulated the synthetic property: %zu reservations in %.2f s\n",
                 s.reservations.size(), secondsSince(t0));
    return s;
  }();
  return set;
}

cb::CubeOptions optionsFor(const std::vector<cb::Reservation> &rs, cb::SeriesBy by) {
  cb::CubeOptions o;
  o.firstNight = rs.front().arrival;
  o.lastNight = rs.front().arrival;
  for (const auto &r : rs) {
    o.firstNight = std::min(o.firstNight, r.arrival);
    o.lastNight = std::max(o.lastNight, std::max(r.arrival, r.departure - 1));
  }
  o.by = by;
  return o;
}

void cubeBuild(benchmark::State &state, const DataSet &(*data)(), cb::SeriesBy by) {
  const DataSet &set = data();
  if (!set.missing.empty()) {
    state.SkipWithError(set.missing.c_str());
    return;
  }
  const cb::CubeOptions options = optionsFor(set.reservations, by);
  std::size_t cells = 0;
  for (auto _ : state) {
    cb::CurveCube cube = cb::CurveCube::build(set.reservations, options);
    cells = cube.series().size() * static_cast<std::size_t>(cube.nights()) *
            static_cast<std::size_t>(cube.maxDba() + 1);
    benchmark::DoNotOptimize(cube);
  }
  state.counters["reservations"] = static_cast<double>(set.reservations.size());
  state.counters["cells"] = static_cast<double>(cells);
  state.SetItemsProcessed(state.iterations() * static_cast<std::int64_t>(set.reservations.size()));
}

void BM_CubeSampleTotal(benchmark::State &s) { cubeBuild(s, sampleProperty, cb::SeriesBy::Total); }
void BM_CubeSampleBySegment(benchmark::State &s) {
  cubeBuild(s, sampleProperty, cb::SeriesBy::Segment);
}
void BM_CubeOpenCityTotal(benchmark::State &s) { cubeBuild(s, openCity, cb::SeriesBy::Total); }
void BM_CubeOpenCityBySegment(benchmark::State &s) {
  cubeBuild(s, openCity, cb::SeriesBy::Segment);
}
void BM_Cube1MTotal(benchmark::State &s) { cubeBuild(s, millionBookings, cb::SeriesBy::Total); }
void BM_Cube1MBySegment(benchmark::State &s) {
  cubeBuild(s, millionBookings, cb::SeriesBy::Segment);
}

/// Reading every reservation of the sample store into memory (what each screen starts from).
void BM_LoadSampleStore(benchmark::State &state) {
  static const fs::path path = [] {
    const fs::path p = scratch().path() / "sample.curvebench";
    cb::buildSampleStore(p, scratch().path() / "sample-files");
    return p;
  }();
  auto store = cb::Store::open(path);
  std::size_t rows = 0;
  for (auto _ : state) {
    auto rs = store->reservations();
    rows = rs.size();
    benchmark::DoNotOptimize(rs);
  }
  state.counters["reservations"] = static_cast<double>(rows);
  state.SetItemsProcessed(state.iterations() * static_cast<std::int64_t>(rows));
}

} // namespace

BENCHMARK(BM_LoadSampleStore)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_CubeSampleTotal)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_CubeSampleBySegment)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_CubeOpenCityTotal)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_CubeOpenCityBySegment)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_Cube1MTotal)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_Cube1MBySegment)->Unit(benchmark::kMillisecond);

BENCHMARK_MAIN();
