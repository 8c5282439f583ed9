// The outlook (brief section 6): demand against capacity per night, ADR and RevPAR, season
// classes and flags, minimum-stay hints, and protection of one night from forecasts by segment.
#include "testsupport.h"

#include "core/demandmath.h"
#include "core/outlook.h"
#include "core/simulator.h"

#include <cmath>

namespace {

cb::Date d(const char *iso) { return *cb::Date::parseIso(iso); }

cb::OutlookNight nightWith(double forecast, double sd, int capacity, int otb = 0,
                           double otbRevenue = 0) {
  cb::OutlookNight n;
  n.forecast = forecast;
  n.sd = sd;
  n.capacity = capacity;
  n.otb = otb;
  n.otbRevenue = otbRevenue;
  return n;
}

} // namespace

TEST(OutlookCapacity, SpillTableOfCheckValues) {
  // check-values.md §3, "Spill / sales" table (computed with scipy, checked by numerical
  // integration); the sell-out probability is 1 − Φ(z) with Φ from the §3 table of L(z).
  struct Row {
    double mu, sigma;
    int c;
    double spill, sales, empty, pFull;
  };
  const Row rows[] = {{100, 20, 100, 7.978846, 92.021154, 7.978846, 0.5},
                      {100, 20, 120, 1.666309, 98.333691, 21.666309, 1 - 0.8413447461},
                      {100, 20, 80, 21.666309, 78.333691, 1.666309, 1 - 0.1586552539}};
  for (const Row &r : rows) {
    cb::OutlookNight n = nightWith(r.mu, r.sigma, r.c);
    cb::fillCapacityFigures(n, 100);
    EXPECT_NEAR(n.spill, r.spill, 1e-6 * r.spill) << r.c;
    EXPECT_NEAR(n.constrained, r.sales, 1e-6 * r.sales) << r.c;
    // The identities: constrained + spill = forecast; empty = C − forecast + spill.
    EXPECT_NEAR(n.constrained + n.spill, n.forecast, 1e-9);
    EXPECT_NEAR(r.c - n.constrained, r.empty, 1e-6 * r.empty) << r.c;
    EXPECT_NEAR(n.pSellout, r.pFull, 1e-9) << r.c;
    EXPECT_NEAR(n.occupancy, r.sales / r.c, 1e-6) << r.c;
  }
  // check-values.md §3 last row (the airline exercise C follow-up, protection level 85).
  cb::OutlookNight n = nightWith(80, 35, 85);
  cb::fillCapacityFigures(n, 100);
  EXPECT_NEAR(n.spill, 11.605217, 1e-6 * 11.605217);
  EXPECT_NEAR(n.constrained, 68.394783, 1e-6 * 68.394783);
}

TEST(OutlookCapacity, AdrAndRevparHandWorked) {
  // forecast 100, sd 20, C 120 → constrained 98.333691 (check-values.md §3). 60 rooms on the
  // books for 6,000 (ADR 100); the 38.333691 rooms still to come at the pickup rate 120:
  // revenue 6,000 + 38.333691 × 120 = 10,600.04290, ADR = 10,600.04290 / 98.333691 = 107.796655,
  // RevPAR = 10,600.04290 / 120 = 88.333691. (Hand-worked from the definition, brief §2.)
  cb::OutlookNight n = nightWith(100, 20, 120, 60, 6000);
  cb::fillCapacityFigures(n, 120);
  EXPECT_NEAR(n.adr, 107.796655, 1e-6);
  EXPECT_NEAR(n.revpar, 88.333691, 1e-6);
  EXPECT_NEAR(n.revpar, n.constrained * n.adr / n.capacity, 1e-9);

  // Fewer rooms expected than on the books (cancellations to come): the ADR of the books.
  cb::OutlookNight w = nightWith(100, 20, 120, 110, 12100);
  cb::fillCapacityFigures(w, 50);
  EXPECT_DOUBLE_EQ(w.adr, 110.0);

  // Capacity 0 (the hotel closed): nothing sells, and no figure is NaN.
  cb::OutlookNight z = nightWith(40, 10, 0);
  cb::fillCapacityFigures(z, 90);
  EXPECT_EQ(z.constrained, 0);
  EXPECT_EQ(z.spill, 40);
  EXPECT_EQ(z.pSellout, 1);
  EXPECT_EQ(z.occupancy, 0);
  EXPECT_EQ(z.revpar, 0);
  EXPECT_EQ(z.adr, 90); // no room at all: the rate the next room would sell at
  EXPECT_FALSE(std::isnan(z.adr));
}

TEST(OutlookClassify, SeasonsAndFlags) {
  // Bands 70 % / 90 %: the defaults, common practice with no single source (reservation.h).
  const cb::SeasonBands bands;
  cb::OutlookOptions o; // sell-out likely ≥ 0.5, weak < 0.5, pace ±20 %
  cb::OutlookNight n = nightWith(90, 5, 100, 40);
  n.pSellout = 0.5;
  n.occupancy = 0.49;
  n.stlyOtb = 50; // (40 − 50) / 50 = −20 %: not beyond 20 %
  cb::classifyNight(n, bands, o);
  EXPECT_EQ(n.season, cb::SeasonClass::Peak); // 90 / 100 = 0.9 ≥ 0.9
  EXPECT_EQ(n.flags, (std::vector<std::string>{"sell-out likely", "weak"}));

  n.forecast = 89.9;
  n.pSellout = 0.49;
  n.occupancy = 0.5;
  n.otb = 39; // −22 %
  cb::classifyNight(n, bands, o);
  EXPECT_EQ(n.season, cb::SeasonClass::Shoulder);
  EXPECT_EQ(n.flags, (std::vector<std::string>{"pace down"}));

  n.forecast = 69.9;
  n.otb = 100; // full; "sell-out likely" would say nothing more
  n.pSellout = 1;
  n.occupancy = 0.95;
  cb::classifyNight(n, bands, o);
  EXPECT_EQ(n.season, cb::SeasonClass::Low);
  EXPECT_EQ(n.flags, (std::vector<std::string>{"full", "pace up"}));

  n.otb = 1;
  n.stlyOtb = 0; // 1 room against none: (1 − 0) / max(0, 1) = 100 %
  n.pSellout = 0;
  cb::classifyNight(n, bands, o);
  EXPECT_EQ(n.flags, (std::vector<std::string>{"pace up"}));
  n.stlyOtb.reset(); // no STLY in the data: no pace flag
  cb::classifyNight(n, bands, o);
  EXPECT_TRUE(n.flags.empty());
}

TEST(OutlookMinStay, PeakBetweenWeakNightsAndRuns) {
  // Hand-made week: Mon weak, Tue peak, Wed and Thu strong, Fri + Sat a run of peaks, Sun weak.
  // Defaults: peak = P(sell-out) ≥ 0.7, weak neighbour = constrained occupancy < 0.75.
  struct In {
    const char *night;
    double pSellout, occupancy;
  };
  const In in[] = {{"2026-11-02", 0.05, 0.60}, {"2026-11-03", 0.80, 0.97},
                   {"2026-11-04", 0.40, 0.90}, {"2026-11-05", 0.75, 0.96},
                   {"2026-11-06", 0.90, 0.99}, {"2026-11-07", 0.95, 0.99},
                   {"2026-11-08", 0.10, 0.50}};
  std::vector<cb::OutlookNight> nights;
  for (const In &i : in) {
    cb::OutlookNight n;
    n.night = d(i.night);
    n.pSellout = i.pSellout;
    n.occupancy = i.occupancy;
    nights.push_back(n);
  }
  const auto hints = cb::findMinStays(nights, cb::OutlookOptions{});
  // Tue: weak Mon before (60 %). Thu: neighbours 90 % and 99 %, no hint. Fri: Thu 96 % and
  // Sat 99 %, inside the run Thu–Sat, no hint. Sat: weak Sun after (50 %).
  ASSERT_EQ(hints.size(), 2U);
  EXPECT_EQ(hints[0].night, d("2026-11-03"));
  EXPECT_EQ(hints[0].minStay, 2);
  EXPECT_DOUBLE_EQ(*hints[0].before, 0.60);
  EXPECT_DOUBLE_EQ(*hints[0].after, 0.90);
  EXPECT_NE(hints[0].evidence.find("previous night 60 %"), std::string::npos) << hints[0].evidence;
  EXPECT_EQ(hints[1].night, d("2026-11-07"));
  EXPECT_DOUBLE_EQ(*hints[1].after, 0.50);
  EXPECT_NE(hints[1].evidence.find("3 peak nights in a row, 2026-11-05 to 2026-11-07"),
            std::string::npos)
      << hints[1].evidence;
  EXPECT_EQ(nights[1].flags, (std::vector<std::string>{"min stay"}));
  EXPECT_TRUE(nights[4].flags.empty());
  EXPECT_EQ(nights[5].flags, (std::vector<std::string>{"min stay"}));

  // The first night of an outlook has no known night before it: only its next night counts.
  std::vector<cb::OutlookNight> edge(nights.begin() + 1, nights.begin() + 3);
  EXPECT_TRUE(cb::findMinStays(edge, cb::OutlookOptions{}).empty());
}

namespace {

/// The steady quarter of testsupport (CORP 2 rooms booked 5 days ahead, LEIS 1 room booked the
/// day before, every night of Jan–Mar 2026) with rates: CORP 100; LEIS 130 for nights before
/// 15 February and 150 from then on.
std::vector<cb::Reservation> pricedQuarter() {
  std::vector<cb::Reservation> rows = cbtest::steadyQuarterRows();
  for (cb::Reservation &r : rows)
    r.rate = r.segment == "CORP" ? 100.0 : (r.arrival < d("2026-02-15") ? 130.0 : 150.0);
  return rows;
}

cb::Property quarterProperty() {
  cb::Property p;
  p.name = "Quarter";
  p.capacity = 5;
  p.capacityChanges = {{d("2026-03-05"), 3, "wing closed"}, {d("2026-03-06"), 5, "reopened"}};
  return p;
}

} // namespace

TEST(Outlook, SteadyQuarterHandWorked) {
  cb::OutlookOptions o;
  o.asOf = d("2026-03-01");
  o.days = 7;
  const cb::Outlook ol =
      cb::computeOutlook(pricedQuarter(), quarterProperty(), cb::CensorSources{}, {}, o);
  ASSERT_FALSE(ol.cancelled);
  ASSERT_EQ(ol.nights.size(), 7U);
  EXPECT_EQ(ol.method, "pickup-adv");
  // Every final is 3, so the pickup forecast is 3 with no backtest error: sd 0, D = 3 for sure.
  // Rate window (28 nights, 02-02 … 03-01): LEIS 13 nights at 130 and 15 at 150, so the LEIS
  // room picked up at leads 2…5 comes at (13 × 130 + 15 × 150) / 28 = 140.714286; at leads ≥ 6
  // all 3 rooms come, (28 × 200 + 3,940) / 84 = 113.571429 per room.
  for (const cb::OutlookNight &n : ol.nights) {
    SCOPED_TRACE(n.night.toIso());
    EXPECT_DOUBLE_EQ(n.forecast, 3.0);
    EXPECT_EQ(n.sd, 0.0);
    EXPECT_NEAR(n.constrained + n.spill, n.forecast, 1e-12); // check-values.md §3 identity
    EXPECT_FALSE(n.stlyOtb.has_value());                     // 2025 is before the data
  }
  const cb::OutlookNight &h1 = ol.nights[0]; // 03-02, lead 1: all 3 rooms on the books
  EXPECT_EQ(h1.otb, 3);
  EXPECT_DOUBLE_EQ(h1.otbRevenue, 350.0);
  EXPECT_NEAR(h1.adr, 350.0 / 3, 1e-9);
  const cb::OutlookNight &h3 = ol.nights[2]; // 03-04, lead 3: CORP only on the books
  EXPECT_EQ(h3.otb, 2);
  EXPECT_NEAR(h3.adr, (200 + 140.714286) / 3, 1e-6); // 113.571429
  EXPECT_NEAR(h3.revpar, 3 * h3.adr / 5, 1e-9);
  EXPECT_NEAR(ol.nights[6].adr, 113.571429, 1e-6); // 03-08, lead 7: nothing on the books yet

  // Capacity 5: occupancy 0.6, low season, no flag. 03-05 has 3 rooms: D = 3 ≥ 3, so it sells
  // out for sure (peak) between two nights at 60 %: a minimum-stay hint.
  EXPECT_EQ(h3.capacity, 5);
  EXPECT_DOUBLE_EQ(h3.occupancy, 0.6);
  EXPECT_EQ(h3.season, cb::SeasonClass::Low);
  EXPECT_TRUE(h3.flags.empty());
  const cb::OutlookNight &peak = ol.nights[3];
  EXPECT_EQ(peak.capacity, 3);
  EXPECT_DOUBLE_EQ(peak.pSellout, 1.0);
  EXPECT_DOUBLE_EQ(peak.spill, 0.0);
  EXPECT_EQ(peak.season, cb::SeasonClass::Peak);
  EXPECT_EQ(peak.flags, (std::vector<std::string>{"sell-out likely", "min stay"}));
  ASSERT_EQ(ol.minStays.size(), 1U);
  EXPECT_EQ(ol.minStays[0].night, d("2026-03-05"));
}

TEST(Outlook, SamplePropertyIdentitiesEveryNight) {
  const cb::SampleProperty s = cb::simulateProperty();
  cb::CensorSources sources;
  sources.denials = s.denials;
  cb::OutlookOptions o;
  o.asOf = s.readingDate;
  o.days = 90;
  const cb::Outlook ol = cb::computeOutlook(s.reservations, s.property, sources, s.events, o);
  ASSERT_EQ(ol.nights.size(), 90U);
  int sellouts = 0, withSd = 0;
  for (const cb::OutlookNight &n : ol.nights) {
    SCOPED_TRACE(n.night.toIso());
    // check-values.md §3: sales + spill = mu; empty = C − mu + spill.
    EXPECT_NEAR(n.constrained + n.spill, n.forecast, 1e-9);
    const cb::CapacityOutcome c = cb::normalAgainstCapacity(n.forecast, n.sd, n.capacity);
    EXPECT_NEAR(c.empty, n.capacity - n.forecast + n.spill, 1e-9);
    EXPECT_LE(n.constrained, n.capacity + 1e-9);
    EXPECT_GE(n.pSellout, 0.0);
    EXPECT_LE(n.pSellout, 1.0);
    EXPECT_NEAR(n.revpar, n.constrained * n.adr / n.capacity, 1e-9);
    EXPECT_GT(n.adr, 0.0);
    sellouts += n.pSellout >= 0.5 ? 1 : 0;
    withSd += n.sd > 0 ? 1 : 0;
  }
  EXPECT_EQ(withSd, 90); // every lead bucket has backtest errors on three years of history
  EXPECT_GT(sellouts, 0) << "the sample has sold-out nights in its first 90 nights";

  // The outlook again with the first one's cube: the cube is read, every figure the same.
  ASSERT_TRUE(ol.cube);
  o.cube = ol.cube;
  const cb::Outlook again = cb::computeOutlook(s.reservations, s.property, sources, s.events, o);
  EXPECT_EQ(again.cube.get(), ol.cube.get());
  ASSERT_EQ(again.nights.size(), ol.nights.size());
  for (std::size_t i = 0; i < ol.nights.size(); ++i) {
    EXPECT_EQ(again.nights[i].night, ol.nights[i].night);
    EXPECT_EQ(again.nights[i].forecast, ol.nights[i].forecast);
    EXPECT_EQ(again.nights[i].constrained, ol.nights[i].constrained);
    EXPECT_EQ(again.nights[i].adr, ol.nights[i].adr);
    EXPECT_EQ(again.nights[i].stlyOtb, ol.nights[i].stlyOtb);
  }
}

TEST(ProtectNight, SteadyQuarterReproducesProtectInputs) {
  // The priced quarter plus a complimentary room (rate 0) booked on the reading date for 03-04.
  std::vector<cb::Reservation> rows = pricedQuarter();
  cb::Reservation comp =
      cbtest::makeReservation("COMP1", "2026-03-01", "2026-03-04", "2026-03-05", 1, "COMP");
  rows.push_back(comp);
  const cb::NightProtection np =
      cb::protectNight(rows, quarterProperty(), cb::CensorSources{}, d("2026-03-01"),
                       d("2026-03-04"), cb::ProtectionMethod::EmsrB, cb::OutlookOptions{});
  // Night 03-04 at lead 3: CORP 2 on the books of a forecast 2 (nothing to come), LEIS 0 of 1
  // (1 to come), COMP 1. Sold = 3 of 5. Rates over the 365 nights up to 03-01 (01-01 … 03-01):
  // CORP 100; LEIS (45 × 130 + 15 × 150) / 60 = 135. COMP has no paid room: left out.
  EXPECT_EQ(np.capacity, 5);
  EXPECT_EQ(np.sold, 3);
  ASSERT_EQ(np.notes.size(), 1U);
  EXPECT_NE(np.notes[0].find("COMP"), std::string::npos) << np.notes[0];
  cb::ProtectionInput in;
  in.capacity = 5;
  in.sold = 3;
  in.classes = {{"CORP", 100, 0, 0}, {"LEIS", 135, 1, 0}};
  const cb::ProtectionResult want = cb::protect(in);
  ASSERT_EQ(np.result.lines.size(), 2U);
  for (std::size_t i = 0; i < 2; ++i) {
    SCOPED_TRACE(i);
    EXPECT_EQ(np.result.lines[i].demand.code, want.lines[i].demand.code);
    EXPECT_NEAR(np.result.lines[i].demand.rate, want.lines[i].demand.rate, 1e-9);
    EXPECT_NEAR(np.result.lines[i].demand.mean, want.lines[i].demand.mean, 1e-9);
    EXPECT_NEAR(np.result.lines[i].demand.sd, 0.0, 1e-12);
    EXPECT_EQ(np.result.lines[i].bookingLimit, want.lines[i].bookingLimit);
  }
  // LEIS first: 1 room protected (certain demand of 1); 2 remain, so CORP may sell 1.
  EXPECT_EQ(np.result.lines[0].demand.code, "LEIS");
  EXPECT_EQ(np.result.lines[0].bookingLimit, 2);
  EXPECT_EQ(np.result.lines[1].bookingLimit, 1);
  EXPECT_EQ(np.segmentOtb, (std::vector<int>{0, 2}));

  EXPECT_THROW(cb::protectNight(rows, quarterProperty(), cb::CensorSources{}, d("2026-03-01"),
                                d("2026-03-01"), cb::ProtectionMethod::EmsrB, {}),
               std::invalid_argument);
}
