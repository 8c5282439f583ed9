// Pickup against figures worked out by hand from the definitions (brief section 4), and the
// identity net = gross − cancelled on the sample property.
#include "core/pickup.h"

#include "core/simulator.h"

#include "testsupport.h"

#include <gtest/gtest.h>

#include <random>
#include <set>

using cb::Date;
using cb::PickupSplit;
using cb::PickupWindow;
using cb::Reservation;
using cbtest::makeReservation;

namespace {

Date d(const char *iso) { return *Date::parseIso(iso); }

// Reading date 2026-06-15; windows 1 d = (06-14, 06-15], 7 d = (06-08, 06-15],
// 15 d = (05-31, 06-15].
std::vector<Reservation> handSet() {
  return {
      makeReservation("a", "2026-05-20", "2026-06-19", "2026-06-22", 2,
                      "CORP"), // before every window
      makeReservation("b", "2026-06-15", "2026-06-20", "2026-06-21", 1,
                      "FLEX"), // booked in all three
      makeReservation("c", "2026-06-10", "2026-06-18", "2026-06-21", 3,
                      "FLEX"), // booked in 7 d and 15 d
      makeReservation("d", "2026-06-01", "2026-06-20", "2026-06-22", 4, "CORP",
                      "2026-06-14"), // 15 d both
      makeReservation("e", "2026-06-09", "2026-06-20", "2026-06-21", 2, "FLEX",
                      "2026-06-15"), // 1 d cancel
      makeReservation("f", "2026-06-15", "2026-06-20", "2026-06-20", 5,
                      "FLEX"), // day use: never counts
      makeReservation("g", "2026-06-12", "2026-06-21", "2026-06-23", 6,
                      ""), // nights 21 and 22 only
      makeReservation("h", "2026-06-14", "2026-06-20", "2026-06-21", 1, "CORP",
                      "2026-06-17"), // cancel later
      makeReservation("i", "2026-06-17", "2026-06-20", "2026-06-21", 7,
                      "CORP"), // booked after the reading
  };
}

int otb(const std::vector<Reservation> &rs, Date s, Date t, const std::string *segment = nullptr) {
  int n = 0;
  for (const auto &r : rs)
    if (r.onBooks(s, t) && (!segment || r.segment == *segment))
      n += r.rooms;
  return n;
}

} // namespace

TEST(Pickup, OneNightByHand) {
  auto rs = handSet();
  const Date s = d("2026-06-20"), t = d("2026-06-15");
  // OTB(s, 06-15) = a 2 + b 1 + c 3 + h 1 = 7; OTB(s, 06-14) = a 2 + c 3 + e 2 + h 1 = 8.
  EXPECT_EQ(otb(rs, s, t), 7);
  EXPECT_EQ(otb(rs, s, t - 1), 8);
  EXPECT_EQ(cb::pickupOf(rs, s, PickupWindow::lastDays(t, 1)), (PickupSplit{-1, 1, 2}));
  // 7 d: gross b 1 + c 3 + e 2 + h 1; cancelled d 4 + e 2; OTB(s, 06-08) = a 2 + d 4 = 6.
  EXPECT_EQ(cb::pickupOf(rs, s, PickupWindow::lastDays(t, 7)), (PickupSplit{1, 7, 6}));
  // 15 d: gross adds d 4; OTB(s, 05-31) = a 2.
  EXPECT_EQ(cb::pickupOf(rs, s, PickupWindow::lastDays(t, 15)), (PickupSplit{5, 11, 6}));
  // By segment, 7 d: CORP = h booked, d cancelled; FLEX = b, c, e booked, e cancelled.
  EXPECT_EQ(cb::pickupOf(rs, s, PickupWindow::lastDays(t, 7), cb::SeriesBy::Segment, "CORP"),
            (PickupSplit{-3, 1, 4}));
  EXPECT_EQ(cb::pickupOf(rs, s, PickupWindow::lastDays(t, 7), cb::SeriesBy::Segment, "FLEX"),
            (PickupSplit{4, 6, 2}));
  // A window reaching past the cancellation of h and the booking of i.
  EXPECT_EQ(cb::pickupOf(rs, s, {t, d("2026-06-17")}), (PickupSplit{6, 7, 1}));
  // The day use f never counts, even on its arrival night.
  EXPECT_EQ(cb::pickupOf({rs[5]}, s, PickupWindow::lastDays(t, 1)), (PickupSplit{}));
  EXPECT_THROW(cb::pickupOf(rs, s, {t, t}), std::invalid_argument);
}

TEST(Pickup, SummaryOfFutureNightsByHand) {
  auto rs = handSet();
  cb::PickupOptions opt;
  opt.asOf = d("2026-06-15");
  opt.by = cb::SeriesBy::Segment;
  auto sum = cb::PickupSummary::build(rs, opt);
  ASSERT_EQ(sum.windows().size(), 3u); // 1, 7, 15 days by default
  EXPECT_EQ(sum.windows()[2], (PickupWindow{d("2026-05-31"), d("2026-06-15")}));
  EXPECT_EQ(sum.series(), (std::vector<std::string>{"ALL", "(none)", "CORP", "FLEX"}));
  // Nights 06-16 … 06-22: g (booked on or before the reading date) is the last to depart.
  EXPECT_EQ(sum.firstNight(), d("2026-06-16"));
  EXPECT_EQ(sum.lastNight(), d("2026-06-22"));

  const std::size_t all = 0, none = 1, corp = 2, flex = 3, w1 = 0, w7 = 1, w15 = 2;
  EXPECT_EQ(sum.at(all, d("2026-06-20"), w1), (PickupSplit{-1, 1, 2}));
  EXPECT_EQ(sum.at(all, d("2026-06-20"), w7), (PickupSplit{1, 7, 6}));
  EXPECT_EQ(sum.at(all, d("2026-06-20"), w15), (PickupSplit{5, 11, 6}));
  EXPECT_EQ(sum.at(corp, d("2026-06-20"), w7), (PickupSplit{-3, 1, 4}));
  EXPECT_EQ(sum.at(flex, d("2026-06-20"), w7), (PickupSplit{4, 6, 2}));
  // 06-21: d cancelled (4), g booked (6). 06-22: g only. 06-18 and 06-19: c booked (3).
  EXPECT_EQ(sum.at(all, d("2026-06-21"), w7), (PickupSplit{2, 6, 4}));
  EXPECT_EQ(sum.at(none, d("2026-06-22"), w7), (PickupSplit{6, 6, 0}));
  EXPECT_EQ(sum.at(all, d("2026-06-18"), w7), (PickupSplit{3, 3, 0}));
  EXPECT_EQ(sum.at(all, d("2026-06-19"), w1), (PickupSplit{}));
  EXPECT_EQ(sum.at(all, d("2026-06-16"), w15), (PickupSplit{}));
  // Over all nights, 7 d: 3 + 3 + (7 − 6) + (6 − 4) + 6.
  EXPECT_EQ(sum.total(all, w7), (PickupSplit{15, 25, 10}));
  EXPECT_THROW((void)sum.at(all, d("2026-06-15"), w7), std::out_of_range); // not a future night
  EXPECT_THROW((void)sum.at(all, d("2026-06-23"), w7), std::out_of_range);
}

TEST(Pickup, CustomWindowsAndRefusals) {
  auto rs = handSet();
  cb::PickupOptions opt;
  opt.asOf = d("2026-06-15");
  opt.windows = {{d("2026-06-09"), d("2026-06-12")}}; // c (06-10) and g (06-12) booked
  opt.lastNight = d("2026-06-30");
  auto sum = cb::PickupSummary::build(rs, opt);
  EXPECT_EQ(sum.nights(), 15);
  EXPECT_EQ(sum.series(), std::vector<std::string>{"ALL"});
  EXPECT_EQ(sum.at(0, d("2026-06-20"), 0), (PickupSplit{3, 3, 0}));
  EXPECT_EQ(sum.at(0, d("2026-06-21"), 0), (PickupSplit{6, 6, 0}));
  EXPECT_EQ(sum.at(0, d("2026-06-30"), 0), (PickupSplit{}));

  opt.windows = {{d("2026-06-10"), d("2026-06-16")}}; // ends after the reading date
  EXPECT_THROW(cb::PickupSummary::build(rs, opt), std::invalid_argument);
  opt.windows = {{d("2026-06-10"), d("2026-06-10")}};
  EXPECT_THROW(cb::PickupSummary::build(rs, opt), std::invalid_argument);
  opt.windows.clear();
  opt.asOf = d("2026-06-18"); // newest activity is 06-17 (h cancelled, i booked)
  try {
    cb::PickupSummary::build(rs, opt);
    FAIL() << "reading date after the data must be refused";
  } catch (const cb::AsOfError &e) {
    EXPECT_NE(std::string(e.what()).find("2026-06-17"), std::string::npos) << e.what();
  }
}

class PickupSample : public ::testing::Test {
protected:
  static void SetUpTestSuite() { sample_ = new cb::SampleProperty(cb::simulateProperty()); }
  static void TearDownTestSuite() {
    delete sample_;
    sample_ = nullptr;
  }
  static cb::SampleProperty *sample_;
};
cb::SampleProperty *PickupSample::sample_ = nullptr;

TEST_F(PickupSample, NetIsGrossLessCancelledOnRandomNightsAndWindows) {
  const auto &rs = sample_->reservations;
  const Date t = sample_->readingDate;
  std::set<std::string> segments;
  for (const auto &r : rs)
    segments.insert(r.segment);
  std::vector<std::string> segs(segments.begin(), segments.end());
  std::mt19937 gen(7);
  auto pick = [&](int n) { return static_cast<int>(gen() % static_cast<unsigned>(n)); };
  int nonZero = 0;
  for (int k = 0; k < 400; ++k) {
    const Date s = t - 400 + pick(700);
    const Date t2 = t - pick(500);
    const Date t1 = t2 - 1 - pick(60);
    const auto p = cb::pickupOf(rs, s, {t1, t2});
    ASSERT_EQ(p.net, p.gross - p.cancelled) << s.toIso() << " " << t1.toIso() << " " << t2.toIso();
    ASSERT_EQ(p.net, otb(rs, s, t2) - otb(rs, s, t1)) << s.toIso();
    nonZero += p.gross != 0 && p.cancelled != 0;
    const std::string &seg = segs[static_cast<std::size_t>(pick(static_cast<int>(segs.size())))];
    const auto q = cb::pickupOf(rs, s, {t1, t2}, cb::SeriesBy::Segment, seg);
    ASSERT_EQ(q.net, q.gross - q.cancelled) << seg;
    ASSERT_EQ(q.net, otb(rs, s, t2, &seg) - otb(rs, s, t1, &seg)) << seg;
  }
  EXPECT_GT(nonZero, 30) << "the sample should exercise bookings and cancellations together";
}

TEST_F(PickupSample, SummaryMatchesOneNightAtATimeAndTotalIsSumOfSeries) {
  const auto &rs = sample_->reservations;
  for (Date asOf : {sample_->readingDate, sample_->readingDate - 200}) {
    for (cb::SeriesBy by : {cb::SeriesBy::Segment, cb::SeriesBy::Channel, cb::SeriesBy::RoomType}) {
      cb::PickupOptions opt;
      opt.asOf = asOf;
      opt.by = by;
      opt.windows = {PickupWindow::lastDays(asOf, 1),
                     PickupWindow::lastDays(asOf, 7),
                     PickupWindow::lastDays(asOf, 15),
                     {asOf - 40, asOf - 12}};
      auto sum = cb::PickupSummary::build(rs, opt);
      ASSERT_GT(sum.nights(), 300);
      ASSERT_GT(sum.series().size(), 2u);
      for (std::size_t w = 0; w < sum.windows().size(); ++w) {
        for (Date s = sum.firstNight(); s <= sum.lastNight(); s = s + 1) {
          PickupSplit parts;
          for (std::size_t i = 1; i < sum.series().size(); ++i)
            parts += sum.at(i, s, w);
          ASSERT_EQ(parts, sum.at(0, s, w)) << s.toIso();
          const auto p = sum.at(0, s, w);
          ASSERT_EQ(p.net, p.gross - p.cancelled);
        }
      }
      // Against the definition-level function on every 11th night, every series and window.
      for (Date s = sum.firstNight(); s <= sum.lastNight(); s = s + 11)
        for (std::size_t w = 0; w < sum.windows().size(); ++w) {
          ASSERT_EQ(sum.at(0, s, w), cb::pickupOf(rs, s, sum.windows()[w])) << s.toIso();
          for (std::size_t i = 1; i < sum.series().size(); ++i) {
            std::string code = sum.series()[i] == "(none)" ? "" : sum.series()[i];
            ASSERT_EQ(sum.at(i, s, w), cb::pickupOf(rs, s, sum.windows()[w], by, code))
                << s.toIso() << " " << code;
          }
        }
    }
  }
}

TEST_F(PickupSample, NothingDatedAfterTheReadingDateChangesIt) {
  const Date t = sample_->readingDate - 150;
  std::vector<Reservation> truncated;
  for (auto r : sample_->reservations) {
    if (r.bookedOn > t)
      continue;
    if (r.cancelledOn && *r.cancelledOn > t) {
      r.cancelledOn.reset();
      r.status = cb::ReservationStatus::Booked;
    }
    truncated.push_back(r);
  }
  ASSERT_LT(truncated.size(), sample_->reservations.size());
  for (cb::SeriesBy by : {cb::SeriesBy::Total, cb::SeriesBy::Segment, cb::SeriesBy::Channel}) {
    cb::PickupOptions opt;
    opt.asOf = t;
    opt.by = by;
    opt.lastNight = t + 365;
    auto full = cb::PickupSummary::build(sample_->reservations, opt);
    auto cut = cb::PickupSummary::build(truncated, opt);
    ASSERT_EQ(full.series(), cut.series());
    for (std::size_t i = 0; i < full.series().size(); ++i)
      for (std::size_t w = 0; w < full.windows().size(); ++w)
        for (Date s = full.firstNight(); s <= full.lastNight(); ++s)
          ASSERT_EQ(full.at(i, s, w), cut.at(i, s, w)) << s.toIso();
  }
}
