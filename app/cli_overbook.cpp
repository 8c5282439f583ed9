// The overbook verb: how many reservations beyond capacity to accept (critical fractile, brief
// section 6), from figures given on the command line or from the no-shows and late
// cancellations measured on similar nights in a store. Always printed with the overbooking
// caution of core/advice.h.
#include "app/cliverbs.h"

#include "core/advice.h"
#include "core/demandmath.h"
#include "core/overbooking.h"
#include "core/store.h"

#include <fmt/format.h>

#include <cmath>
#include <cstdio>
#include <memory>
#include <stdexcept>

namespace cbcli {
namespace {

struct OverbookArgs {
  std::string store, night, asOf, dist;
  int capacity = 0, weeks = 12;
  double roomValue = 0, walkCost = 0, noShowMean = 0, noShowSd = 0, noShowRate = 0;
  double serviceLevel = 0;
  // Which options were given (CLI11 options, set when the verb is registered).
  CLI::Option *capacityOpt = nullptr, *roomValueOpt = nullptr, *walkCostOpt = nullptr;
  CLI::Option *meanOpt = nullptr, *sdOpt = nullptr, *rateOpt = nullptr, *levelOpt = nullptr;
  CLI::Option *nightOpt = nullptr, *asOfOpt = nullptr, *distOpt = nullptr, *weeksOpt = nullptr;
};

/// A usage error: the message on stderr, exit code 2.
int usage(const std::string &message) {
  fmt::print(stderr, "curvebench overbook: {}\n", message);
  return kUsageOrIo;
}

void line(fmt::memory_buffer &out, const char *key, const std::string &value) {
  fmt::format_to(std::back_inserter(out), "{}: {}\n", key, value);
}
std::string ratio(double x) { return fmt::format("{:.6f}", x); }
std::string money(double x) { return fmt::format("{:.2f}", x); }

/// The no-shows a model stands for and its figures; filled from the command line or measured.
struct NoShowModel {
  std::string dist;
  double mean = 0, sd = 0, rate = 0;
};

/// The recommendation lines (critical ratio onwards) and the caution.
void recommend(fmt::memory_buffer &out, int capacity, const NoShowModel &m,
               const cb::OverbookingCosts &costs, std::optional<double> serviceLevel) {
  line(out, "capacity", std::to_string(capacity));
  line(out, "distribution", m.dist);
  if (m.dist == "binomial") {
    line(out, "no_show_rate", ratio(m.rate));
  } else {
    line(out, "no_show_mean", fmt::format("{:.4f}", m.mean));
    if (m.dist == "normal")
      line(out, "no_show_sd", fmt::format("{:.4f}", m.sd));
  }
  if (serviceLevel) { // largest n with P(shows ≤ capacity) ≥ level
    const double show = 1.0 - m.rate;
    const int n = cb::maxReservationsForServiceLevel(capacity, show, *serviceLevel);
    line(out, "rule", "service level");
    line(out, "service_level", ratio(*serviceLevel));
    line(out, "p_shows_within_capacity", ratio(cb::binomialCdf(capacity, n, show)));
    line(out, "extra_reservations", std::to_string(n - capacity));
    line(out, "reservations_to_accept", std::to_string(n));
    return;
  }
  const double cr = cb::criticalRatio(costs);
  line(out, "rule", "critical fractile");
  line(out, "critical_ratio", ratio(cr));
  int extra = 0;
  if (m.dist == "normal") {
    const double y = cb::overbookNormal(m.mean, m.sd, costs);
    line(out, "overbook_continuous", fmt::format("{:.6f}", y));
    // Rooms come whole: the continuous level rounded down, never below 0 (core/overbooking.h).
    extra = std::max(0, static_cast<int>(std::floor(y)));
  } else if (m.dist == "poisson") {
    extra = cb::overbookPoisson(m.mean, costs);
    line(out, "p_no_shows_at_most_extra", ratio(cb::poissonCdf(extra, m.mean)));
    line(out, "p_no_shows_below_extra", ratio(cb::poissonCdf(extra - 1, m.mean)));
  } else {
    extra = cb::overbookBinomial(capacity, m.rate, costs);
    line(out, "p_no_shows_at_most_extra", ratio(cb::binomialCdf(extra, capacity + extra, m.rate)));
  }
  line(out, "extra_reservations", std::to_string(extra));
  line(out, "reservations_to_accept", std::to_string(capacity + extra));
}

void finish(fmt::memory_buffer &out) {
  fmt::format_to(std::back_inserter(out), "\n{}\n", cb::kOverbookingCaution);
  std::fwrite(out.data(), 1, out.size(), stdout);
  if (std::fflush(stdout) != 0)
    throw std::runtime_error("cannot write standard output");
}

int runInputs(const OverbookArgs &a) {
  for (CLI::Option *o : {a.nightOpt, a.asOfOpt, a.weeksOpt})
    if (o->count() > 0)
      return usage(o->get_name() + " needs a STORE (the form that measures no-shows)");
  if (a.capacityOpt->count() == 0 || a.distOpt->count() == 0)
    return usage("give --capacity and --dist with the no-show figures, or a STORE and --night");
  const bool byLevel = a.levelOpt->count() > 0;
  if (byLevel && a.dist != "binomial")
    return usage("--service-level is the binomial form: use --dist binomial --no-show-rate R");
  if (!byLevel && (a.roomValueOpt->count() == 0 || a.walkCostOpt->count() == 0))
    return usage("give --room-value (revenue lost by an empty room) and --walk-cost (cost of "
                 "walking a guest)");
  NoShowModel m;
  m.dist = a.dist;
  if (a.dist == "binomial") {
    if (a.rateOpt->count() == 0)
      return usage("--dist binomial needs --no-show-rate (0 to below 1)");
    if (a.noShowRate >= 1.0)
      return usage("--no-show-rate must be below 1");
    m.rate = a.noShowRate;
  } else {
    if (a.meanOpt->count() == 0)
      return usage("--dist " + a.dist + " needs --no-show-mean");
    if (a.dist == "normal" && a.sdOpt->count() == 0)
      return usage("--dist normal needs --no-show-sd");
    m.mean = a.noShowMean;
    m.sd = a.noShowSd;
  }
  fmt::memory_buffer out;
  if (a.roomValueOpt->count() > 0)
    line(out, "room_value", money(a.roomValue));
  if (a.walkCostOpt->count() > 0)
    line(out, "walk_cost", money(a.walkCost));
  recommend(out, a.capacity, m, {a.roomValue, a.walkCost},
            byLevel ? std::optional<double>(a.serviceLevel) : std::nullopt);
  finish(out);
  return kOk;
}

int runStore(const OverbookArgs &a) {
  for (CLI::Option *o : {a.capacityOpt, a.roomValueOpt, a.meanOpt, a.sdOpt, a.rateOpt, a.levelOpt})
    if (o->count() > 0)
      return usage(o->get_name() + " is for the form without a STORE; with a store the figures "
                                   "are measured");
  if (a.nightOpt->count() == 0)
    return usage("give --night DATE: the night to decide for");
  auto store = cb::Store::open(a.store);
  const cb::Property property = store->property();
  const cb::Date night = *cb::Date::parseIso(a.night);
  cb::Date asOf;
  if (a.asOfOpt->count() > 0) {
    asOf = *cb::Date::parseIso(a.asOf);
  } else {
    const std::optional<cb::Date> last = store->summary().lastActivity;
    if (!last)
      return usage(a.store + " has no reservations, so there is nothing to measure");
    asOf = *last;
  }
  const double walkCost = a.walkCostOpt->count() > 0 ? a.walkCost : property.settings.walkCost;
  if (!(walkCost > 0))
    return usage("no walk cost: give --walk-cost X (the cost of walking a guest, in " +
                 property.currency + ") or set the property's walk cost");
  const int capacity = property.capacityOn(night);
  if (capacity <= 0)
    return usage(fmt::format("the property has no rooms on {}", night.toIso()));

  cb::NoShowOptions no;
  no.weeks = a.weeks;
  no.lateCancelDays = property.settings.lateCancelDays;
  const cb::NoShowMeasure mm = cb::measureNoShows(store->reservations(), night, asOf, no);
  if (mm.nights == 0)
    return usage(fmt::format("no similar night (same weekday, {} weeks up to {}) has reservations "
                             "on the books, so no-shows cannot be measured",
                             a.weeks, asOf.toIso()));
  if (!(mm.adr > 0))
    return usage("the similar nights have no paid stays, so an empty room has no measured value");
  if (a.dist == "binomial" && mm.rate >= 1.0)
    return usage("every reservation of the similar nights was lost: no binomial answer");

  fmt::memory_buffer out;
  line(out, "night", night.toIso());
  line(out, "as_of", asOf.toIso());
  line(out, "similar_nights", std::to_string(mm.nights));
  line(out, "late_cancel_days", std::to_string(no.lateCancelDays));
  line(out, "no_shows_per_night", fmt::format("{:.4f}", mm.noShowMean));
  line(out, "late_cancellations_per_night", fmt::format("{:.4f}", mm.lateCancelMean));
  line(out, "lost_per_night_mean", fmt::format("{:.4f}", mm.mean));
  line(out, "lost_per_night_sd", fmt::format("{:.4f}", mm.sd));
  line(out, "lost_rate", ratio(mm.rate));
  line(out, "room_value", money(mm.adr) + " (measured ADR of the similar nights)");
  line(out, "walk_cost",
       money(walkCost) + (a.walkCostOpt->count() > 0 ? " (--walk-cost)" : " (property setting)"));
  const NoShowModel m{a.dist, mm.mean, mm.sd, mm.rate};
  recommend(out, capacity, m, {mm.adr, walkCost}, std::nullopt);
  finish(out);
  return kOk;
}

} // namespace

void addOverbookVerbs(CLI::App &app, VerbList &verbs) {
  auto a = std::make_shared<OverbookArgs>();
  auto *ob = app.add_subcommand(
      "overbook",
      "How many reservations beyond capacity to accept: the smallest Y with P(no-shows <= Y) >= "
      "Cu/(Cu+Co), Cu the value of an empty room, Co the cost of walking a guest (critical "
      "fractile). Two forms:\n"
      "  overbook --capacity 118 --room-value 159 --walk-cost 350 --dist poisson "
      "--no-show-mean 8.5\n"
      "  overbook STORE --night DATE [--as-of DATE] [--walk-cost X] [--dist D] [--weeks 12]\n"
      "The store form measures no-shows and late cancellations (cancelled within the property's "
      "late-cancel days) of the same weekday over the last weeks; Cu is their measured ADR.");
  ob->footer(std::string(cb::kOverbookingCaution));
  ob->add_option("STORE", a->store, "Store file (the measuring form)")->check(CLI::ExistingFile);
  auto date = CLI::Validator(
      [](std::string &text) {
        return cb::Date::parseIso(text) ? std::string() : "not a date (YYYY-MM-DD): " + text;
      },
      "DATE");
  a->nightOpt =
      ob->add_option("--night", a->night, "Store form: the night to decide for")->check(date);
  a->asOfOpt = ob->add_option("--as-of", a->asOf,
                              "Store form: reading date (default: the newest booking or "
                              "cancellation); similar nights on or before it are measured")
                   ->check(date);
  a->weeksOpt = ob->add_option("--weeks", a->weeks, "Store form: similar nights measured (12)")
                    ->check(CLI::Range(1, 104));
  a->capacityOpt =
      ob->add_option("--capacity", a->capacity, "Rooms of the night")->check(CLI::Range(0, 100000));
  a->roomValueOpt = ob->add_option("--room-value", a->roomValue,
                                   "Cu: revenue lost by a room left empty (e.g. the ADR)")
                        ->check(CLI::PositiveNumber);
  a->walkCostOpt = ob->add_option("--walk-cost", a->walkCost,
                                  "Co: cost of walking a guest (store form: default the "
                                  "property's setting)")
                       ->check(CLI::PositiveNumber);
  a->distOpt = ob->add_option("--dist", a->dist,
                              "No-show distribution: normal (--no-show-mean, --no-show-sd), "
                              "poisson (--no-show-mean) or binomial (--no-show-rate, each "
                              "reservation independently). Store form default: binomial")
                   ->check(CLI::IsMember({"normal", "poisson", "binomial"}));
  a->meanOpt = ob->add_option("--no-show-mean", a->noShowMean, "Mean rooms lost per night")
                   ->check(CLI::NonNegativeNumber);
  a->sdOpt = ob->add_option("--no-show-sd", a->noShowSd, "Standard deviation of rooms lost")
                 ->check(CLI::NonNegativeNumber);
  a->rateOpt = ob->add_option("--no-show-rate", a->noShowRate,
                              "Share of reservations that do not show (0 to below 1)")
                   ->check(CLI::Range(0.0, 1.0));
  a->levelOpt = ob->add_option("--service-level", a->serviceLevel,
                               "Binomial service-level rule instead: the most reservations with "
                               "P(shows <= capacity) >= level (e.g. 0.95)")
                    ->check(CLI::Range(0.0, 1.0));
  verbs.push_back({ob, [a] {
                     if (a->levelOpt->count() > 0 &&
                         !(a->serviceLevel > 0.0 && a->serviceLevel < 1.0))
                       return usage("--service-level must lie strictly between 0 and 1");
                     if (a->store.empty())
                       return runInputs(*a);
                     OverbookArgs s = *a;
                     if (s.dist.empty())
                       s.dist = "binomial";
                     return runStore(s);
                   }});
}

} // namespace cbcli
