#include "ui/datestudymodel.h"

#include "core/backtest.h"
#include "core/holidaymap.h"
#include "core/propertysettings.h"
#include "core/store.h"

#include <algorithm>
#include <cmath>
#include <cstdlib>
#include <exception>

namespace cbui {
namespace {

bool keepGoing(void *context, std::int64_t, std::int64_t) {
  auto *p = static_cast<CacheProgress *>(context);
  return p == nullptr || !p->cancel.load();
}

} // namespace

const std::vector<int> &backtestLeads() {
  static const std::vector<int> leads = {1, 3, 7, 14, 30, 60, 90};
  return leads;
}

ForecastCache computeForecastCache(const WorkbenchSession &session, cb::Date asOf, int horizon,
                                   const std::vector<std::string> &methods,
                                   CacheProgress *progress) {
  ForecastCache cache;
  cache.asOf = asOf;
  cache.horizon = horizon;
  if (progress)
    progress->total = static_cast<int>(methods.size()) + 1;
  const auto unconstrain = cb::historyOptions(session.property());
  for (const auto &m : methods) {
    if (progress && progress->cancel) {
      cache.cancelled = true;
      return cache;
    }
    cb::ForecastRequest req;
    req.asOf = asOf;
    req.horizon = horizon;
    req.method = m;
    req.by = cb::SeriesBy::Segment;
    req.unconstrain = unconstrain;
    req.censoring = &session.censorSources();
    req.bounds = session.bounds();
    req.progress = keepGoing;
    req.progressContext = progress;
    // One worker thread: the other core stays free for the UI (a night switch within 50 ms).
    req.threads = 1;
    try {
      cb::ForecastRun run =
          cb::ForecastRun::compute(session.reservations(), session.property(), req);
      if (run.cancelled) {
        cache.cancelled = true;
        return cache;
      }
      cache.runs.emplace(m, std::move(run));
    } catch (const std::exception &e) {
      cache.failures.push_back(m + ": " + e.what());
    }
    if (progress)
      ++progress->done;
  }

  // Accuracy of each method at a few leads over the 8 weeks of reading dates before asOf;
  // only nights stayed by asOf count, so a past reading date does not peek at later finals.
  std::vector<std::string> scored;
  for (const auto &m : methods)
    if (m != "auto")
      scored.push_back(m);
  if (scored.empty())
    return cache;
  cb::BacktestOptions bo;
  bo.from = asOf - 56;
  bo.to = asOf - 1;
  bo.leads = backtestLeads();
  bo.methods = scored;
  bo.unconstrain = unconstrain;
  bo.censoring = &session.censorSources();
  bo.withBands = false;
  bo.warmUp = false;
  bo.progress = keepGoing;
  bo.progressContext = progress;
  bo.threads = 1;
  try {
    const cb::CurveCube cube =
        cb::Backtest::buildCube(session.reservations(), bo, cb::SeriesBy::Segment);
    cb::BacktestResult result = cb::Backtest::run(cube, session.property(), bo);
    if (result.cancelled) {
      cache.cancelled = true;
      return cache;
    }
    std::erase_if(result.rows, [&](const cb::BacktestRow &r) { return r.night > asOf; });
    for (const auto &row : cb::Backtest::summarize(result))
      if (row.accuracy.count > 0)
        cache.mae[result.methods[row.method]][result.series[row.series]][row.lead] =
            row.accuracy.mae;
  } catch (const std::exception &e) {
    cache.failures.push_back(std::string("backtest: ") + e.what());
  }
  if (progress)
    ++progress->done;
  return cache;
}

cb::NightProtection computeProtection(const WorkbenchSession &session, cb::Date asOf,
                                      cb::Date night, const std::string &method,
                                      const std::atomic<bool> *cancel) {
  cb::OutlookOptions o;
  o.asOf = asOf;
  o.method = method;
  o.threads = 1; // leave a core to the UI
  o.bounds = session.bounds();
  if (cancel) {
    o.progress = [](void *context, std::int64_t, std::int64_t) {
      return !static_cast<const std::atomic<bool> *>(context)->load();
    };
    o.progressContext = const_cast<std::atomic<bool> *>(cancel); // read only
  }
  return cb::protectNight(session.reservations(), session.property(), session.censorSources(), asOf,
                          night, cb::ProtectionMethod::EmsrB, o);
}

int DateStudyModel::maxLead() const { return std::max(90, lead() + 30); }

NightCurves DateStudyModel::curves() const { return s_.curves(night_, maxLead(), segment_); }

std::vector<CurveSeries> DateStudyModel::segmentCurves() const {
  std::vector<CurveSeries> out;
  for (const auto &seg : s_.segments()) {
    CurveSeries c = s_.curves(night_, maxLead(), seg.code).thisYear;
    c.label = seg.code;
    out.push_back(std::move(c));
  }
  return out;
}

cb::ComparableNights DateStudyModel::comparable() const {
  cb::ComparableOptions o;
  o.maxDba = maxLead();
  const cb::HolidayMap holidays = cb::HolidayMap::fromEvents(s_.events());
  // From the night index: the reference nights' own reservations, not a cube of every one.
  return cb::ComparableNights::build(
      s_.reservations(), s_.nightIndex(), s_.newestActivity(), night_, s_.readingDate(),
      s_.property(), holidays, s_.events(), o,
      segment_.empty() ? cb::SeriesBy::Total : cb::SeriesBy::Segment, series());
}

bool DateStudyModel::cacheCovers() const {
  return cache_ && cache_->asOf == s_.readingDate() && lead() >= 1 && lead() <= cache_->horizon;
}

int DateStudyModel::horizonNeeded() const {
  // Whole months so that stepping night by night does not recompute at every step.
  return std::clamp(((std::max(lead(), 1) + 29) / 30) * 30, 90, 365);
}

std::optional<cb::ForecastValue> DateStudyModel::forecast(const std::string &method,
                                                          const std::string &series) const {
  if (!cacheCovers())
    return std::nullopt;
  auto it = cache_->runs.find(method);
  if (it == cache_->runs.end())
    return std::nullopt;
  const std::string want = series.empty() ? this->series() : series;
  ++cacheReads_;
  for (const auto &v : it->second.values)
    if (v.night == night_ && v.series == want)
      return v;
  return std::nullopt;
}

std::optional<double> DateStudyModel::mae(const std::string &method, int *leadOut) const {
  if (!cacheCovers())
    return std::nullopt;
  auto m = cache_->mae.find(method);
  if (m == cache_->mae.end())
    return std::nullopt;
  auto s = m->second.find(series());
  if (s == m->second.end() || s->second.empty())
    return std::nullopt;
  // The backtested lead nearest the night's lead.
  auto best = s->second.begin();
  for (auto it = s->second.begin(); it != s->second.end(); ++it)
    if (std::abs(it->first - lead()) < std::abs(best->first - lead()))
      best = it;
  if (leadOut)
    *leadOut = best->first;
  return best->second;
}

std::optional<cb::OutlookNight> DateStudyModel::capacityFigures(const std::string &method) const {
  auto fv = forecast(method, "ALL");
  if (!fv)
    return std::nullopt;
  cb::OutlookNight n;
  n.night = night_;
  n.lead = lead();
  n.capacity = s_.property().capacityOn(night_);
  n.otb = fv->otb;
  for (const auto &r : s_.reservationsCovering(night_))
    if (r.onBooks(night_, s_.readingDate()))
      n.otbRevenue += r.rate * r.rooms;
  n.forecast = fv->forecast;
  n.sd = fv->sd.value_or(0.0);
  n.lo = fv->lo;
  n.hi = fv->hi;
  n.method = fv->method;
  const double pickupRate = n.otb > 0 ? n.otbRevenue / n.otb : 0.0;
  cb::fillCapacityFigures(n, pickupRate);
  return n;
}

std::vector<cb::Reservation> DateStudyModel::reservationsOnBooks() const {
  std::vector<cb::Reservation> out;
  for (auto &r : s_.reservationsCovering(night_))
    if (r.onBooks(night_, s_.readingDate()) && (segment_.empty() || r.segment == segment_))
      out.push_back(std::move(r));
  std::sort(out.begin(), out.end(), [](const cb::Reservation &a, const cb::Reservation &b) {
    return a.bookedOn != b.bookedOn ? a.bookedOn < b.bookedOn : a.id < b.id;
  });
  return out;
}

int DateStudyModel::roomsOnBooks() const {
  int rooms = 0;
  for (const auto &r : reservationsOnBooks())
    rooms += r.rooms;
  return rooms;
}

std::vector<cb::ForecastOverride> DateStudyModel::allOverrides() const {
  auto store = cb::Store::open(s_.path());
  return cb::overrides(*store);
}

std::vector<cb::ForecastOverride> DateStudyModel::overrides() const {
  std::vector<cb::ForecastOverride> out;
  for (auto &o : allOverrides())
    if (o.night == night_)
      out.push_back(std::move(o));
  return out;
}

std::int64_t DateStudyModel::addOverride(double value, const std::string &reason,
                                         const std::string &author) const {
  cb::ForecastOverride o;
  o.night = night_;
  o.segment = segment_;
  o.value = value;
  o.reason = reason;
  o.author = author;
  auto store = cb::Store::open(s_.path());
  return cb::addOverride(*store, o);
}

} // namespace cbui
