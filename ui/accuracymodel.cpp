#include "ui/accuracymodel.h"

#include "core/forecastmethod.h"
#include "core/forecastrun.h"
#include "core/propertysettings.h"
#include "core/store.h"

#include <algorithm>

namespace cbui {

const AccuracyLine *AccuracyData::line(const std::string &method, int lead) const {
  for (const AccuracyLine &l : lines)
    if (l.method == method && l.lead == lead)
      return &l;
  return nullptr;
}

AccuracyData computeAccuracy(const WorkbenchSession &session, const AccuracyRequest &request) {
  // Scored: the nights of the last `weeks` weeks up to the reading date, each at every lead, so
  // every lead is measured on the same nights. Reading dates reach back by the longest lead.
  const cb::Date R = session.readingDate();
  const cb::Date firstNight = R - (7 * request.weeks - 1);
  const int maxLead =
      request.leads.empty() ? 0 : *std::max_element(request.leads.begin(), request.leads.end());
  cb::BacktestOptions o;
  o.to = R - 1;
  o.from = firstNight - maxLead;
  o.leads = request.leads;
  o.methods = request.methods;
  if (o.methods.empty()) {
    for (const std::string &m : cb::methodNames())
      if (m != "mlp") // minutes per reading date on the sample: not for an interactive screen
        o.methods.push_back(m);
    o.methods.push_back("auto");
  }
  o.unconstrain = cb::historyOptions(session.property());
  o.censoring = &session.censorSources();
  o.progress = request.progress;
  o.progressContext = request.progressContext;
  const cb::SeriesBy by = request.segment.empty() ? cb::SeriesBy::Total : cb::SeriesBy::Segment;

  o.threads = 1; // one core for the backtest, the other for the screens
  const cb::CurveCube cube = cb::Backtest::buildCube(session.reservations(), o, by);
  cb::BacktestResult r = cb::Backtest::run(cube, session.property(), o);
  // Only the window's nights; none after the session's reading date (when the workbench looks at
  // an earlier date, the finals of later nights were not known then).
  std::erase_if(
      r.rows, [&](const cb::BacktestRow &row) { return row.night < firstNight || row.night > R; });

  AccuracyData out;
  out.from = firstNight;
  out.to = R;
  out.series = request.segment.empty() ? std::string("ALL") : request.segment;
  out.methods = r.methods;
  out.cancelled = r.cancelled;
  if (r.cancelled)
    return out;
  const auto seriesIt = std::find(r.series.begin(), r.series.end(), out.series);
  if (seriesIt == r.series.end())
    return out;
  const auto series = static_cast<std::uint32_t>(seriesIt - r.series.begin());

  std::vector<cb::OverrideValue> overrides;
  for (const cb::ForecastOverride &x : cb::overrides(*cb::Store::open(session.path())))
    overrides.push_back({x.night, x.segment.empty() ? std::string("ALL") : x.segment, x.value});
  for (const cb::BacktestSummaryRow &s : cb::Backtest::summarize(r, overrides))
    if (s.series == series)
      out.lines.push_back(
          {r.methods[s.method], s.lead, s.accuracy, s.coverage, s.overridden, s.valueAdded});

  // Auto-selection per lead bucket: how often each method was chosen, and the latest evidence.
  std::map<int, AutoPick> byBucket;
  std::map<int, cb::Date> latest;
  for (const cb::AutoRecord &a : r.autoChoices) {
    if (a.series != series || !a.choice.method)
      continue;
    AutoPick &p = byBucket[a.bucket];
    p.bucket = r.buckets.label(a.bucket);
    p.criterion = std::string(cb::criterionName(o.autoSelect.criterion));
    ++p.picks[r.methods[*a.choice.method]];
    if (!latest.count(a.bucket) || latest[a.bucket] <= a.reading) {
      latest[a.bucket] = a.reading;
      p.latest = r.methods[*a.choice.method];
      p.latestEvidence.clear();
      for (const cb::MethodEvidence &e : a.choice.evidence)
        p.latestEvidence.emplace_back(r.methods[e.method], e.error);
    }
  }
  for (auto &[bucket, pick] : byBucket)
    out.autoPicks.push_back(std::move(pick));
  return out;
}

} // namespace cbui
