// Timings of the curve cube build (total and by segment) on the sample property, the open city
// dataset and a synthetic property of about 1,000,000 reservations, of parsing that property's
// CSV, of loading a store into memory (the sample; the 1M one from its snapshot and from the
// table), and of what Horizon computes on the 1M property. Each data set is made once, before its
// first benchmark runs.
#include "core/csvreader.h"
#include "core/curvecube.h"
#include "core/forecastrun.h"
#include "core/mappingprofile.h"
#include "core/nativeformat.h"
#include "core/outlook.h"
#include "core/reservationimporter.h"
#include "core/reservationsnapshot.h"
#include "core/samplestore.h"
#include "core/simulator.h"
#include "core/store.h"

#include <benchmark/benchmark.h>

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <memory>
#include <random>
#include <sstream>
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

/// The synthetic property's settings and denials (what its outlook reads besides the rows).
struct MillionExtras {
  cb::Property property;
  cb::CensorSources sources;
  std::string segment; ///< its first segment code
};
MillionExtras &millionExtras() {
  static MillionExtras extras;
  return extras;
}

const DataSet &millionBookings() {
  static const DataSet set = [] {
    const auto t0 = std::chrono::steady_clock::now();
    cb::SampleProperty sample = cb::simulateProperty(cb::millionBookingConfig());
    millionExtras().property = sample.property;
    millionExtras().sources.denials = std::move(sample.denials);
    millionExtras().segment = sample.segments.front().code;
    DataSet s{"synthetic 1M", std::move(sample.reservations), {}};
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

/// The timed loop of the load benchmarks: every reservation of `store` into memory.
void loadEveryReservation(benchmark::State &state, const cb::Store &store) {
  std::size_t rows = 0;
  for (auto _ : state) {
    auto rs = store.reservations();
    rows = rs.size();
    benchmark::DoNotOptimize(rs);
  }
  state.counters["reservations"] = static_cast<double>(rows);
  state.SetItemsProcessed(state.iterations() * static_cast<std::int64_t>(rows));
}

/// Reading every reservation of the sample store into memory (what each screen starts from).
void BM_LoadSampleStore(benchmark::State &state) {
  static const fs::path path = [] {
    const fs::path p = scratch().path() / "sample.curvebench";
    cb::buildSampleStore(p, scratch().path() / "sample-files");
    return p;
  }();
  auto store = cb::Store::open(path);
  loadEveryReservation(state, *store);
}

} // namespace

/// Parsing the 1M property's native CSV (80 MB, in memory) into reservations: the reader, the
/// mapping profile and the validation of each row, as an import does before the store.
void BM_ParseCsv1M(benchmark::State &state) {
  static const std::string csv = [] {
    std::ostringstream os;
    cb::writeNativeCsv(os, millionBookings().reservations);
    return os.str();
  }();
  std::size_t rows = 0;
  for (auto _ : state) {
    std::istringstream in(csv);
    cb::CsvReader reader(in, "reservations.csv");
    cb::Findings findings;
    auto profile = cb::MappingProfile::load("native", findings);
    cb::CsvRecord rec;
    if (!profile || !reader.next(rec) || !profile->bind(rec, "reservations.csv", findings)) {
      state.SkipWithError("the native profile did not bind");
      return;
    }
    cb::Reservation r;
    rows = 0;
    while (reader.next(rec))
      if (profile->map(rec, r).empty() && cb::validateReservation(r).empty())
        ++rows;
    benchmark::DoNotOptimize(rows);
  }
  state.counters["reservations"] = static_cast<double>(rows);
  state.counters["MB"] = static_cast<double>(csv.size()) / 1e6;
}

/// A store of the 1M property (imported once), for the two ways of loading it.
const fs::path &millionStore() {
  static const fs::path path = [] {
    const fs::path dir = scratch().path() / "1m";
    fs::create_directories(dir);
    {
      std::ofstream out(dir / "reservations.csv", std::ios::binary);
      cb::writeNativeCsv(out, millionBookings().reservations);
    }
    cb::Property p;
    p.name = "Bench 1M";
    p.capacity = cb::millionBookingConfig().capacity;
    auto store = cb::Store::create(dir / "1m.curvebench", p);
    if (!cb::importReservations(*store, dir / "reservations.csv").written)
      std::fprintf(stderr, "import of the 1M property failed\n");
    return dir / "1m.curvebench";
  }();
  return path;
}

/// Loading the 1M store into memory from its snapshot (core/reservationsnapshot.h), as every
/// command and the workbench do once the snapshot is current.
void BM_LoadStore1MSnapshot(benchmark::State &state) {
  auto store = cb::Store::open(millionStore());
  store->reservations(); // makes sure the snapshot is current
  loadEveryReservation(state, *store);
}

/// The same from the SQLite table (no snapshot; the store opened read-only writes none).
void BM_LoadStore1MTable(benchmark::State &state) {
  const fs::path snapshot = cb::snapshotPathFor(millionStore());
  std::error_code ec;
  fs::remove(snapshot, ec);
  auto store = cb::Store::open(millionStore(), cb::Store::Access::ReadOnly);
  loadEveryReservation(state, *store);
}

/// What Horizon computes when the reading date moves (the hotel's outlook of 90 nights, the
/// default method, unconstrained history with the property's denials) and when a segment is
/// picked (that segment's forecast of 90 nights), on the 1M property's reservations in memory,
/// with the reservations' bounds found once beforehand, as the workbench's session does.
// What Horizon asks for the hotel: 90 nights at the reading date.
static cb::OutlookOptions horizonOutlookOptions(const DataSet &set) {
  cb::OutlookOptions o;
  o.asOf = cb::millionBookingConfig().readingDate;
  o.days = 90;
  o.bounds = cb::boundsOf(set.reservations);
  return o;
}

void BM_HorizonOutlook1M(benchmark::State &state) {
  const DataSet &set = millionBookings();
  const cb::OutlookOptions o = horizonOutlookOptions(set);
  for (auto _ : state) {
    const cb::Outlook out = cb::computeOutlook(set.reservations, millionExtras().property,
                                               millionExtras().sources, {}, o);
    benchmark::DoNotOptimize(out.nights.data());
  }
}

// What Horizon asks for one segment: 90 nights, pickup-adv, unconstrained history.
static cb::ForecastRequest horizonSegmentRequest(const DataSet &set) {
  cb::ForecastRequest r;
  r.asOf = cb::millionBookingConfig().readingDate;
  r.horizon = 90;
  r.method = "pickup-adv";
  r.by = cb::SeriesBy::Segment;
  r.series = millionExtras().segment;
  r.unconstrain = cb::UnconstrainOptions{};
  r.censoring = &millionExtras().sources;
  r.bounds = cb::boundsOf(set.reservations);
  return r;
}

void BM_HorizonSegment1M(benchmark::State &state) {
  const DataSet &set = millionBookings();
  cb::ForecastRequest r = horizonSegmentRequest(set);
  for (auto _ : state) {
    const cb::ForecastRun run =
        cb::ForecastRun::compute(set.reservations, millionExtras().property, r);
    benchmark::DoNotOptimize(run.values.data());
  }
}

// The same with the cube by segment an earlier segment's run kept (Horizon, the user flipping
// through segments at one reading date).
void BM_HorizonSegmentKeptCube1M(benchmark::State &state) {
  const DataSet &set = millionBookings();
  cb::ForecastRequest r = horizonSegmentRequest(set);
  r.keepCube = true;
  r.cube = cb::ForecastRun::compute(set.reservations, millionExtras().property, r).cube;
  for (auto _ : state) {
    const cb::ForecastRun run =
        cb::ForecastRun::compute(set.reservations, millionExtras().property, r);
    if (run.cube != r.cube)
      state.SkipWithError("the kept cube was not read");
    benchmark::DoNotOptimize(run.values.data());
  }
}

// The hotel's outlook a day before the reading date, narrowing the cube the outlook at the
// reading date kept (Horizon, the user moving the reading date back).
void BM_HorizonOutlookDayBack1M(benchmark::State &state) {
  const DataSet &set = millionBookings();
  cb::OutlookOptions o = horizonOutlookOptions(set);
  o.cube =
      cb::computeOutlook(set.reservations, millionExtras().property, millionExtras().sources, {}, o)
          .cube;
  o.asOf = o.asOf - 1;
  for (auto _ : state) {
    const cb::Outlook out = cb::computeOutlook(set.reservations, millionExtras().property,
                                               millionExtras().sources, {}, o);
    if (!out.cube || out.cube == o.cube || out.cube->asOf() != o.asOf)
      state.SkipWithError("the kept cube was not narrowed");
    benchmark::DoNotOptimize(out.nights.data());
  }
}

BENCHMARK(BM_LoadSampleStore)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_ParseCsv1M)->Unit(benchmark::kMillisecond)->Iterations(3);
BENCHMARK(BM_LoadStore1MSnapshot)->Unit(benchmark::kMillisecond)->Iterations(5);
BENCHMARK(BM_LoadStore1MTable)->Unit(benchmark::kMillisecond)->Iterations(3);
BENCHMARK(BM_CubeSampleTotal)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_CubeSampleBySegment)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_CubeOpenCityTotal)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_CubeOpenCityBySegment)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_Cube1MTotal)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_Cube1MBySegment)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_HorizonOutlook1M)->Unit(benchmark::kMillisecond)->Iterations(5);
BENCHMARK(BM_HorizonSegment1M)->Unit(benchmark::kMillisecond)->Iterations(5);
BENCHMARK(BM_HorizonSegmentKeptCube1M)->Unit(benchmark::kMillisecond)->Iterations(5);
BENCHMARK(BM_HorizonOutlookDayBack1M)->Unit(benchmark::kMillisecond)->Iterations(5);

BENCHMARK_MAIN();
