// curvebench — the headless command line. Parsing and printing only; the work is in core.
#include "core/reservationimporter.h"
#include "core/samplestore.h"
#include "core/simulator.h"
#include "core/store.h"
#include "core/storereport.h"
#include "core/textformat.h"

#include <CLI/CLI.hpp>
#include <fmt/format.h>

#include <cstdio>
#include <iostream>

namespace {

// Exit codes (README): 0 ok, 1 data findings (rejected rows), 2 usage or I/O error.
constexpr int kOk = 0;
constexpr int kFindings = 1;
constexpr int kUsageOrIo = 2;

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

int runSample(const std::string &outDir, const std::string &storePath) {
  cb::SampleProperty sample = cb::simulateProperty();
  cb::writeSampleFiles(sample, outDir);
  fmt::print("wrote the sample property \"{}\" ({} reservations, as of {}) to {}\n",
             sample.property.name,
             cb::formatCount(static_cast<std::int64_t>(sample.reservations.size())),
             sample.readingDate.toIso(), outDir);
  if (!storePath.empty()) {
    auto rep = cb::buildSampleStore(storePath, outDir);
    fmt::print("built the store {} ({} reservations)\n", storePath, cb::formatCount(rep.log.added));
  }
  return kOk;
}

} // namespace

int main(int argc, char **argv) {
  CLI::App app{"curvebench — booking curves, forecasts and decisions for hotel revenue managers.\n"
               "Exit codes: 0 ok, 1 data findings (rejected rows), 2 usage or I/O error."};
  app.require_subcommand(1);
  app.set_version_flag("--version", std::string("curvebench ") + CURVEBENCH_VERSION);

  std::string store, file, name, currency = "EUR", profile, rejects, outDir, sampleStore;
  int capacity = 0;
  bool strict = false, lenient = false;

  auto *init = app.add_subcommand("init", "Create an empty store for one property");
  init->add_option("STORE", store, "Store file to create")->required();
  init->add_option("--name", name, "Property name")->required();
  init->add_option("--capacity", capacity, "Rooms available")
      ->required()
      ->check(CLI::PositiveNumber);
  init->add_option("--currency", currency, "ISO 4217 currency code (default EUR)");

  auto *imp = app.add_subcommand("import", "Import a reservation extract (one transaction)");
  imp->add_option("STORE", store, "Store file")->required()->check(CLI::ExistingFile);
  imp->add_option("FILE", file, "Reservation CSV")->required();
  imp->add_option(
      "--profile", profile,
      "Mapping profile: a shipped name (native, hotel-bookings-open-data) or a JSON path");
  auto *strictFlag = imp->add_flag("--strict", strict, "Any rejected row: write nothing (default)");
  auto *lenientFlag =
      imp->add_flag("--lenient", lenient, "Write the valid rows; report the rejects");
  lenientFlag->excludes(strictFlag);
  imp->add_option("--rejects", rejects, "With --lenient: copy rejected rows to this CSV")
      ->needs(lenientFlag);

  auto *info = app.add_subcommand("info", "Property, counts, date ranges and the import log");
  info->add_option("STORE", store, "Store file")->required()->check(CLI::ExistingFile);

  auto *sample = app.add_subcommand("sample", "Write the sample property's files (byte-identical)");
  sample->add_option("OUT_DIR", outDir, "Folder to write")->required();
  sample->add_option("--store", sampleStore, "Also build a ready store at this path");

  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError &e) {
    int rc = app.exit(e);
    return rc == 0 ? kOk : kUsageOrIo;
  }

  try {
    if (*init)
      return runInit(store, name, capacity, currency);
    if (*imp)
      return runImport(store, file, profile, lenient, rejects);
    if (*info)
      return runInfo(store);
    if (*sample)
      return runSample(outDir, sampleStore);
  } catch (const std::exception &e) {
    fmt::print(stderr, "curvebench: {}\n", e.what());
    return kUsageOrIo;
  }
  return kUsageOrIo;
}
