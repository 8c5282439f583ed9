// End-to-end runs of `curvebench overbook`: the published examples of check-values.md §7 given on
// the command line, and the store form on a tiny hand-made store whose measured figures are
// worked out in the comments (core/overbooking.h defines them).
#include "testsupport.h"

#include "core/advice.h"
#include "core/store.h"

namespace {

using cbtest::CliRun;

CliRun run(const std::string &args, const cbtest::TempDir &dir) {
  return cbtest::runCli(CURVEBENCH_CLI, args, dir / "stderr.txt");
}

std::string q(const std::filesystem::path &p) { return cbtest::quotePath(p); }

bool has(const std::string &text, const std::string &needle) {
  return text.find(needle) != std::string::npos;
}

/// One night (arrival + 1) of `rooms` rooms at `rate`; cancelled on `cancelled` when given.
cb::Reservation row(const char *id, const char *booked, const char *arr, int rooms,
                    cb::ReservationStatus status, double rate, const char *cancelled = nullptr) {
  cb::Reservation r = cbtest::makeReservation(id, booked, arr, arr, rooms, "TRN", cancelled);
  r.departure = r.arrival + 1;
  if (!cancelled)
    r.status = status;
  r.rate = rate;
  return r;
}

/// 20 rooms. Target night Tue 2026-03-24; the newest activity is a booking on Fri 03-20, the
/// default reading date. Similar nights with data: Tue 03-17 and Tue 03-10 (late = cancelled 2
/// days or fewer before arrival, so the base is read 3 days out).
class CliOverbook : public ::testing::Test {
protected:
  void make(double walkCost) {
    cb::Property p;
    p.name = "Tiny";
    p.capacity = 20;
    p.settings.walkCost = walkCost;
    auto store = cb::Store::create(store_, p);
    cb::Store::Transaction tx(*store);
    using S = cb::ReservationStatus;
    // 03-17: base 4 + 1 + 1 = 6; lost: A2 no-show 1, A3 late cancellation 1 → 2.
    store->upsertReservation(row("A1", "2026-03-01", "2026-03-17", 4, S::CheckedOut, 100), 0);
    store->upsertReservation(row("A2", "2026-03-02", "2026-03-17", 1, S::NoShow, 100), 0);
    store->upsertReservation(
        row("A3", "2026-03-05", "2026-03-17", 1, S::Cancelled, 100, "2026-03-16"), 0);
    // 03-10: base 5 + 1 = 6; lost: B2 no-show 1.
    store->upsertReservation(row("B1", "2026-02-20", "2026-03-10", 5, S::CheckedOut, 130), 0);
    store->upsertReservation(row("B2", "2026-02-25", "2026-03-10", 1, S::NoShow, 130), 0);
    // The target night itself, booked on the reading date.
    store->upsertReservation(row("C1", "2026-03-20", "2026-03-24", 3, S::Booked, 120), 0);
    tx.commit();
  }
  cbtest::TempDir dir_;
  std::filesystem::path store_ = dir_ / "t.curvebench";
};

} // namespace

TEST(CliOverbookInputs, PoissonHotelExampleGivesSeven) {
  // check-values.md §7b, Cachon & Terwiesch 118-room hotel example (confirmed-in-source):
  // no-shows Poisson 8.5, Cu 159, Co 350 → CR 0.312377, Y* = 7, accept 118 + 7; F(6) = 0.256178
  // (published 25.62 %), F(7) = 0.385597 (computed).
  cbtest::TempDir dir;
  const CliRun r = run("overbook --capacity 118 --room-value 159 --walk-cost 350 --dist poisson "
                       "--no-show-mean 8.5",
                       dir);
  ASSERT_EQ(r.code, 0) << r.err;
  EXPECT_TRUE(has(r.out, "critical_ratio: 0.312377\n")) << r.out;
  EXPECT_TRUE(has(r.out, "p_no_shows_at_most_extra: 0.385597\n")) << r.out;
  EXPECT_TRUE(has(r.out, "p_no_shows_below_extra: 0.256178\n")) << r.out;
  EXPECT_TRUE(has(r.out, "extra_reservations: 7\n")) << r.out;
  EXPECT_TRUE(has(r.out, "reservations_to_accept: 125\n")) << r.out;
  EXPECT_TRUE(has(r.out, std::string(cb::kOverbookingCaution))) << r.out;
}

TEST(CliOverbookInputs, NormalAndServiceLevel) {
  cbtest::TempDir dir;
  // check-values.md §7a (confirmed-in-source, secondary copies): N(5, 3), Cu 80, Co 200 →
  // 3.302154 (computed); whole rooms are that rounded down (core/overbooking.h): 3.
  CliRun r = run("overbook --capacity 100 --room-value 80 --walk-cost 200 --dist normal "
                 "--no-show-mean 5 --no-show-sd 3",
                 dir);
  ASSERT_EQ(r.code, 0) << r.err;
  EXPECT_TRUE(has(r.out, "overbook_continuous: 3.302154\n")) << r.out;
  EXPECT_TRUE(has(r.out, "extra_reservations: 3\n")) << r.out;
  EXPECT_TRUE(has(r.out, std::string(cb::kOverbookingCaution))) << r.out;
  // check-values.md §7c (statements confirmed; answers computed, exact binomial): 300 rooms,
  // no-show 0.15, level 0.95 → 341 reservations, P = 0.950271.
  r = run("overbook --capacity 300 --dist binomial --no-show-rate 0.15 --service-level 0.95", dir);
  ASSERT_EQ(r.code, 0) << r.err;
  EXPECT_TRUE(has(r.out, "p_shows_within_capacity: 0.950271\n")) << r.out;
  EXPECT_TRUE(has(r.out, "reservations_to_accept: 341\n")) << r.out;
  EXPECT_TRUE(has(r.out, std::string(cb::kOverbookingCaution))) << r.out;
}

TEST(CliOverbookInputs, UsageErrors) {
  cbtest::TempDir dir;
  // No walk cost.
  CliRun r = run("overbook --capacity 118 --room-value 159 --dist poisson --no-show-mean 8.5", dir);
  EXPECT_EQ(r.code, 2);
  EXPECT_TRUE(has(r.err, "--walk-cost")) << r.err;
  EXPECT_TRUE(r.out.empty()) << r.out;
  // Normal without its sd; service level with a non-binomial distribution; no capacity.
  r = run("overbook --capacity 118 --room-value 80 --walk-cost 200 --dist normal "
          "--no-show-mean 5",
          dir);
  EXPECT_EQ(r.code, 2);
  EXPECT_TRUE(has(r.err, "--no-show-sd")) << r.err;
  r = run("overbook --capacity 300 --dist poisson --no-show-mean 8 --service-level 0.95", dir);
  EXPECT_EQ(r.code, 2);
  r = run("overbook --room-value 159 --walk-cost 350 --dist poisson --no-show-mean 8.5", dir);
  EXPECT_EQ(r.code, 2);
  r = run("overbook --capacity 118 --room-value 159 --walk-cost 0 --dist poisson "
          "--no-show-mean 8.5",
          dir);
  EXPECT_EQ(r.code, 2);
}

TEST_F(CliOverbook, MeasuredFromTheStore) {
  make(300);
  // Lost per night {2, 1}: mean 1.5, sd √0.5 = 0.7071, rate 3/12 = 0.25; no-shows (1 + 1)/2 = 1,
  // late (1 + 0)/2 = 0.5. ADR of the stays: (4 × 100 + 5 × 130)/9 = 116.67. Walk cost 300 (the
  // property's setting): CR = 116.67/416.67 = 0.28 exactly.
  // Poisson mean 1.5: F(0) = e^−1.5 = 0.223130 < 0.28 ≤ F(1) = 2.5·e^−1.5 = 0.557825 → 1 extra.
  CliRun r = run("overbook " + q(store_) + " --night 2026-03-24 --dist poisson", dir_);
  ASSERT_EQ(r.code, 0) << r.err;
  EXPECT_TRUE(has(r.out, "as_of: 2026-03-20\n")) << r.out;
  EXPECT_TRUE(has(r.out, "similar_nights: 2\n")) << r.out;
  EXPECT_TRUE(has(r.out, "no_shows_per_night: 1.0000\n")) << r.out;
  EXPECT_TRUE(has(r.out, "late_cancellations_per_night: 0.5000\n")) << r.out;
  EXPECT_TRUE(has(r.out, "lost_per_night_mean: 1.5000\n")) << r.out;
  EXPECT_TRUE(has(r.out, "lost_per_night_sd: 0.7071\n")) << r.out;
  EXPECT_TRUE(has(r.out, "lost_rate: 0.250000\n")) << r.out;
  EXPECT_TRUE(has(r.out, "room_value: 116.67")) << r.out;
  EXPECT_TRUE(has(r.out, "walk_cost: 300.00 (property setting)")) << r.out;
  EXPECT_TRUE(has(r.out, "critical_ratio: 0.280000\n")) << r.out;
  EXPECT_TRUE(has(r.out, "p_no_shows_below_extra: 0.223130\n")) << r.out;
  EXPECT_TRUE(has(r.out, "p_no_shows_at_most_extra: 0.557825\n")) << r.out;
  EXPECT_TRUE(has(r.out, "extra_reservations: 1\n")) << r.out;
  EXPECT_TRUE(has(r.out, "reservations_to_accept: 21\n")) << r.out;
  EXPECT_TRUE(has(r.out, std::string(cb::kOverbookingCaution))) << r.out;

  // Default binomial, each of the 20 + Y reservations lost with probability 0.25: exact sums
  // (Python fractions and math.comb, by the definition) give P(no-shows ≤ 4 | 24) = 0.246648 <
  // 0.28 ≤ P(no-shows ≤ 5 | 25) = 0.378279 → 5 extra.
  r = run("overbook " + q(store_) + " --night 2026-03-24", dir_);
  ASSERT_EQ(r.code, 0) << r.err;
  EXPECT_TRUE(has(r.out, "distribution: binomial\n")) << r.out;
  EXPECT_TRUE(has(r.out, "p_no_shows_at_most_extra: 0.378279\n")) << r.out;
  EXPECT_TRUE(has(r.out, "extra_reservations: 5\n")) << r.out;
  EXPECT_TRUE(has(r.out, "reservations_to_accept: 25\n")) << r.out;

  // --walk-cost overrides the setting: Co = 50 gives CR = (1050/9)/(1500/9) = 0.7, and Poisson
  // F(1) = 0.557825 < 0.7 ≤ F(2) = 3.625·e^−1.5 = 0.808847 → 2 extra.
  r = run("overbook " + q(store_) + " --night 2026-03-24 --dist poisson --walk-cost 50", dir_);
  ASSERT_EQ(r.code, 0) << r.err;
  EXPECT_TRUE(has(r.out, "walk_cost: 50.00 (--walk-cost)")) << r.out;
  EXPECT_TRUE(has(r.out, "critical_ratio: 0.700000\n")) << r.out;
  EXPECT_TRUE(has(r.out, "p_no_shows_at_most_extra: 0.808847\n")) << r.out;
  EXPECT_TRUE(has(r.out, "extra_reservations: 2\n")) << r.out;
}

TEST_F(CliOverbook, StoreWithoutWalkCostIsAUsageError) {
  make(0);
  CliRun r = run("overbook " + q(store_) + " --night 2026-03-24", dir_);
  EXPECT_EQ(r.code, 2);
  EXPECT_TRUE(has(r.err, "no walk cost")) << r.err;
  EXPECT_TRUE(has(r.err, "--walk-cost")) << r.err;
  EXPECT_TRUE(r.out.empty()) << r.out;
  // Given on the command line, it runs.
  r = run("overbook " + q(store_) + " --night 2026-03-24 --walk-cost 300", dir_);
  EXPECT_EQ(r.code, 0) << r.err;
  // A reading date before any similar night with data: nothing to measure.
  r = run("overbook " + q(store_) + " --night 2026-03-24 --walk-cost 300 --as-of 2026-02-01", dir_);
  EXPECT_EQ(r.code, 2);
  EXPECT_TRUE(has(r.err, "cannot be measured")) << r.err;
  // Command-line figures do not mix with the measuring form.
  r = run("overbook " + q(store_) + " --night 2026-03-24 --walk-cost 300 --capacity 50", dir_);
  EXPECT_EQ(r.code, 2);
}
