// The pickup methods (brief section 5) on hand-made curves whose answers are worked out below,
// against an independent pandas computation on the open city dataset, and the no-look-ahead
// property.
#include "core/pickupmethods.h"

#include "core/curvecube.h"
#include "core/reservationimporter.h"
#include "core/simulator.h"
#include "core/store.h"
#include "testsupport.h"

#include <cmath>
#include <cstdlib>
#include <sstream>

using cb::CubeOptions;
using cb::CurveCube;
using cb::Date;
using cb::ForecastContext;
using cb::MethodOptions;
using cb::Reservation;
using cb::ReservationStatus;
using cb::SeriesBy;

namespace {

Date d(const char *iso) { return *Date::parseIso(iso); }

/// One night (arrival `night`, departure the next day) for `rooms` rooms.
Reservation night(const char *id, const char *booked, const char *arrival, int rooms,
                  const char *cancelled = nullptr) {
  Reservation r;
  r.id = id;
  r.bookedOn = d(booked);
  r.arrival = d(arrival);
  r.departure = r.arrival + 1;
  r.rooms = rooms;
  r.rate = 100;
  r.segment = "TRANS";
  r.channel = "WEB";
  r.roomType = "STD";
  if (cancelled) {
    r.status = ReservationStatus::Cancelled;
    r.cancelledOn = d(cancelled);
  }
  return r;
}

// Hand-made curves. Saturdays A 05-23, B 05-30, C 06-06, D 06-13, E 06-20, G 07-04 (2026);
// "dba k" = booked k days before arrival. Reading date t = Monday 06-08.
//   A: 1 room dba 5                                     Final 1
//   B: 2 rooms dba 20, 1 room dba 3, 1 room dba 0       Final 4
//   C: 1 room dba 14, 2 rooms dba 10, 3 rooms dba 1     Final 6
//   D: 2 rooms dba 9 (06-04), 1 dba 6 (06-07), 1 dba 2 (06-11, after t)
//   E: 1 room dba 30 (05-21); 1 dba 20 (05-31) cancelled 06-10 (after t); 2 dba 15 (06-05);
//      1 dba 8 (06-12, after t)            → OTB(E, t) = 4, OTB(E, 06-01) = 2, OTB(E, 05-24) = 1
//   G: 3 rooms dba 40 (05-25)                           OTB(G, t) = 3
//   Sunday 06-07: 3 rooms booked 05-28, cancelled 06-05 (dba 2)   Final 0, OTB(·, dba 6) = 3
//   Sunday 06-14: 1 room booked 06-01                   OTB(·, t) = 1
//   Friday 06-19: 1 room booked 05-20; 3 rooms booked 05-20 cancelled 06-06
//                                          → OTB(·, t) = 1, OTB(·, 06-01) = 4
std::vector<Reservation> handRows() {
  return {
      night("a1", "2026-05-18", "2026-05-23", 1),
      night("b1", "2026-05-10", "2026-05-30", 2),
      night("b2", "2026-05-27", "2026-05-30", 1),
      night("b3", "2026-05-30", "2026-05-30", 1),
      night("c1", "2026-05-23", "2026-06-06", 1),
      night("c2", "2026-05-27", "2026-06-06", 2),
      night("c3", "2026-06-05", "2026-06-06", 3),
      night("d1", "2026-06-04", "2026-06-13", 2),
      night("d2", "2026-06-07", "2026-06-13", 1),
      night("d3", "2026-06-11", "2026-06-13", 1),
      night("e1", "2026-05-21", "2026-06-20", 1),
      night("e2", "2026-05-31", "2026-06-20", 1, "2026-06-10"),
      night("e3", "2026-06-05", "2026-06-20", 2),
      night("e4", "2026-06-12", "2026-06-20", 1),
      night("g1", "2026-05-25", "2026-07-04", 3),
      night("s1", "2026-05-28", "2026-06-07", 3, "2026-06-05"),
      night("s2", "2026-06-01", "2026-06-14", 1),
      night("f1", "2026-05-20", "2026-06-19", 1),
      night("f2", "2026-05-20", "2026-06-19", 3, "2026-06-06"),
  };
}

CurveCube handCube(int maxDba = 60) {
  return CurveCube::build(handRows(), CubeOptions{d("2026-05-23"), d("2026-07-04"), maxDba,
                                                  SeriesBy::Total, std::nullopt});
}

const cb::Property &property() {
  static const cb::Property p = [] {
    cb::Property q;
    q.name = "Hand";
    q.capacity = 10;
    return q;
  }();
  return p;
}

MethodOptions refs(int n) {
  MethodOptions o;
  o.references = n;
  return o;
}

std::optional<double> fc(const std::string &method, const MethodOptions &o, const CurveCube &cube,
                         const char *asOf, const char *stay) {
  auto m = cb::makePickupMethod(method, o);
  EXPECT_NE(m, nullptr) << method;
  ForecastContext ctx(cube, 0, d(asOf), property());
  m->fit(ctx);
  return m->forecast(ctx, d(stay));
}

constexpr double kTol = 1e-12;

} // namespace

TEST(PickupMethods, HandCubeIsAsWorkedOut) {
  CurveCube cube = handCube();
  EXPECT_EQ(cube.asOf(), d("2026-06-12"));
  EXPECT_EQ(cube.otbRooms(0, d("2026-06-20"), 12), 4);
  EXPECT_EQ(cube.otbRooms(0, d("2026-06-20"), 19), 2);
  EXPECT_EQ(cube.final(0, d("2026-06-06")), 6);
  EXPECT_EQ(cube.otbRooms(0, d("2026-06-06"), 12), 1);
  EXPECT_EQ(cube.otbRooms(0, d("2026-05-30"), 12), 2);
  EXPECT_EQ(cube.otbRooms(0, d("2026-06-07"), 6), 3);
  EXPECT_EQ(cube.final(0, d("2026-06-07")), 0);
}

TEST(PickupMethods, AdditiveByHand) {
  CurveCube cube = handCube();
  // E as of t, h = 12, N = 2: references C and B (Saturdays ≤ t).
  // C: Final 6 − OTB(C, dba 12) 1 = 5; B: 4 − 2 = 2; mean 3.5; F = 4 + 3.5 = 7.5.
  EXPECT_NEAR(*fc("pickup-add", refs(2), cube, "2026-06-08", "2026-06-20"), 7.5, kTol);
  // Defaults (N = 8): only C, B and A are Saturdays inside the cube by t; A: 1 − 0 = 1.
  // mean (5 + 2 + 1) / 3 = 8/3; F = 4 + 8/3 = 20/3.
  EXPECT_NEAR(*fc("pickup-add", {}, cube, "2026-06-08", "2026-06-20"), 20.0 / 3, kTol);
  // Sunday 06-14, h = 6, N = 2: references 06-07 (0 − 3 = −3) and 05-31 (no rooms: 0);
  // F = 1 − 1.5 = −0.5, floored at 0.
  EXPECT_EQ(*fc("pickup-add", refs(2), cube, "2026-06-08", "2026-06-14"), 0.0);
  // A night already arrived: its final.
  EXPECT_EQ(*fc("pickup-add", refs(2), cube, "2026-06-08", "2026-06-06"), 6.0);
}

TEST(PickupMethods, AdvancedChainUsesFresherNights) {
  CurveCube cube = handCube();
  // E as of t = 06-08, h = 12, N = 2. Increment j (from dba j + 1 to dba j) may use Saturdays
  // r ≤ t + j. Without cancellations among the references an increment is the rooms booked
  // exactly j days ahead.
  //   j = 0…4  (t + j ≤ 06-12): {C, B}: j0 B 1 → 0.5; j1 C 3 → 1.5; j3 B 1 → 0.5;   sum 2.5
  //   j = 5…11 (t + j ≥ 06-13): {D, C}: j6 D 1 → 0.5; j9 D 2 → 1; j10 C 2 → 1;      sum 2.5
  // F = 4 + 2.5 + 2.5 = 9. Classical pickup on {C, B} alone gave 7.5: D's rooms booked 9 and 6
  // days ahead (D arrives after t) enter the forecast. D's room booked 06-11 (dba 2) is never
  // visible: j = 2 may only use nights r ≤ 06-10.
  EXPECT_NEAR(*fc("pickup-adv", refs(2), cube, "2026-06-08", "2026-06-20"), 9.0, kTol);
  // G (07-04) as of t, h = 26: the chain reaches E and the empty Saturday 06-27 too.
  //   j = 0…4 {C, B} 2.5; j = 5…11 {D, C} 2.5;
  //   j = 12…18 {E, D}: E's 2 rooms at j15 → 1 (E's −1 cancellation at j10 is outside);  1
  //   j = 19…25 {06-27, E}: E's room at j20 → 0.5;                                        0.5
  // F = 3 + 2.5 + 2.5 + 1 + 0.5 = 9.5.
  EXPECT_NEAR(*fc("pickup-adv", refs(2), cube, "2026-06-08", "2026-07-04"), 9.5, kTol);
  // Short lead with no newer Saturday: D as of Wednesday 06-10, h = 3, every R_j = {C, B}: the
  // chain telescopes to classical pickup. C: 6 − OTB(C, dba 3) 3 = 3; B: 4 − 3 = 1; mean 2;
  // OTB(D, 06-10) = 3; F = 5 for both.
  EXPECT_NEAR(*fc("pickup-adv", refs(2), cube, "2026-06-10", "2026-06-13"), 5.0, kTol);
  EXPECT_NEAR(*fc("pickup-add", refs(2), cube, "2026-06-10", "2026-06-13"), 5.0, kTol);
  // Sunday 06-14, h = 6: every R_j = {06-07, 05-31}; increments sum to (−3 + 0)/2; F = 1 − 1.5 → 0.
  EXPECT_EQ(*fc("pickup-adv", refs(2), cube, "2026-06-08", "2026-06-14"), 0.0);
}

TEST(PickupMethods, MultiplicativeAndItsAdditiveFallback) {
  CurveCube cube = handCube();
  // E, h = 12, references C, B: Σ Final = 6 + 4 = 10, Σ OTB(r, dba 12) = 1 + 2 = 3;
  // F = 4 × 10/3 = 40/3.
  EXPECT_NEAR(*fc("pickup-mult", refs(2), cube, "2026-06-08", "2026-06-20"), 40.0 / 3, kTol);
  // G, h = 26: C and B had nothing on the books 26 days out (Σ OTB = 0), so additive pickup:
  // 3 + (6 + 4)/2 = 8, the same as pickup-add.
  EXPECT_NEAR(*fc("pickup-mult", refs(2), cube, "2026-06-08", "2026-07-04"), 8.0, kTol);
  EXPECT_NEAR(*fc("pickup-add", refs(2), cube, "2026-06-08", "2026-07-04"), 8.0, kTol);
  // Sunday 06-14, h = 6: Σ Final = 0, Σ OTB = 3 + 0; F = 1 × 0 = 0.
  EXPECT_EQ(*fc("pickup-mult", refs(2), cube, "2026-06-08", "2026-06-14"), 0.0);
  // Friday 06-19, h = 11: Fridays 06-05 and 05-29 are empty, Σ OTB = 0 → 1 + 0 = 1.
  EXPECT_NEAR(*fc("pickup-mult", refs(2), cube, "2026-06-08", "2026-06-19"), 1.0, kTol);
}

TEST(PickupMethods, PaceExtrapolation) {
  CurveCube cube = handCube();
  // E as of t, h = 12, w = 7: OTB(E, t) 4, OTB(E, 06-01) 2; F = 4 + 12 × 2/7 = 52/7.
  EXPECT_NEAR(*fc("pace-extrap", {}, cube, "2026-06-08", "2026-06-20"), 52.0 / 7, kTol);
  // w = 15: OTB(E, 05-24) = 1; F = 4 + 12 × 3/15 = 6.4.
  MethodOptions w15;
  w15.paceWindow = 15;
  EXPECT_NEAR(*fc("pace-extrap", w15, cube, "2026-06-08", "2026-06-20"), 6.4, kTol);
  // Friday 06-19, h = 11: 3 rooms cancelled in the window: 1 + 11 × (1 − 4)/7 < 0 → 0.
  EXPECT_EQ(*fc("pace-extrap", {}, cube, "2026-06-08", "2026-06-19"), 0.0);
  // Sunday 06-14: OTB 1 both now and 7 days ago; F = 1.
  EXPECT_NEAR(*fc("pace-extrap", {}, cube, "2026-06-08", "2026-06-14"), 1.0, kTol);
}

TEST(PickupMethods, LeadsAgainstTheCubeDepth) {
  CurveCube cube = handCube(16);
  // maxDba 16: E at h = 12 needs OTB(E, t − 7) at dba 19, beyond the cube; the earlier reading
  // is clamped to dba 16 (06-04): OTB 2, window 4 days; F = 4 + 12 × (4 − 2)/4 = 10.
  EXPECT_NEAR(*fc("pace-extrap", {}, cube, "2026-06-08", "2026-06-20"), 10.0, kTol);
  // h = 16 = maxDba: no window left; F = OTB(E, 06-04) = 2.
  EXPECT_NEAR(*fc("pace-extrap", {}, cube, "2026-06-04", "2026-06-20"), 2.0, kTol);
  // The reference terms at h = 12 ≤ 16 are unaffected.
  EXPECT_NEAR(*fc("pickup-add", refs(2), cube, "2026-06-08", "2026-06-20"), 7.5, kTol);
  EXPECT_NEAR(*fc("pickup-adv", refs(2), cube, "2026-06-08", "2026-06-20"), 9.0, kTol);
  // G at h = 26 > 16: OTB(G, t) is not in the cube (its earliest reading is 06-18): no forecast.
  for (const char *m : {"pickup-add", "pickup-adv", "pickup-mult", "pace-extrap"})
    EXPECT_FALSE(fc(m, refs(2), cube, "2026-06-08", "2026-07-04")) << m;
}

TEST(PickupMethods, NoReferenceNoForecast) {
  CurveCube cube = handCube();
  // As of Monday 05-25 no Friday is inside the cube yet (it starts Saturday 05-23).
  for (const char *m : {"pickup-add", "pickup-adv", "pickup-mult"})
    EXPECT_FALSE(fc(m, refs(2), cube, "2026-05-25", "2026-05-29")) << m;
  // Pace needs no reference: OTB 0 now and a week ago → 0.
  EXPECT_EQ(fc("pace-extrap", {}, cube, "2026-05-25", "2026-05-29"), 0.0);
  // A night outside the cube.
  EXPECT_FALSE(fc("pickup-add", refs(2), cube, "2026-06-08", "2026-07-11"));
}

TEST(PickupMethods, NamesDescriptionsAndOptions) {
  for (const char *name : {"pickup-add", "pickup-adv", "pickup-mult", "pace-extrap"}) {
    auto m = cb::makeMethod(name);
    ASSERT_NE(m, nullptr);
    EXPECT_EQ(m->name(), name);
    EXPECT_GT(m->description().size(), 40u) << name;
    EXPECT_NE(m->formula().find("OTB(s,t)"), std::string::npos) << name;
  }
  EXPECT_NE(cb::makeMethod("pace-extrap")->description().find("rule of thumb"), std::string::npos);
  EXPECT_NE(cb::makeMethod("pickup-add")->description().find("8 most recent"), std::string::npos);
  MethodOptions seasonal;
  seasonal.seasonalReferences = true;
  EXPECT_NE(cb::makeMethod("pickup-add", seasonal)->description().find("last year"),
            std::string::npos);
  EXPECT_EQ(cb::makePickupMethod("naive", {}), nullptr);
  EXPECT_THROW(cb::makePickupMethod("pickup-add", refs(0)), cb::MethodError);
  MethodOptions bad;
  bad.paceWindow = 0;
  EXPECT_THROW(cb::makePickupMethod("pace-extrap", bad), cb::MethodError);
  bad = {};
  bad.seasonalWeeks = -1;
  EXPECT_THROW(cb::makePickupMethod("pickup-mult", bad), cb::MethodError);
}

// ---- No look-ahead: the sample property (cb::simulateProperty()). ----

namespace {

const cb::SampleProperty &sample() {
  static const cb::SampleProperty s = cb::simulateProperty();
  return s;
}

} // namespace

TEST(PickupMethods, NoLookAhead) {
  const auto &all = sample().reservations;
  std::vector<std::pair<std::string, MethodOptions>> variants;
  for (const char *m : {"pickup-add", "pickup-adv", "pickup-mult", "pace-extrap"})
    variants.emplace_back(m, MethodOptions{});
  MethodOptions seasonal;
  seasonal.seasonalReferences = true;
  for (const char *m : {"pickup-add", "pickup-adv", "pickup-mult"})
    variants.emplace_back(m, seasonal);
  MethodOptions w15;
  w15.paceWindow = 15;
  variants.emplace_back("pace-extrap", w15);

  for (const char *tIso : {"2025-06-17", "2026-02-03"}) {
    const Date t = d(tIso);
    std::vector<Reservation> cut = cbtest::cutAt(all, t);
    ASSERT_EQ(cb::newestActivity(cut), t);
    CubeOptions o{d("2023-11-01"), t + 200, 120, SeriesBy::Segment, std::nullopt};
    CurveCube fromAll = CurveCube::build(all, o);
    o.asOf = t;
    CurveCube fromCut = CurveCube::build(cut, o);
    ASSERT_EQ(fromAll.series(), fromCut.series());
    ASSERT_GT(fromAll.asOf(), t + 120) << "the full cube must hold activity after t";
    for (const auto &[name, opt] : variants) {
      auto m = cb::makePickupMethod(name, opt);
      int compared = 0;
      double differs = 0; // the full data must change something, or the check proves nothing
      for (std::size_t series : {std::size_t{0}, std::size_t{1}}) {
        ForecastContext a(fromAll, series, t, sample().property);
        ForecastContext b(fromCut, series, t, sample().property);
        m->fit(a);
        std::vector<std::optional<double>> fa;
        for (int h = 1; h <= 130; ++h)
          fa.push_back(m->forecast(a, t + h));
        m->fit(b);
        for (int h = 1; h <= 130; ++h) {
          auto fb = m->forecast(b, t + h);
          ASSERT_EQ(fa[static_cast<std::size_t>(h - 1)].has_value(), fb.has_value())
              << name << " " << tIso << " h " << h;
          if (fb) {
            ++compared;
            EXPECT_EQ(*fa[static_cast<std::size_t>(h - 1)], *fb) << name << " h " << h;
            EXPECT_GE(*fb, 0.0);
          }
          if (h <= 120 && series == 0)
            differs += std::abs(*fromAll.final(0, t + h) - *fb);
        }
      }
      // h 1…120 in two series (h > 120 = maxDba has no OTB(s,t) in the cube).
      EXPECT_EQ(compared, 240) << name << (opt.seasonalReferences ? " seasonal" : "");
      EXPECT_GT(differs, 0.0) << name;
    }
  }
}

TEST(PickupMethods, SeasonalReferencesOnTheSample) {
  const Date t = d("2026-02-03");
  CurveCube cube =
      CurveCube::build(sample().reservations,
                       CubeOptions{d("2023-11-01"), t + 200, 120, SeriesBy::Total, std::nullopt});
  ForecastContext ctx(cube, 0, t, sample().property);
  MethodOptions o;
  o.seasonalReferences = true; // seasonalWeeks 4: nine nights s − 364 + 7i, i = −4 … 4
  auto add = cb::makePickupMethod("pickup-add", o);
  auto adv = cb::makePickupMethod("pickup-adv", o);
  auto mult = cb::makePickupMethod("pickup-mult", o);
  for (int h : {1, 7, 30, 90, 120}) {
    const Date s = t + h;
    // The definition read straight from the cube: every reference has arrived by t here
    // (s − 364 + 28 ≤ t for h ≤ 336).
    double pickup = 0, finals = 0, onBooks = 0;
    for (int i = -4; i <= 4; ++i) {
      const Date r = s - 364 + 7 * i;
      pickup += *cube.final(0, r) - cube.otbRooms(0, r, h);
      finals += *cube.final(0, r);
      onBooks += cube.otbRooms(0, r, h);
    }
    const double now = cube.otbRooms(0, s, h);
    EXPECT_NEAR(*add->forecast(ctx, s), std::max(0.0, now + pickup / 9), 1e-9) << h;
    EXPECT_NEAR(*mult->forecast(ctx, s), std::max(0.0, now * finals / onBooks), 1e-9) << h;
    // With every reference arrived, each R_j is the same nine nights: the chain telescopes.
    EXPECT_NEAR(*adv->forecast(ctx, s), *add->forecast(ctx, s), 1e-9) << h;
  }
}

// ---- The open city dataset: Antonio, de Almeida & Nunes, "Hotel booking demand datasets",
// Data in Brief 22 (2019) 41–49, doi:10.1016/j.dib.2018.11.126, CC BY 4.0. ----

TEST(PickupMethods, OpenCityMatchesThePandasReference) {
  const auto csv = cbtest::openCityCsv();
  if (!std::filesystem::exists(csv)) {
    const char *allow = std::getenv("CURVEBENCH_ALLOW_MISSING_SHARED");
    if (allow != nullptr && std::string_view(allow) == "1")
      GTEST_SKIP() << "open dataset not found at " << csv;
    FAIL() << "open dataset not found at " << csv
           << "; set CURVEBENCH_ALLOW_MISSING_SHARED=1 to skip";
  }
  cbtest::TempDir dir;
  cb::Property p;
  p.name = "City hotel (open data)";
  p.capacity = 400;
  auto store = cb::Store::create(dir / "open.curvebench", p);
  cb::ImportOptions opt;
  opt.profile = "hotel-bookings-open-data";
  ASSERT_TRUE(cb::importReservations(*store, csv, opt).written);
  const std::vector<Reservation> rows = store->reservations();
  CurveCube cube = CurveCube::build(
      rows, CubeOptions{d("2015-07-01"), d("2017-08-31"), 120, SeriesBy::Total, std::nullopt});
  auto add = cb::makeMethod("pickup-add"); // defaults: brief section 5's classical pickup

  // tests/reference/pickup_open_city.csv: classical additive pickup (8 most recent same-weekday
  // nights r ≤ t), total, computed from the raw CSV with pandas by
  // tests/reference/pickup_open_city.py (its own date derivations; no Curvebench code involved).
  std::istringstream in(
      cbtest::readFile(cbtest::sourceDir() / "tests" / "reference" / "pickup_open_city.csv"));
  std::string line;
  while (std::getline(in, line) && !line.empty() && line[0] == '#') {
  }
  ASSERT_EQ(line, "reading_date,h,stay_date,otb,references,mean_pickup,forecast");
  int checked = 0;
  while (std::getline(in, line)) {
    std::vector<std::string> f;
    std::stringstream ls(line);
    for (std::string cell; std::getline(ls, cell, ',');)
      f.push_back(cell);
    ASSERT_EQ(f.size(), 7u) << line;
    const Date t = d(f[0].c_str());
    const Date s = d(f[2].c_str());
    ASSERT_EQ(s - t, std::stoi(f[1]));
    ForecastContext ctx(cube, 0, t, p);
    add->fit(ctx);
    EXPECT_EQ(ctx.otbNow(s), std::stoi(f[3])) << line;
    auto got = add->forecast(ctx, s);
    ASSERT_TRUE(got) << line;
    EXPECT_NEAR(*got, std::stod(f[6]), 1e-9) << line;
    ++checked;
  }
  EXPECT_EQ(checked, 28); // 4 reading dates × 7 leads
}

TEST(PickupMethods, UnconstrainedHistoryReplacesTheFinalsMethodsLearnFrom) {
  CurveCube cube = handCube();
  // The history a method learns from, index 0 = 05-23: the observed finals, except C (06-06,
  // observed 6) as if its demand had been 9, and one value past the reading date (06-10) that
  // must stay unreachable.
  std::vector<double> history;
  for (Date s = d("2026-05-23"); s <= d("2026-06-12"); ++s)
    history.push_back(static_cast<double>(cube.final(0, s).value_or(0)));
  history[static_cast<std::size_t>(d("2026-06-06") - d("2026-05-23"))] = 9;
  ForecastContext ctx(cube, 0, d("2026-06-08"), property());
  ctx.useHistory(&history);
  EXPECT_EQ(*ctx.final(d("2026-06-06")), 9.0);
  EXPECT_EQ(*ctx.observedFinal(d("2026-06-06")), 6);
  EXPECT_FALSE(ctx.final(d("2026-06-10"))); // after the reading date, whatever the vector holds
  EXPECT_EQ(ctx.finals()[14], 9.0);
  auto m = cb::makePickupMethod("pickup-add", refs(2));
  m->fit(ctx);
  // E as of t, h = 12, N = 2 (as AdditiveByHand): C 9 − 1 = 8, B 4 − 2 = 2; F = 4 + 5 = 9.
  EXPECT_NEAR(*m->forecast(ctx, d("2026-06-20")), 9.0, kTol);
  // A night already arrived still reports what was observed.
  EXPECT_EQ(*m->forecast(ctx, d("2026-06-06")), 6.0);
  ctx.useHistory(nullptr);
  EXPECT_NEAR(*m->forecast(ctx, d("2026-06-20")), 7.5, kTol);
}
