// The group verbs: import-blocks (a blocks file into the store), groups (blocks with pickup,
// expected rooms, typical pace and flags; the wash by lead; the group / transient split of the
// forecast; one block's pickup curve; a backtest of expected group rooms).
#include "app/clicommon.h"
#include "app/cliverbs.h"

#include "core/blockimporter.h"
#include "core/groupforecast.h"
#include "core/grouppace.h"
#include "core/textformat.h"

#include <fmt/format.h>

#include <memory>
#include <set>
#include <string>

namespace cbcli {
namespace {

struct ImportBlocksArgs {
  std::string store, file, profile, rejects;
  bool lenient = false;
};

struct GroupsArgs {
  std::string store, asOf, method = cb::OutlookOptions{}.method, out, curve;
  int split = 0;
  int backtestLead = 0;
  bool naiveHistory = false;
};

const std::vector<int> kLeads = {0, 7, 14, 30, 60, 90, 180, 365};

int runImportBlocks(const ImportBlocksArgs &a) {
  auto store = cb::Store::open(a.store);
  cb::ImportOptions opt;
  opt.profile = a.profile;
  opt.mode = a.lenient ? cb::ImportMode::Lenient : cb::ImportMode::Strict;
  if (!a.rejects.empty())
    opt.rejectsFile = a.rejects;
  const cb::ImportReport rep = cb::importBlocks(*store, a.file, opt);
  for (const auto &f : rep.findings)
    fmt::print(stderr, "{}\n", f.toString());
  const auto &l = rep.log;
  std::string verdict = "written";
  if (!rep.written && !a.lenient && l.rejected > 0 && !rep.ioOrUsageError)
    verdict = "nothing written (strict: fix the rows above, or use --lenient to write the valid "
              "rows)";
  else if (!rep.written)
    verdict = "nothing written";
  fmt::print("{}: read {} blocks, added {}, updated {}, unchanged {}, rejected {} — {}\n", a.file,
             cb::formatCount(l.rowsRead), cb::formatCount(l.added), cb::formatCount(l.updated),
             cb::formatCount(l.unchanged), cb::formatCount(l.rejected), verdict);
  if (rep.ioOrUsageError)
    return kUsageOrIo;
  return cb::hasErrors(rep.findings) ? kFindings : kOk;
}

std::string share(std::optional<double> v) { return num(v, 4); }

/// Blocks not yet departed, with pickup against the typical pace.
void writeBlocks(const cb::GroupModel &model, cb::Date asOf, double tentative,
                 fmt::memory_buffer &out) {
  const auto put = std::back_inserter(out);
  fmt::format_to(put, "block_id,name,segment,status,arrival,departure,rooms_per_night,cutoff,"
                      "days_to_cutoff,lead,blocked_room_nights,picked_room_nights,share,"
                      "typical_share,typical_lower_quartile,typical_blocks,wash_at_lead,"
                      "expected_room_nights,flag\n");
  for (const cb::BlockPace &p : cb::trackBlocks(model, asOf, tentative)) {
    const cb::GroupBlock &b = model.blocks()[p.block].block;
    const cb::WashEstimate w = model.wash(b.segment, std::max(p.lead, 0), asOf);
    fmt::format_to(put, "{},{},{},{},{},{},{},{},{},{},{},{},{:.4f},{},{},{},{},{:.2f},{}\n",
                   csvText(b.id), csvText(b.name), csvText(b.segment),
                   b.status == cb::BlockStatus::Tentative ? "tentative" : "definite",
                   b.arrival.toIso(), b.departure.toIso(), b.roomsPerNight, b.cutoff.toIso(),
                   p.daysToCutoff, p.lead, p.blockedRoomNights, p.pickedRoomNights, p.share,
                   share(p.typical.median), share(p.typical.lowerQuartile), p.typical.blocks,
                   share(w.wash), p.expectedRoomNights, p.flag);
  }
}

void printWash(const cb::GroupModel &model, cb::Date asOf, std::FILE *notes) {
  std::set<std::string> segments;
  for (const auto &b : model.blocks())
    segments.insert(b.block.segment);
  segments.insert(""); // all segments
  fmt::print(notes,
             "wash by lead (share of the block not picked up at the lead that never "
             "stayed; past blocks departed by {}):\n",
             asOf.toIso());
  for (const auto &seg : segments) {
    std::string line = fmt::format("  {:<8}", seg.empty() ? "all" : seg);
    for (int lead : kLeads) {
      const cb::WashEstimate w = model.wash(seg, lead, asOf);
      line += w.wash ? fmt::format("  {:>3}d {:5.1f} % ({}{})", lead, 100 * *w.wash, w.blocks,
                                   w.pooled ? " all" : "")
                     : fmt::format("  {:>3}d    -", lead);
    }
    fmt::print(notes, "{}\n", line);
  }
}

void writeSplit(const cb::SplitForecast &f, fmt::memory_buffer &out) {
  const auto put = std::back_inserter(out);
  fmt::format_to(put, "night,weekday,capacity,group_blocked,group_otb,group,transient_otb,"
                      "transient,transient_lo,transient_hi,transient_sd,total,total_lo,total_hi,"
                      "capacity_left,transient_constrained,transient_spill,p_sellout,"
                      "constrained_total\n");
  for (const cb::SplitNight &n : f.nights)
    fmt::format_to(put,
                   "{},{},{},{},{},{:.2f},{},{:.2f},{},{},{:.2f},{:.2f},{},{},{:.2f},{:.2f},{:.2f},"
                   "{:.4f},{:.2f}\n",
                   n.night.toIso(), weekdayName(n.night), n.capacity, n.groupBlocked, n.groupOtb,
                   n.group, n.transientOtb, n.transient, num(n.lo), num(n.hi), n.transientSd,
                   n.total, num(n.totalLo), num(n.totalHi), n.capacityLeft, n.transientConstrained,
                   n.transientSpill, n.pSellout, n.constrainedTotal);
}

int runGroups(const GroupsArgs &a) {
  std::vector<cb::Reservation> rows;
  auto store = openWithRows(a.store, rows);
  const cb::Property property = store->property();
  const cb::Date asOf = *cb::Date::parseIso(a.asOf);
  const double tentative = property.settings.tentativeProbability;
  const cb::GroupModel model(store->blockRecords(), rows);
  fmt::memory_buffer out;
  std::FILE *notes = notesStream(a.out);
  if (a.backtestLead > 0) {
    const cb::GroupBacktest bt = cb::backtestGroups(rows, store->blockRecords(), asOf - 364, asOf,
                                                    a.backtestLead, tentative);
    fmt::format_to(std::back_inserter(out),
                   "lead: {}\nnights: {} ({} … {})\nmean_actual_group_rooms: {:.2f}\n"
                   "mean_expected_group_rooms: {:.2f}\nmae: {:.2f}\nbias: {:+.2f}\n"
                   "mae_whole_block: {:.2f}\nbias_whole_block: {:+.2f}\n"
                   "mae_picked_up_only: {:.2f}\nbias_picked_up_only: {:+.2f}\n",
                   bt.lead, bt.nights, (asOf - 364).toIso(), asOf.toIso(), bt.meanActual,
                   bt.meanExpected, bt.mae, bt.bias, bt.maeWholeBlock, bt.biasWholeBlock,
                   bt.maePickedUp, bt.biasPickedUp);
    emit(a.out, out);
    return kOk;
  }
  if (!a.curve.empty()) {
    const auto &blocks = model.blocks();
    auto it = std::find_if(blocks.begin(), blocks.end(),
                           [&](const cb::BlockRecord &b) { return b.block.id == a.curve; });
    if (it == blocks.end())
      throw CLI::ValidationError("--curve", "no block " + a.curve + " in the store");
    const auto i = static_cast<std::size_t>(it - blocks.begin());
    std::vector<int> leads;
    for (int lead = 0; lead <= 365; lead += lead < 30 ? 1 : lead < 90 ? 7 : 30)
      leads.push_back(lead);
    const auto put = std::back_inserter(out);
    fmt::format_to(put, "lead,date,share,typical_share,typical_lower_quartile,typical_blocks\n");
    for (const cb::PacePoint &p : cb::pickupCurve(model, i, asOf, leads))
      fmt::format_to(put, "{},{},{},{},{},{}\n", p.lead, (it->block.arrival - p.lead).toIso(),
                     share(p.share), share(p.typical.median), share(p.typical.lowerQuartile),
                     p.typical.blocks);
    emit(a.out, out);
    fmt::print(notes, "block {}: {} rooms a night, {} → {}, cutoff {}\n", it->block.id,
               it->block.roomsPerNight, it->block.arrival.toIso(), it->block.departure.toIso(),
               it->block.cutoff.toIso());
    return kOk;
  }
  if (a.split > 0) {
    cb::OutlookOptions o;
    o.asOf = asOf;
    o.days = a.split;
    o.method = a.method;
    if (a.naiveHistory)
      o.unconstrained = false;
    const cb::SplitForecast f = cb::computeSplitForecast(rows, store->blockRecords(), property,
                                                         censorSources(*store), store->events(), o);
    writeSplit(f, out);
    emit(a.out, out);
    fmt::print(notes,
               "split forecast as of {}: {} nights; transient by {} on reservations without a "
               "block; group = picked up + remaining block x (1 - wash at the lead) until the "
               "cutoff; tentative blocks at {:.0f} %\n",
               asOf.toIso(), f.nights.size(), f.method, 100 * tentative);
    return kOk;
  }
  writeBlocks(model, asOf, tentative, out);
  emit(a.out, out);
  printWash(model, asOf, notes);
  fmt::print(notes,
             "expected = picked up + remaining block x (1 - wash at the lead) until the cutoff, "
             "then picked up only; tentative blocks count at {:.0f} % (settings "
             "--tentative-probability). Flags: behind = below the median share past blocks had "
             "at the same lead, well behind = below their lower quartile, released = cutoff "
             "passed with rooms not picked up.\n",
             100 * tentative);
  return kOk;
}

} // namespace

void addGroupVerbs(CLI::App &app, VerbList &verbs) {
  auto ib = std::make_shared<ImportBlocksArgs>();
  auto *imp = app.add_subcommand(
      "import-blocks",
      "Import group blocks (one transaction). Native columns: block_id, name, segment, arrival, "
      "departure, rooms_per_night, cutoff, status (tentative or definite), contracted_on, "
      "room_type (name, segment, contracted_on and room_type may be left out). A block id "
      "already in the store is updated.");
  imp->add_option("STORE", ib->store, "Store file")->required()->check(CLI::ExistingFile);
  imp->add_option("FILE", ib->file, "Blocks CSV")->required();
  imp->add_option("--profile", ib->profile,
                  "native (default) or a JSON blocks profile (\"kind\": \"blocks\"; see "
                  "core/blockprofile.h)");
  auto *lenient =
      imp->add_flag("--lenient", ib->lenient, "Write the valid rows; report the rejects");
  imp->add_option("--rejects", ib->rejects, "With --lenient: copy rejected rows to this CSV")
      ->needs(lenient);
  verbs.push_back({imp, [ib] { return runImportBlocks(*ib); }});

  auto g = std::make_shared<GroupsArgs>();
  auto *cmd = app.add_subcommand(
      "groups",
      "Group blocks as of a reading date. Default: CSV of the blocks not yet departed (rooms "
      "blocked and picked up, share, the typical share of past blocks at the same lead, wash, "
      "expected room-nights, flag), the wash by lead on standard error. --split N: the group / "
      "transient split of the forecast for the next N nights (transient from the methods on "
      "reservations without a block, group from the blocks, total with the transient band, "
      "constrained figures on the capacity left after groups). --curve ID: one block's pickup "
      "curve. --backtest LEAD: expected group rooms read LEAD days ahead against the group "
      "rooms that stayed, over the 365 nights up to the reading date.");
  cmd->add_option("STORE", g->store, "Store file")->required()->check(CLI::ExistingFile);
  cmd->add_option("--as-of", g->asOf, "Reading date YYYY-MM-DD")->required()->check(dateCheck());
  auto *split = cmd->add_option("--split", g->split, "Split forecast of this many nights")
                    ->check(CLI::Range(1, 365));
  auto *curve = cmd->add_option("--curve", g->curve, "Pickup curve of this block id");
  auto *bt = cmd->add_option("--backtest", g->backtestLead,
                             "Backtest expected group rooms at this lead (days)")
                 ->check(CLI::Range(1, 365));
  split->excludes(curve)->excludes(bt);
  curve->excludes(bt);
  cmd->add_option("--method", g->method,
                  "Transient forecast method for --split (default " + g->method + ")");
  cmd->add_flag("--naive-history", g->naiveHistory,
                "--split: train on the transient finals as observed, not unconstrained");
  cmd->add_option("--out", g->out, "Write the output to this file instead of standard output");
  verbs.push_back({cmd, [g] { return runGroups(*g); }});
}

} // namespace cbcli
