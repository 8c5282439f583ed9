// The Harbour Quillon Hotel in the harbour town of Ostvale: an invented property whose
// reservation history is drawn from a documented demand model (see sample_property/README.md).
#include "core/simulator.h"

#include "core/nativeformat.h"
#include "core/rng.h"

#include <fmt/format.h>
#include <nlohmann/json.hpp>

#include <algorithm>
#include <array>
#include <cmath>
#include <fstream>
#include <optional>
#include <sstream>
#include <stdexcept>
#include <tuple>

namespace cb {
namespace {

// ---------------------------------------------------------------------------------------------
// The scenario. Every number here is an invented modelling choice, tuned so the history looks
// like a busy city-and-leisure hotel (about three quarters full, peak weekends sold out).

constexpr std::size_t kTypes = 4;
constexpr std::array<const char *, kTypes> kTypeCodes{"STD", "SUP", "FAM", "STE"};
constexpr std::array<const char *, kTypes> kTypeNames{"Standard", "Superior", "Family", "Suite"};
constexpr std::array<int, kTypes> kTypeRooms{88, 40, 14, 8}; // STD takes the rest of capacity
constexpr std::array<double, kTypes> kTypeBaseRate{112.0, 142.0, 168.0, 265.0}; // EUR, 2023
constexpr std::size_t kStd = 0;
constexpr std::size_t kSup = 1;
constexpr int kRefurbishedRooms = 12; // superior rooms closed in early 2025

// The sample's five segments come first; the extended set (SegmentSet::Extended) adds three.
enum SegmentIndex : std::size_t { Flex, Corp, Adv, Grp, Whl, Pkg, Gov, Crew, kSegments };
constexpr std::size_t kSampleSegments = 5; // Flex … Whl
constexpr std::array<const char *, kSegments> kSegCodes{"FLEX", "CORP", "ADV", "GRP",
                                                        "WHL",  "PKG",  "GOV", "CREW"};
constexpr std::array<const char *, kSegments> kSegNames{"Flexible retail",
                                                        "Corporate negotiated",
                                                        "Advance purchase",
                                                        "Groups",
                                                        "Wholesale and tour operators",
                                                        "Leisure packages",
                                                        "Government and public sector",
                                                        "Crew contracts"};
// Okabe & Ito (2008) colour-blind-safe palette; yellow is left out because it fades on white.
// That leaves seven colours for eight segments: crew contracts get none (the workbench picks).
constexpr std::array<const char *, kSegments> kSegColours{
    "#0072B2", "#E69F00", "#009E73", "#CC79A7", "#56B4E9", "#D55E00", "#000000", ""};
/// Yield rank (1 = highest-paying) in the extended set; the sample ranks in index order.
constexpr std::array<int, kSegments> kExtendedRank{1, 3, 4, 5, 7, 2, 6, 8};

enum ChannelIndex : std::size_t { Web, Voice, Ota, Gds, Tour, kChannels };
constexpr std::array<const char *, kChannels> kChannelCodes{"WEB", "VOICE", "OTA", "GDS", "TOUR"};
constexpr std::array<const char *, kChannels> kChannelNames{
    "Hotel website", "Phone and email", "Online travel agencies", "Global distribution systems",
    "Tour operator contracts"};

enum class Season { Low, Shoulder, Peak };

Season seasonOf(Date s) {
  const unsigned m = s.month(), d = s.day();
  if ((m == 6 && d >= 15) || m == 7 || m == 8)
    return Season::Peak;
  if ((m >= 4 && m <= 6) || m == 9 || m == 10 || (m == 12 && d <= 22))
    return Season::Shoulder;
  return Season::Low;
}

std::size_t seasonIndex(Date s) { return static_cast<std::size_t>(seasonOf(s)); }

enum class RateRule {
  Dynamic,    // season × weekend × event × occupancy on the books when booked
  Negotiated, // one yearly corporate rate, flat over the year
  Contract,   // tour operator contract: season only
};

/// Demand of one segment booking individually (groups are modelled apart).
struct IndividualModel {
  SegmentIndex seg;
  double arrivalsPerDay;         // mean requests per arrival date before the factors below
  std::array<double, 7> weekday; // by arrival weekday Mon … Sun (normalised to mean 1)
  std::array<double, 3> season;  // Low, Shoulder, Peak
  double dispersion;             // negative-binomial shape: smaller = noisier days
  double minLead;                // days; advance purchase needs 14
  double shortLeadMean, longLeadMean, longLeadShare; // booking window: two exponentials
  bool leisure;                                      // books earlier for peak and event nights
  std::array<double, 7> los;                         // 1 … 7 nights
  std::array<double, 3> rooms;                       // 1 … 3 rooms
  std::array<double, kTypes> types;
  std::array<double, kChannels> channels;
  double cancelShare, noShowShare;
  RateRule rateRule;
  double rateFactor; // relative to the retail rate of the same rule
};

/// The sample's individual segments (all but groups).
const std::array<IndividualModel, 4> &individualModels() {
  // clang-format off
  static const std::array<IndividualModel, 4> models{{
      {.seg = Flex, .arrivalsPerDay = 20.0,
       .weekday = {0.7, 0.7, 0.8, 1.0, 1.6, 1.3, 0.6}, .season = {0.85, 1.0, 1.15},
       .dispersion = 6.0, .minLead = 0.0, .shortLeadMean = 7.0, .longLeadMean = 45.0,
       .longLeadShare = 0.35, .leisure = true,
       .los = {0.42, 0.30, 0.14, 0.08, 0.03, 0.02, 0.01}, .rooms = {0.9, 0.1, 0.0},
       .types = {0.55, 0.30, 0.08, 0.07}, .channels = {0.45, 0.12, 0.35, 0.08, 0.0},
       .cancelShare = 0.24, .noShowShare = 0.03, .rateRule = RateRule::Dynamic, .rateFactor = 1.0},
      {.seg = Corp, .arrivalsPerDay = 14.0,
       .weekday = {1.6, 1.4, 1.15, 0.6, 0.2, 0.1, 1.0}, .season = {1.0, 1.05, 0.75},
       .dispersion = 8.0, .minLead = 0.0, .shortLeadMean = 6.0, .longLeadMean = 25.0,
       .longLeadShare = 0.2, .leisure = false,
       .los = {0.45, 0.30, 0.17, 0.06, 0.02, 0.0, 0.0}, .rooms = {0.95, 0.05, 0.0},
       .types = {0.72, 0.23, 0.0, 0.05}, .channels = {0.22, 0.30, 0.0, 0.48, 0.0},
       .cancelShare = 0.16, .noShowShare = 0.04, .rateRule = RateRule::Negotiated, .rateFactor = 0.9},
      {.seg = Adv, .arrivalsPerDay = 9.0,
       .weekday = {0.85, 0.85, 0.9, 1.0, 1.4, 1.2, 0.8}, .season = {0.85, 1.0, 1.15},
       .dispersion = 6.0, .minLead = 14.0, .shortLeadMean = 25.0, .longLeadMean = 80.0,
       .longLeadShare = 0.35, .leisure = true,
       .los = {0.30, 0.30, 0.20, 0.10, 0.05, 0.03, 0.02}, .rooms = {0.85, 0.15, 0.0},
       .types = {0.60, 0.25, 0.12, 0.03}, .channels = {0.55, 0.0, 0.45, 0.0, 0.0},
       .cancelShare = 0.05, .noShowShare = 0.02, .rateRule = RateRule::Dynamic, .rateFactor = 0.85},
      {.seg = Whl, .arrivalsPerDay = 6.0,
       .weekday = {0.9, 0.9, 0.9, 0.9, 1.0, 1.3, 1.1}, .season = {0.55, 1.0, 1.25},
       .dispersion = 10.0, .minLead = 21.0, .shortLeadMean = 40.0, .longLeadMean = 120.0,
       .longLeadShare = 0.5, .leisure = true,
       .los = {0.05, 0.20, 0.35, 0.20, 0.10, 0.05, 0.05}, .rooms = {0.5, 0.35, 0.15},
       .types = {0.70, 0.20, 0.10, 0.0}, .channels = {0.0, 0.0, 0.0, 0.0, 1.0},
       .cancelShare = 0.30, .noShowShare = 0.015, .rateRule = RateRule::Contract, .rateFactor = 0.66},
  }};
  // clang-format on
  return models;
}

/// The extended set's three more: leisure packages sold early for peaks and weekends, public
/// servants on a flat per-diem rate on weekdays, and airline and ferry crews on a year-round
/// contract who book a day or two ahead.
const std::array<IndividualModel, 3> &extraModels() {
  // clang-format off
  static const std::array<IndividualModel, 3> models{{
      {.seg = Pkg, .arrivalsPerDay = 5.0,
       .weekday = {0.6, 0.6, 0.7, 0.9, 1.9, 1.5, 0.8}, .season = {0.6, 1.0, 1.5},
       .dispersion = 6.0, .minLead = 30.0, .shortLeadMean = 30.0, .longLeadMean = 120.0,
       .longLeadShare = 0.55, .leisure = true,
       .los = {0.10, 0.40, 0.30, 0.10, 0.05, 0.03, 0.02}, .rooms = {0.8, 0.18, 0.02},
       .types = {0.40, 0.30, 0.20, 0.10}, .channels = {0.55, 0.10, 0.35, 0.0, 0.0},
       .cancelShare = 0.18, .noShowShare = 0.01, .rateRule = RateRule::Dynamic, .rateFactor = 0.95},
      {.seg = Gov, .arrivalsPerDay = 5.0,
       .weekday = {1.7, 1.5, 1.2, 0.7, 0.15, 0.05, 0.9}, .season = {1.0, 1.1, 0.5},
       .dispersion = 8.0, .minLead = 0.0, .shortLeadMean = 10.0, .longLeadMean = 35.0,
       .longLeadShare = 0.25, .leisure = false,
       .los = {0.40, 0.35, 0.15, 0.07, 0.03, 0.0, 0.0}, .rooms = {0.97, 0.03, 0.0},
       .types = {0.95, 0.05, 0.0, 0.0}, .channels = {0.15, 0.35, 0.0, 0.50, 0.0},
       .cancelShare = 0.12, .noShowShare = 0.02, .rateRule = RateRule::Negotiated, .rateFactor = 0.8},
      {.seg = Crew, .arrivalsPerDay = 4.0,
       .weekday = {1.0, 1.0, 1.0, 1.0, 1.0, 1.0, 1.0}, .season = {1.0, 1.0, 1.0},
       .dispersion = 20.0, .minLead = 0.0, .shortLeadMean = 1.5, .longLeadMean = 10.0,
       .longLeadShare = 0.15, .leisure = false,
       .los = {0.60, 0.35, 0.05, 0.0, 0.0, 0.0, 0.0}, .rooms = {0.4, 0.35, 0.25},
       .types = {1.0, 0.0, 0.0, 0.0}, .channels = {0.0, 0.8, 0.0, 0.2, 0.0},
       .cancelShare = 0.08, .noShowShare = 0.005, .rateRule = RateRule::Negotiated, .rateFactor = 0.6},
  }};
  // clang-format on
  return models;
}

const IndividualModel &modelOf(SegmentIndex seg) {
  for (const auto &m : individualModels())
    if (m.seg == seg)
      return m;
  for (const auto &m : extraModels())
    if (m.seg == seg)
      return m;
  throw std::logic_error("no individual model for this segment");
}

/// Groups: a contract request holds a block of rooms; the rooming list arrives in
/// batches before the cutoff, and what is not picked up by then is released (wash).
struct GroupModel {
  double perDay = 0.22;
  std::array<double, 7> weekday{1.3, 1.2, 1.0, 0.8, 1.2, 0.6, 0.9};
  std::array<double, 3> season{0.8, 1.2, 0.6};
  int minRooms = 10, maxRooms = 30;
  std::array<double, 4> nights{0.2, 0.4, 0.3, 0.1};
  double minContractLead = 45.0, contractLeadShape = 2.0, contractLeadScale = 60.0;
  int minCutoffLead = 21, maxCutoffLead = 30;
  double minPickup = 0.55, maxPickup = 0.95;
  double cancelShare = 0.06, noShowShare = 0.01;
  double rateFactor = 0.88;
  std::array<const char *, 8> kinds{"Conference",          "Wedding party", "Coach tour",
                                    "Sports team",         "Choir tour",    "Training course",
                                    "Association meeting", "Film crew"};
};

constexpr std::array<double, 3> kSeasonRate{0.8, 1.0, 1.3};
constexpr double kWeekendRate = 1.08; // Friday and Saturday nights, leisure rules only
constexpr double kRateGrowthPerYear = 0.035;
constexpr double kDemandGrowthPerYear = 0.02;
constexpr double kDailyShockShape = 40.0; // common factor of all segments on one arrival date
constexpr int kMaxLead = 400;
constexpr int kTentativeDays = 45; // future blocks contracted this recently are still tentative
constexpr double kPeakLeadStretch = 1.4;

/// Retail price response to occupancy on the books when the booking is made: 10 % off below
/// 40 % full, list price at 60 %, then up linearly to +35 % when full. A simple rule of our own.
double occupancyRateFactor(double occupied) {
  if (occupied <= 0.4)
    return 0.9;
  if (occupied <= 0.6)
    return 0.9 + 0.1 * (occupied - 0.4) / 0.2;
  return 1.0 + 0.35 * (std::min(occupied, 1.0) - 0.6) / 0.4;
}

struct EventModel {
  EventNote note;
  std::array<double, kSegments> demandLift; // multiplies arrivals on the event's nights
  double rateLift;
  // Nights lifted: the night before the first day through the night before the last day.
  Date firstNight() const { return note.from - 1; }
  Date lastNight() const { return note.to - 1; }
};

Date nthWeekday(int year, unsigned month, unsigned isoWeekday, int n) {
  Date d = Date::fromYmd(year, month, 1);
  while (d.isoWeekday() != isoWeekday)
    ++d;
  return d + 7 * (n - 1);
}

std::vector<EventModel> eventsBetween(Date first, Date last) {
  std::vector<EventModel> all;
  for (int y = first.year() - 1; y <= last.year() + 1; ++y) {
    const Date festival = nthWeekday(y, 7, 4, 2); // second Thursday of July, four days
    all.push_back({{festival, festival + 3, "Ostvale Harbour Festival"},
                   {2.2, 0.8, 2.0, 1.0, 1.5, 2.0, 0.5, 1.0},
                   1.25});
    // The organiser sets the trade fair's week each year; invented dates, Tuesday to Thursday.
    static constexpr std::array<std::array<int, 3>, 6> fairs{
        {{2023, 4, 18}, {2024, 4, 16}, {2025, 3, 25}, {2026, 4, 21}, {2027, 3, 16}, {2028, 4, 11}}};
    for (const auto &f : fairs)
      if (f[0] == y) {
        const Date open =
            Date::fromYmd(y, static_cast<unsigned>(f[1]), static_cast<unsigned>(f[2]));
        all.push_back({{open, open + 2, "Quillon Maritime Trade Fair"},
                       {2.0, 3.0, 1.3, 1.0, 0.5, 0.8, 1.5, 1.0},
                       1.3});
      }
    const Date regatta = nthWeekday(y, 9, 6, 1); // first Saturday of September
    all.push_back({{regatta - 1, regatta + 1, "Ostvale Autumn Regatta"},
                   {1.8, 1.0, 1.5, 1.0, 1.2, 1.6, 0.8, 1.0},
                   1.15});
    all.push_back(
        {{Date::fromYmd(y, 12, 31), Date::fromYmd(y + 1, 1, 1), "New Year's Eve on the harbour"},
         {2.5, 0.2, 2.0, 1.0, 1.5, 2.2, 0.1, 0.8},
         1.3});
  }
  std::vector<EventModel> kept;
  for (auto &e : all)
    if (e.lastNight() >= first && e.firstNight() <= last)
      kept.push_back(e);
  std::sort(kept.begin(), kept.end(),
            [](const EventModel &a, const EventModel &b) { return a.note.from < b.note.from; });
  return kept;
}

const EventModel *eventOn(const std::vector<EventModel> &events, Date night) {
  for (const auto &e : events)
    if (e.firstNight() <= night && night <= e.lastNight())
      return &e;
  return nullptr;
}

// ---------------------------------------------------------------------------------------------
// The simulation.

struct Request {
  Date requested;
  Date arrival;
  int nights = 1;
  int rooms = 1;
  SegmentIndex seg = Flex;
  std::size_t roomType = kStd;
  std::size_t channel = Web;
  std::optional<Date> cancelOn; // drawn up front: the guest's fate if accepted
  bool noShow = false;
  std::uint64_t order = 0; // random tie-break among requests of one day
  int group = -1;          // rooming-list batch of this group, or -1
};

struct Group {
  std::string kind;
  Date contracted, arrival, cutoff;
  int nights = 1, rooms = 0;
  std::size_t roomType = kStd;
  std::uint64_t order = 0;
  std::vector<std::size_t> pickups; // indices into requests
  bool accepted = false;
  bool released = false;
  int pickedActive = 0; // picked-up rooms not cancelled
  double rate = 0.0;
  std::string id;
};

struct Booking {
  std::size_t request;
  std::size_t roomType;
  double rate;
};

/// What happens on one day, in this order: cutoffs release unpicked rooms, cancellations free
/// rooms, then requests are served in their random order.
struct DayWork {
  std::vector<std::size_t> releases;                           // groups
  std::vector<std::size_t> cancellations;                      // bookings
  std::vector<std::pair<std::uint64_t, std::ptrdiff_t>> items; // order, request (≥ 0) or ~group
};

class Simulation {
public:
  explicit Simulation(const SimulatorConfig &c)
      : cfg_(c), rng_(c.seed), lastNight_(c.readingDate + c.futureDays),
        events_(eventsBetween(c.historyStart, lastNight_)) {
    const bool extended = c.segments == SegmentSet::Extended;
    for (std::size_t s = 0; s < (extended ? kSegments : kSampleSegments); ++s)
      byRank_.push_back(static_cast<SegmentIndex>(s));
    if (extended)
      std::sort(byRank_.begin(), byRank_.end(),
                [](SegmentIndex a, SegmentIndex b) { return kExtendedRank[a] < kExtendedRank[b]; });
  }

  SampleProperty run();

private:
  void describeProperty(SampleProperty &out) const;
  void generateDemand();
  void generateIndividual(const IndividualModel &m, Date arrival, double shock);
  void generateGroup(Date arrival);
  Date leadDate(Date arrival, double leadDays) const;
  std::optional<Date> drawCancel(Date booked, Date arrival, double share);
  void simulate(SampleProperty &out);
  void serveRequest(std::size_t r, Date day, SampleProperty &out);
  void serveGroup(std::size_t g, Date day, SampleProperty &out);
  void finish(SampleProperty &out);

  std::size_t nightIndex(Date s) const { return static_cast<std::size_t>(s - cfg_.historyStart); }
  bool fits(std::size_t type, Date arrival, int nights, int rooms) const;
  void hold(std::size_t type, Date arrival, int nights, int rooms);
  double occupiedShare(Date arrival, int nights) const;
  double nightRate(std::size_t type, Date s, RateRule rule) const;
  DayWork &work(Date d) { return days_[static_cast<std::size_t>(d - firstDay_)]; }

  SimulatorConfig cfg_;
  std::vector<SegmentIndex> byRank_; // the segments sold, highest-paying first
  Rng rng_;
  Date lastNight_;
  std::vector<EventModel> events_;
  GroupModel groupModel_;
  std::vector<Request> requests_;
  std::vector<Group> groups_;
  std::vector<Booking> bookings_;
  std::vector<DayWork> days_;
  Date firstDay_;
  std::array<std::vector<int>, kTypes> held_; // rooms held per type and night
  std::array<std::vector<int>, kTypes> cap_;
  std::vector<int> totalCap_;
};

void Simulation::describeProperty(SampleProperty &out) const {
  out.property.name = "Harbour Quillon Hotel";
  out.property.currency = "EUR";
  out.property.capacity = cfg_.capacity;
  out.town = "Ostvale";
  for (std::size_t t = 0; t < kTypes; ++t)
    out.roomTypes.push_back({kTypeCodes[t], kTypeNames[t], kTypeRooms[t]});
  // The smaller types keep their share of the 150-room sample (exactly its counts at 150), so a
  // larger property keeps the same room mix; standard rooms take the rest.
  int others = 0;
  for (std::size_t t = 1; t < kTypes; ++t) {
    out.roomTypes[t].rooms =
        static_cast<int>(std::lround(kTypeRooms[t] * static_cast<double>(cfg_.capacity) / 150.0));
    others += out.roomTypes[t].rooms;
  }
  out.roomTypes[kStd].rooms = cfg_.capacity - others;
  if (out.roomTypes[kStd].rooms < 20 || out.roomTypes[kSup].rooms <= kRefurbishedRooms)
    throw std::invalid_argument("simulateProperty: capacity must be at least 47 rooms");
  const Date closed = Date::fromYmd(2025, 1, 6), reopened = Date::fromYmd(2025, 3, 1);
  out.property.capacityChanges = {
      {closed, cfg_.capacity - kRefurbishedRooms,
       fmt::format("{} superior rooms closed for refurbishment", kRefurbishedRooms)},
      {reopened, cfg_.capacity, "refurbished superior rooms reopened"}};
  const int superior = out.roomTypes[kSup].rooms;
  out.roomTypeChanges = {{kTypeCodes[kSup], closed, superior - kRefurbishedRooms},
                         {kTypeCodes[kSup], reopened, superior}};
  for (std::size_t k = 0; k < byRank_.size(); ++k) {
    const SegmentIndex s = byRank_[k];
    out.segments.push_back({kSegCodes[s], kSegNames[s], static_cast<int>(k) + 1, kSegColours[s]});
  }
  for (std::size_t c = 0; c < kChannels; ++c)
    out.channels.push_back({kChannelCodes[c], kChannelNames[c]});
  for (const auto &e : events_)
    out.events.push_back(e.note);
  out.readingDate = cfg_.readingDate;
}

Date Simulation::leadDate(Date arrival, double leadDays) const {
  const int lead = std::min(kMaxLead, static_cast<int>(std::floor(leadDays)));
  return arrival - std::max(0, lead);
}

std::optional<Date> Simulation::drawCancel(Date booked, Date arrival, double share) {
  if (!rng_.bernoulli(share))
    return std::nullopt;
  // Cancellations crowd towards arrival: the square root pushes the draw to the late end.
  const int window = arrival - booked;
  const int after = static_cast<int>(std::floor(std::sqrt(rng_.uniform()) * (window + 1)));
  return booked + std::min(after, window);
}

void Simulation::generateIndividual(const IndividualModel &m, Date arrival, double shock) {
  double weekdayMean = 0.0;
  for (double w : m.weekday)
    weekdayMean += w / 7.0;
  const double years = (arrival - cfg_.historyStart) / 365.25;
  double mean = m.arrivalsPerDay * cfg_.capacity / 150.0 * m.season[seasonIndex(arrival)] *
                m.weekday[arrival.isoWeekday() - 1] / weekdayMean *
                (1.0 + kDemandGrowthPerYear * years) * shock * cfg_.demandScale;
  const EventModel *event = eventOn(events_, arrival);
  if (event)
    mean *= event->demandLift[m.seg];
  // Corporate travel stops over Christmas and the new year.
  const unsigned mo = arrival.month(), d = arrival.day();
  if ((m.seg == Corp || m.seg == Gov) && ((mo == 12 && d >= 20) || (mo == 1 && d <= 4)))
    mean *= 0.3;
  const bool early = m.leisure && (event || seasonOf(arrival) == Season::Peak);
  const int n = rng_.negativeBinomial(mean, m.dispersion);
  for (int i = 0; i < n; ++i) {
    Request r;
    r.arrival = arrival;
    r.seg = m.seg;
    double lead = rng_.bernoulli(m.longLeadShare) ? rng_.exponential(m.longLeadMean)
                                                  : rng_.exponential(m.shortLeadMean);
    if (early)
      lead *= kPeakLeadStretch;
    r.requested = leadDate(arrival, m.minLead + lead);
    r.nights = static_cast<int>(rng_.choose(m.los)) + 1;
    r.rooms = static_cast<int>(rng_.choose(m.rooms)) + 1;
    // Drawn only when asked for, so the default sample's draws (and files) stay the same.
    if (cfg_.shortStayShare > 0.0 && rng_.bernoulli(cfg_.shortStayShare)) {
      r.nights = 1;
      r.rooms = 1;
    }
    r.roomType = rng_.choose(m.types);
    r.channel = rng_.choose(m.channels);
    r.cancelOn = drawCancel(r.requested, arrival, m.cancelShare);
    r.noShow = !r.cancelOn && rng_.bernoulli(m.noShowShare);
    r.order = rng_.next();
    requests_.push_back(r);
  }
}

void Simulation::generateGroup(Date arrival) {
  const GroupModel &gm = groupModel_;
  double weekdayMean = 0.0;
  for (double w : gm.weekday)
    weekdayMean += w / 7.0;
  const double mean = gm.perDay * cfg_.capacity / 150.0 * gm.season[seasonIndex(arrival)] *
                      gm.weekday[arrival.isoWeekday() - 1] / weekdayMean * cfg_.demandScale;
  const int n = rng_.poisson(mean);
  for (int i = 0; i < n; ++i) {
    Group g;
    g.kind = gm.kinds[rng_.choose(std::array<double, 8>{3, 2, 2, 1, 1, 2, 2, 0.5})];
    g.arrival = arrival;
    g.nights = static_cast<int>(rng_.choose(gm.nights)) + 1;
    g.rooms = rng_.uniformInt(gm.minRooms, gm.maxRooms);
    g.contracted = leadDate(arrival, gm.minContractLead +
                                         rng_.gamma(gm.contractLeadShape, gm.contractLeadScale));
    g.cutoff = arrival - rng_.uniformInt(gm.minCutoffLead, gm.maxCutoffLead);
    g.order = rng_.next();
    const double pickupShare = rng_.uniform(gm.minPickup, gm.maxPickup);
    int toPick = std::max(1, static_cast<int>(std::lround(g.rooms * pickupShare)));
    // The rooming list arrives in small batches, most of them in the weeks before the cutoff.
    const Date earliest = g.contracted + 1, latest = g.cutoff - 1;
    const int window = std::min(100, latest - earliest);
    while (toPick > 0) {
      Request r;
      r.arrival = arrival;
      r.nights = g.nights;
      r.seg = Grp;
      r.rooms = std::min(toPick, rng_.uniformInt(1, 4));
      toPick -= r.rooms;
      const double u = rng_.uniform();
      r.requested = latest - static_cast<int>(std::floor(u * u * (window + 1)));
      r.roomType = kStd;
      r.channel = Voice;
      r.cancelOn = drawCancel(r.requested, arrival, gm.cancelShare);
      r.noShow = !r.cancelOn && rng_.bernoulli(gm.noShowShare);
      r.order = rng_.next();
      r.group = static_cast<int>(groups_.size());
      g.pickups.push_back(requests_.size());
      requests_.push_back(r);
    }
    groups_.push_back(std::move(g));
  }
}

void Simulation::generateDemand() {
  for (Date a = cfg_.historyStart; a <= lastNight_; ++a) {
    const double shock = rng_.gamma(kDailyShockShape, 1.0 / kDailyShockShape);
    for (const auto &m : individualModels())
      generateIndividual(m, a, shock);
    generateGroup(a);
    // After the sample's draws, so the sample's own stay the same.
    if (cfg_.segments == SegmentSet::Extended)
      for (const auto &m : extraModels())
        generateIndividual(m, a, shock);
  }
}

bool Simulation::fits(std::size_t type, Date arrival, int nights, int rooms) const {
  for (int k = 0; k < nights; ++k) {
    const std::size_t i = nightIndex(arrival + k);
    if (held_[type][i] + rooms > cap_[type][i])
      return false;
  }
  return true;
}

void Simulation::hold(std::size_t type, Date arrival, int nights, int rooms) {
  for (int k = 0; k < nights; ++k)
    held_[type][nightIndex(arrival + k)] += rooms;
}

double Simulation::occupiedShare(Date arrival, int nights) const {
  double sum = 0.0;
  for (int k = 0; k < nights; ++k) {
    const std::size_t i = nightIndex(arrival + k);
    int held = 0;
    for (std::size_t t = 0; t < kTypes; ++t)
      held += held_[t][i];
    sum += static_cast<double>(held) / totalCap_[i];
  }
  return sum / nights;
}

double Simulation::nightRate(std::size_t type, Date s, RateRule rule) const {
  const double years = s.year() - 2023;
  double rate = kTypeBaseRate[type] * std::pow(1.0 + kRateGrowthPerYear, years);
  if (rule == RateRule::Negotiated)
    return rate;
  rate *= kSeasonRate[seasonIndex(s)];
  if (rule == RateRule::Contract)
    return rate;
  if (s.isoWeekday() == 5 || s.isoWeekday() == 6)
    rate *= kWeekendRate;
  if (const EventModel *e = eventOn(events_, s))
    rate *= e->rateLift;
  return rate;
}

/// Average of whole-euro night rates over the stay, to the cent.
double stayRate(const std::vector<double> &nightRates) {
  double sum = 0.0;
  for (double r : nightRates)
    sum += std::round(r);
  return std::round(sum / static_cast<double>(nightRates.size()) * 100.0) / 100.0;
}

void Simulation::serveRequest(std::size_t ri, Date day, SampleProperty &out) {
  const Request &r = requests_[ri];
  if (r.group >= 0) {
    // Rooming-list batch: the rooms are already held by the block.
    Group &g = groups_[static_cast<std::size_t>(r.group)];
    bookings_.push_back({ri, g.roomType, g.rate});
    if (r.cancelOn == day)
      return;
    g.pickedActive += r.rooms;
    if (r.cancelOn && *r.cancelOn <= cfg_.readingDate)
      work(*r.cancelOn).cancellations.push_back(bookings_.size() - 1);
    return;
  }
  // The requested type first, then any other type with room on every night (largest first).
  std::optional<std::size_t> type;
  if (fits(r.roomType, r.arrival, r.nights, r.rooms))
    type = r.roomType;
  for (std::size_t t = 0; t < kTypes && !type; ++t)
    if (fits(t, r.arrival, r.nights, r.rooms))
      type = t;
  if (!type) {
    out.denials.push_back(
        {day, r.arrival, r.arrival + r.nights, r.rooms, kSegCodes[r.seg], DenialKind::Denial});
    return;
  }
  const IndividualModel &m = modelOf(r.seg);
  const double occupancy = occupiedShare(r.arrival, r.nights);
  std::vector<double> rates;
  for (int k = 0; k < r.nights; ++k) {
    double rate = nightRate(*type, r.arrival + k, m.rateRule) * m.rateFactor;
    if (m.rateRule == RateRule::Dynamic)
      rate *= occupancyRateFactor(occupancy);
    rates.push_back(rate);
  }
  bookings_.push_back({ri, *type, stayRate(rates)});
  if (r.cancelOn == day)
    return; // booked and cancelled the same day: it never held a room
  hold(*type, r.arrival, r.nights, r.rooms);
  if (r.cancelOn && *r.cancelOn <= cfg_.readingDate)
    work(*r.cancelOn).cancellations.push_back(bookings_.size() - 1);
}

void Simulation::serveGroup(std::size_t gi, Date day, SampleProperty &out) {
  Group &g = groups_[gi];
  // The whole block in one room type: standard if it fits, else the first type that does.
  std::optional<std::size_t> type;
  for (std::size_t t = 0; t < kTypes && !type; ++t)
    if (fits(t, g.arrival, g.nights, g.rooms))
      type = t;
  if (!type) {
    out.denials.push_back(
        {day, g.arrival, g.arrival + g.nights, g.rooms, kSegCodes[Grp], DenialKind::Denial});
    return;
  }
  const double occupancy = occupiedShare(g.arrival, g.nights);
  std::vector<double> rates;
  for (int k = 0; k < g.nights; ++k)
    rates.push_back(nightRate(kStd, g.arrival + k, RateRule::Dynamic) * groupModel_.rateFactor *
                    occupancyRateFactor(occupancy));
  g.rate = stayRate(rates);
  g.accepted = true;
  g.roomType = *type;
  hold(g.roomType, g.arrival, g.nights, g.rooms);
  if (g.cutoff <= cfg_.readingDate)
    work(g.cutoff).releases.push_back(gi);
  for (std::size_t p : g.pickups)
    if (requests_[p].requested <= cfg_.readingDate)
      work(requests_[p].requested)
          .items.emplace_back(requests_[p].order, static_cast<std::ptrdiff_t>(p));
}

void Simulation::simulate(SampleProperty &out) {
  const std::size_t nightCount = nightIndex(lastNight_) + 8;
  totalCap_.assign(nightCount, 0);
  for (std::size_t t = 0; t < kTypes; ++t) {
    held_[t].assign(nightCount, 0);
    cap_[t].resize(nightCount);
    for (std::size_t i = 0; i < nightCount; ++i) {
      cap_[t][i] = out.roomsOfTypeOn(kTypeCodes[t], cfg_.historyStart + static_cast<int>(i));
      totalCap_[i] += cap_[t][i];
    }
  }
  firstDay_ = cfg_.historyStart - kMaxLead;
  days_.assign(static_cast<std::size_t>(cfg_.readingDate - firstDay_) + 1, {});
  for (std::size_t i = 0; i < requests_.size(); ++i)
    if (requests_[i].group < 0 && requests_[i].requested <= cfg_.readingDate)
      work(requests_[i].requested)
          .items.emplace_back(requests_[i].order, static_cast<std::ptrdiff_t>(i));
  for (std::size_t g = 0; g < groups_.size(); ++g)
    if (groups_[g].contracted <= cfg_.readingDate)
      work(groups_[g].contracted)
          .items.emplace_back(groups_[g].order, ~static_cast<std::ptrdiff_t>(g));

  for (Date day = firstDay_; day <= cfg_.readingDate; ++day) {
    DayWork &w = work(day);
    for (std::size_t gi : w.releases) {
      Group &g = groups_[gi];
      hold(g.roomType, g.arrival, g.nights, -(g.rooms - g.pickedActive));
      g.released = true;
    }
    for (std::size_t b : w.cancellations) {
      const Request &r = requests_[bookings_[b].request];
      if (r.group >= 0 && !groups_[static_cast<std::size_t>(r.group)].released)
        groups_[static_cast<std::size_t>(r.group)].pickedActive -= r.rooms; // back to the block
      else
        hold(bookings_[b].roomType, r.arrival, r.nights, -r.rooms);
    }
    std::sort(w.items.begin(), w.items.end());
    for (const auto &[order, item] : w.items) {
      if (item >= 0)
        serveRequest(static_cast<std::size_t>(item), day, out);
      else
        serveGroup(static_cast<std::size_t>(~item), day, out);
    }
    w = DayWork{}; // free the day's lists as we go
  }
}

void Simulation::finish(SampleProperty &out) {
  const Date t = cfg_.readingDate;
  // Block ids in contract order.
  std::vector<std::size_t> accepted;
  for (std::size_t g = 0; g < groups_.size(); ++g)
    if (groups_[g].accepted)
      accepted.push_back(g);
  std::stable_sort(accepted.begin(), accepted.end(), [&](std::size_t a, std::size_t b) {
    return std::tie(groups_[a].contracted, groups_[a].order) <
           std::tie(groups_[b].contracted, groups_[b].order);
  });
  static constexpr std::array<const char *, 12> months{
      "January", "February", "March",     "April",   "May",      "June",
      "July",    "August",   "September", "October", "November", "December"};
  for (std::size_t k = 0; k < accepted.size(); ++k) {
    Group &g = groups_[accepted[k]];
    g.id = fmt::format("GB{:04}", k + 1);
    const bool tentative = g.arrival > t && t - g.contracted < kTentativeDays;
    out.blocks.push_back(
        {g.id, fmt::format("{} {} {}", g.kind, months[g.arrival.month() - 1], g.arrival.year()),
         kSegCodes[Grp], g.arrival, g.arrival + g.nights, g.rooms, g.cutoff,
         tentative ? BlockStatus::Tentative : BlockStatus::Definite});
    out.blockDetails.push_back({g.contracted, kTypeCodes[g.roomType]});
  }

  // Bookings are already in processing order (day, then tie-break): ids follow it.
  out.reservations.reserve(bookings_.size());
  for (std::size_t k = 0; k < bookings_.size(); ++k) {
    const Booking &b = bookings_[k];
    const Request &r = requests_[b.request];
    Reservation res;
    res.id = fmt::format("HQ{:06}", k + 1);
    res.bookedOn = r.requested;
    res.arrival = r.arrival;
    res.departure = r.arrival + r.nights;
    res.rooms = r.rooms;
    res.roomType = kTypeCodes[b.roomType];
    res.segment = kSegCodes[r.seg];
    res.channel = kChannelCodes[r.channel];
    res.rate = b.rate;
    res.currency = "EUR";
    if (r.group >= 0)
      res.blockId = groups_[static_cast<std::size_t>(r.group)].id;
    if (r.cancelOn && *r.cancelOn <= t) {
      res.status = ReservationStatus::Cancelled;
      res.cancelledOn = r.cancelOn;
    } else if (r.arrival <= t && r.noShow) {
      res.status = ReservationStatus::NoShow;
    } else if (res.departure <= t) {
      res.status = ReservationStatus::CheckedOut;
    } else {
      res.status = ReservationStatus::Booked; // future arrival or still in house
    }
    out.reservations.push_back(std::move(res));
  }

  // True demand: every request's room-nights that would have stayed on the books to arrival,
  // served or not; sold counts the served ones (the finals).
  const std::size_t nights = static_cast<std::size_t>(t - cfg_.historyStart) + 1;
  std::array<std::vector<int>, kSegments> want, sold;
  for (std::size_t s = 0; s < kSegments; ++s) {
    want[s].assign(nights, 0);
    sold[s].assign(nights, 0);
  }
  auto add = [&](std::vector<int> &v, const Request &r) {
    if (r.cancelOn)
      return;
    for (int k = 0; k < r.nights; ++k)
      if (r.arrival + k <= t)
        v[nightIndex(r.arrival + k)] += r.rooms;
  };
  for (const Request &r : requests_)
    if (r.arrival <= t)
      add(want[r.seg], r);
  for (const Booking &b : bookings_)
    if (requests_[b.request].arrival <= t)
      add(sold[requests_[b.request].seg], requests_[b.request]);
  for (std::size_t i = 0; i < nights; ++i)
    for (const SegmentIndex s : byRank_)
      out.trueDemand.push_back(
          {cfg_.historyStart + static_cast<int>(i), kSegCodes[s], want[s][i], sold[s][i]});

  std::stable_sort(out.denials.begin(), out.denials.end(), [](const Denial &a, const Denial &b) {
    return std::tie(a.requestedOn, a.arrival, a.departure, a.segment, a.rooms) <
           std::tie(b.requestedOn, b.arrival, b.departure, b.segment, b.rooms);
  });
}

SampleProperty Simulation::run() {
  if (cfg_.futureDays < 0 || cfg_.readingDate < cfg_.historyStart)
    throw std::invalid_argument("simulateProperty: reading date before history start");
  SampleProperty out;
  describeProperty(out);
  generateDemand();
  simulate(out);
  finish(out);
  return out;
}

// ---------------------------------------------------------------------------------------------
// Files.

void writeFile(const std::filesystem::path &p, const std::string &bytes) {
  std::ofstream f(p, std::ios::binary | std::ios::trunc);
  f << bytes;
  f.close();
  if (!f)
    throw std::runtime_error(fmt::format("cannot write {}", p.string()));
}

std::string propertyJson(const SampleProperty &s) {
  nlohmann::ordered_json j;
  j["name"] = s.property.name;
  j["town"] = s.town;
  j["currency"] = s.property.currency;
  j["capacity"] = s.property.capacity;
  j["capacity_changes"] = nlohmann::ordered_json::array();
  for (const auto &c : s.property.capacityChanges)
    j["capacity_changes"].push_back(
        {{"from", c.from.toIso()}, {"rooms", c.rooms}, {"reason", c.reason}});
  j["stly_alignment"] = s.property.stly == StlyAlignment::Weekday364 ? "weekday-364" : "calendar";
  j["sellout_margin"] = s.property.selloutMargin;
  j["reading_date"] = s.readingDate.toIso();
  j["room_types"] = nlohmann::ordered_json::array();
  for (const auto &t : s.roomTypes) {
    nlohmann::ordered_json rt{{"code", t.code}, {"name", t.name}, {"rooms", t.rooms}};
    rt["changes"] = nlohmann::ordered_json::array();
    for (const auto &c : s.roomTypeChanges)
      if (c.roomType == t.code)
        rt["changes"].push_back({{"from", c.from.toIso()}, {"rooms", c.rooms}});
    j["room_types"].push_back(rt);
  }
  j["segments"] = nlohmann::ordered_json::array();
  for (const auto &g : s.segments)
    j["segments"].push_back(
        {{"code", g.code}, {"name", g.name}, {"yield_rank", g.yieldRank}, {"colour", g.colour}});
  j["channels"] = nlohmann::ordered_json::array();
  for (const auto &c : s.channels)
    j["channels"].push_back({{"code", c.code}, {"name", c.name}});
  return j.dump(2) + "\n";
}

} // namespace

int SampleProperty::roomsOfTypeOn(const std::string &roomType, Date s) const {
  int rooms = 0;
  for (const auto &t : roomTypes)
    if (t.code == roomType)
      rooms = t.rooms;
  std::optional<Date> best;
  for (const auto &c : roomTypeChanges)
    if (c.roomType == roomType && c.from <= s && (!best || c.from >= *best)) {
      best = c.from;
      rooms = c.rooms;
    }
  return rooms;
}

SimulatorConfig millionBookingConfig() {
  SimulatorConfig c;
  c.capacity = 600;
  c.historyStart = Date::fromYmd(2021, 11, 1);
  c.readingDate = Date::fromYmd(2026, 10, 31);
  c.futureDays = 365;
  // Eight segments. Tuned by hand to land near 1,000,000 rows (996,166 with the default seed) at
  // about 81 % average occupancy to the reading date: a busy transit hotel whose individual
  // guests stay one night in one room.
  c.demandScale = 2.17;
  c.shortStayShare = 1.0;
  c.segments = SegmentSet::Extended;
  return c;
}

SampleProperty simulateProperty(const SimulatorConfig &config) { return Simulation(config).run(); }

void writeSampleFiles(const SampleProperty &sample, const std::filesystem::path &dir) {
  std::filesystem::create_directories(dir);
  {
    std::ostringstream os;
    writeNativeCsv(os, sample.reservations);
    writeFile(dir / "reservations.csv", os.str());
  }
  std::string blocks =
      "block_id,name,segment,arrival,departure,rooms_per_night,cutoff,status,contracted_on,"
      "room_type\n";
  for (std::size_t i = 0; i < sample.blocks.size(); ++i) {
    const GroupBlock &b = sample.blocks[i];
    const BlockDetail detail =
        i < sample.blockDetails.size() ? sample.blockDetails[i] : BlockDetail{};
    blocks += fmt::format("{},{},{},{},{},{},{},{},{},{}\n", quoteCsvField(b.id),
                          quoteCsvField(b.name), quoteCsvField(b.segment), b.arrival.toIso(),
                          b.departure.toIso(), b.roomsPerNight, b.cutoff.toIso(),
                          b.status == BlockStatus::Tentative ? "tentative" : "definite",
                          detail.contractedOn.toIso(), quoteCsvField(detail.roomType));
  }
  writeFile(dir / "blocks.csv", blocks);

  std::string denials = "requested_on,arrival,departure,rooms,segment,kind\n";
  for (const auto &d : sample.denials)
    denials += fmt::format("{},{},{},{},{},{}\n", d.requestedOn.toIso(), d.arrival.toIso(),
                           d.departure.toIso(), d.rooms, quoteCsvField(d.segment),
                           d.kind == DenialKind::Denial ? "denial" : "regret");
  writeFile(dir / "denials.csv", denials);

  std::string demand = "night,segment,unconstrained_room_nights,sold_room_nights\n";
  for (const auto &d : sample.trueDemand)
    demand += fmt::format("{},{},{},{}\n", d.night.toIso(), quoteCsvField(d.segment),
                          d.unconstrained, d.sold);
  writeFile(dir / "true_demand.csv", demand);

  std::string events = "first_day,last_day,label\n";
  for (const auto &e : sample.events)
    events += fmt::format("{},{},{}\n", e.from.toIso(), e.to.toIso(), quoteCsvField(e.label));
  writeFile(dir / "events.csv", events);

  writeFile(dir / "property.json", propertyJson(sample));
}

} // namespace cb
