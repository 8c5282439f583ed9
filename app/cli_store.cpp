// The store verbs: init, import, info, sample.
#include "app/cliverbs.h"

#include "core/reservationimporter.h"
#include "core/samplestore.h"
#include "core/simulator.h"
#include "core/store.h"
#include "core/storereport.h"
#include "core/textformat.h"

#include <fmt/format.h>

#include <cstdio>
#include <memory>
#include <optional>

namespace cbcli {
namespace {

int runInit(const std::string &storePath, const std::string &name, int capacity,
            const std::string &currency) {
  cb::Property p;
  p.name = name;
  p.capacity = capacity;
  p.currency = currency;
  cb::Store::create(storePath, p);
  fmt::print("created {} for \"{}\" ({} rooms, {})\n", storePath, name, cb::formatCount(capacity),
             currency);
  return kOk;
}

int runImport(const std::string &storePath, const std::string &file, const std::string &profile,
              bool lenient, const std::string &rejects) {
  auto store = cb::Store::open(storePath);
  cb::ImportOptions opt;
  opt.profile = profile;
  opt.mode = lenient ? cb::ImportMode::Lenient : cb::ImportMode::Strict;
  if (!rejects.empty())
    opt.rejectsFile = rejects;
  cb::ImportReport rep = cb::importReservations(*store, file, opt);
  for (const auto &f : rep.findings)
    fmt::print(stderr, "{}\n", f.toString());
  const auto &l = rep.log;
  std::string verdict = "written";
  if (rep.cancelled)
    verdict = "cancelled, nothing written";
  else if (!rep.written && !lenient && l.rejected > 0 && !rep.ioOrUsageError)
    verdict = "nothing written (strict: fix the rows above, or use --lenient to write the valid "
              "rows)";
  else if (!rep.written)
    verdict = "nothing written";
  fmt::print("{}: read {} rows, added {}, updated {}, unchanged {}, rejected {} — {}\n", file,
             cb::formatCount(l.rowsRead), cb::formatCount(l.added), cb::formatCount(l.updated),
             cb::formatCount(l.unchanged), cb::formatCount(l.rejected), verdict);
  if (rep.written && !rejects.empty() && l.rejected > 0)
    fmt::print("rejected rows copied to {}\n", rejects);
  if (rep.ioOrUsageError)
    return kUsageOrIo;
  return cb::hasErrors(rep.findings) ? kFindings : kOk;
}

int runInfo(const std::string &storePath) {
  auto store = cb::Store::open(storePath);
  fmt::print("{}", cb::formatStoreInfo(*store));
  return kOk;
}

int runSample(const std::string &outDir, const std::string &storePath, const std::string &size) {
  // Simulated once: with --store the store builder writes the same files it imports.
  const cb::SimulatorConfig config =
      size == "1m" ? cb::millionBookingConfig() : cb::SimulatorConfig{};
  cb::SampleProperty sample = cb::simulateProperty(config);
  std::optional<cb::ImportReport> built;
  if (storePath.empty())
    cb::writeSampleFiles(sample, outDir);
  else
    built = cb::buildSampleStore(storePath, outDir, sample);
  fmt::print("wrote the sample property \"{}\" ({} reservations, as of {}) to {}\n",
             sample.property.name,
             cb::formatCount(static_cast<std::int64_t>(sample.reservations.size())),
             sample.readingDate.toIso(), outDir);
  if (built)
    fmt::print("built the store {} ({} reservations)\n", storePath,
               cb::formatCount(built->log.added));
  return kOk;
}

struct StoreArgs {
  std::string store, file, name, currency = "EUR", profile, rejects, outDir, sampleStore;
  std::string sampleSize = "sample";
  int capacity = 0;
  bool strict = false, lenient = false;
};

} // namespace

void addStoreVerbs(CLI::App &app, VerbList &verbs) {
  auto a = std::make_shared<StoreArgs>();

  auto *init = app.add_subcommand("init", "Create an empty store for one property");
  init->add_option("STORE", a->store, "Store file to create")->required();
  init->add_option("--name", a->name, "Property name")->required();
  init->add_option("--capacity", a->capacity, "Rooms available (1 to 100,000)")
      ->required()
      ->check(CLI::Range(1, 100000));
  init->add_option("--currency", a->currency, "ISO 4217 currency code (default EUR)");
  verbs.push_back({init, [a] { return runInit(a->store, a->name, a->capacity, a->currency); }});

  auto *imp = app.add_subcommand("import", "Import a reservation extract (one transaction)");
  imp->add_option("STORE", a->store, "Store file")->required()->check(CLI::ExistingFile);
  imp->add_option("FILE", a->file, "Reservation CSV")->required();
  imp->add_option(
      "--profile", a->profile,
      "Mapping profile: a shipped name (native, hotel-bookings-open-data) or a JSON path");
  auto *strictFlag =
      imp->add_flag("--strict", a->strict, "Any rejected row: write nothing (default)");
  auto *lenientFlag =
      imp->add_flag("--lenient", a->lenient, "Write the valid rows; report the rejects");
  lenientFlag->excludes(strictFlag);
  imp->add_option("--rejects", a->rejects, "With --lenient: copy rejected rows to this CSV")
      ->needs(lenientFlag);
  verbs.push_back(
      {imp, [a] { return runImport(a->store, a->file, a->profile, a->lenient, a->rejects); }});

  auto *info = app.add_subcommand("info", "Property, counts, date ranges and the import log");
  info->add_option("STORE", a->store, "Store file")->required()->check(CLI::ExistingFile);
  verbs.push_back({info, [a] { return runInfo(a->store); }});

  auto *sample = app.add_subcommand("sample", "Write the sample property's files (byte-identical)");
  sample->add_option("OUT_DIR", a->outDir, "Folder to write")->required();
  sample->add_option("--store", a->sampleStore, "Also build a ready store at this path");
  sample
      ->add_option("--size", a->sampleSize,
                   "sample (default: 150 rooms, ~55,000 reservations) or 1m (the benchmark "
                   "property: 600 rooms, five years, ~1,000,000 reservations, ~150 MB of CSV)")
      ->check(CLI::IsMember({"sample", "1m"}));
  verbs.push_back({sample, [a] { return runSample(a->outDir, a->sampleStore, a->sampleSize); }});
}

} // namespace cbcli
