// The curve verbs: `curves` (OTB by night and lead) and `finals` (final and actual by night),
// both as CSV from the curve cube.
#include "app/cliverbs.h"

#include "app/clicommon.h"

#include "core/curvecube.h"
#include "core/nativeformat.h"
#include "core/store.h"

#include <fmt/compile.h>
#include <fmt/format.h>

#include <algorithm>
#include <cerrno>
#include <charconv>
#include <cstdio>
#include <cstring>
#include <memory>
#include <stdexcept>

namespace cbcli {
namespace {

struct CurvesArgs {
  std::string store, from, to, by = "total", asOf, out;
  int maxDba = 365;
};

/// Checks a YYYY-MM-DD argument while parsing, so a bad date is a usage error (exit 2).
const CLI::Validator kIsoDate(
    [](std::string &text) {
      return cb::Date::parseIso(text) ? std::string() : "not a date (YYYY-MM-DD): " + text;
    },
    "DATE");

std::optional<cb::Date> optionalDate(const std::string &text) {
  return text.empty() ? std::nullopt : cb::Date::parseIso(text);
}

/// The store and the range the cube is built over, with the documented defaults filled in.
struct Request {
  std::unique_ptr<CubeSource> source;
  cb::CubeOptions options;
  bool empty = false; ///< the default range holds no night with a known figure: header only
};

/// Defaults: as-of = the newest booking or cancellation; nights from the first night stayed to
/// the last night stayed, but no later than `lastUseful(asOf)` (beyond it nothing is known).
/// For the total, the kept cube knows these dates, so the reservations are not read.
template <class LastUseful>
Request prepare(const CurvesArgs &a, int maxDba, LastUseful lastUseful) {
  Request req;
  req.options.by = *cb::parseSeriesBy(a.by);
  req.source = std::make_unique<CubeSource>(a.store, req.options.by == cb::SeriesBy::Total);
  const auto &kept = req.source->kept();
  const cb::ReservationBounds bounds =
      kept ? kept->bounds : cb::boundsOf(req.source->reservations());
  const std::optional<cb::Date> newest = bounds.newest, firstNight = bounds.firstStay,
                                lastNight = bounds.lastStay;
  if (!newest)
    throw std::runtime_error(a.store + " has no reservations, so there are no curves yet");
  if (!firstNight)
    throw std::runtime_error(a.store + " has only day-use reservations, which occupy no night");
  const cb::Date asOf = optionalDate(a.asOf).value_or(*newest);
  req.options.asOf = optionalDate(a.asOf); // the cube refuses a date after the data
  req.options.firstNight = optionalDate(a.from).value_or(*firstNight);
  req.options.lastNight = optionalDate(a.to).value_or(std::min(*lastNight, lastUseful(asOf)));
  req.options.maxDba = maxDba;
  if (req.options.lastNight < req.options.firstNight) {
    if (!a.from.empty() && !a.to.empty())
      throw std::runtime_error(fmt::format("--from {} is after --to {}", a.from, a.to));
    // A default end before the start: e.g. a reading date before the first night stayed.
    req.empty = true;
  }
  if (req.options.asOf && *req.options.asOf > *newest)
    req.empty = false; // let the cube refuse the reading date with its message
  if (req.empty)
    req.options.lastNight = req.options.firstNight;
  return req;
}

/// Buffered CSV output to stdout or a file; close() reports a failed write.
class CsvOut {
public:
  explicit CsvOut(const std::string &path) : path_(path) {
    // Room for one chunk and the rows of one more night (366 of at most ~60 bytes), reserved
    // once: a buffer grown by doubling to 1 MB (the chunk until now) landed on fresh pages at
    // each step, some 750 page faults, about 10 ms of `curves` at a million bookings here.
    buf_.reserve(kChunk + (std::size_t{64} << 10));
    file_ = path.empty() ? stdout : std::fopen(path.c_str(), "wb");
    if (!file_)
      throw std::runtime_error(fmt::format("cannot write {}: {}", path, std::strerror(errno)));
  }
  ~CsvOut() {
    if (file_ && file_ != stdout)
      std::fclose(file_);
  }
  CsvOut(const CsvOut &) = delete;
  CsvOut &operator=(const CsvOut &) = delete;

  fmt::memory_buffer &buffer() { return buf_; }
  void flushIfFull() {
    if (buf_.size() >= kChunk)
      flush();
  }
  void close() {
    flush();
    bool ok = std::fflush(file_) == 0 && std::ferror(file_) == 0;
    if (file_ != stdout) {
      ok = std::fclose(file_) == 0 && ok;
      file_ = nullptr;
    }
    if (!ok)
      throw std::runtime_error("cannot write " + name());
  }

private:
  void flush() {
    if (!buf_.size())
      return;
    if (std::fwrite(buf_.data(), 1, buf_.size(), file_) != buf_.size())
      throw std::runtime_error(fmt::format("cannot write {}: {}", name(), std::strerror(errno)));
    buf_.clear();
  }
  std::string name() const { return path_.empty() ? "standard output" : path_; }
  static constexpr std::size_t kChunk = std::size_t{256} << 10; ///< bytes per write
  std::string path_;
  std::FILE *file_ = nullptr;
  fmt::memory_buffer buf_;
};

int runCurves(const CurvesArgs &a) {
  Request req = prepare(a, a.maxDba, [&](cb::Date asOf) { return asOf + a.maxDba; });
  const cb::CurveCube cube = req.source->cube(req.options);
  CsvOut out(a.out);
  fmt::format_to(std::back_inserter(out.buffer()), "stay_date,series,dba,otb_rooms,otb_revenue\n");
  if (req.empty) {
    out.close();
    return kOk;
  }
  std::vector<std::string> names;
  for (const auto &name : cube.series())
    names.push_back(csvText(name));
  // Each row written by hand: the "night,series," part once per night and series, the numbers
  // with std::to_chars. fmt's compiled formats took 45 ms of the 80 ms `curves` takes for a
  // million rows once the cube is kept (perf); this takes a quarter of that.
  std::string prefix;
  for (cb::Date s = cube.firstNight(); s <= cube.lastNight(); ++s) {
    const int firstKnown = std::max(0, s - cube.asOf());
    for (std::size_t i = 0; i < names.size(); ++i) {
      prefix = s.toIso() + ',' + names[i] + ',';
      for (int d = firstKnown; d <= cube.maxDba(); ++d) {
        char tail[64];
        char *p = std::to_chars(tail, tail + sizeof tail, d).ptr;
        *p++ = ',';
        p = std::to_chars(p, tail + sizeof tail, cube.otbRooms(i, s, d)).ptr;
        *p++ = ',';
        const std::int64_t micros = cube.otbRevenueMicros(i, s, d);
        if (micros >= 0 && micros % 10000 == 0) {
          // Whole cents (rates in cents, the usual case): the same text as {:.2f} of the
          // double, which is within far less than half a cent of it.
          const std::int64_t cents = micros / 10000;
          p = std::to_chars(p, tail + sizeof tail, cents / 100).ptr;
          *p++ = '.';
          *p++ = static_cast<char>('0' + cents % 100 / 10);
          *p++ = static_cast<char>('0' + cents % 10);
        } else { // at most 13 digits before the point: revenue is int64 millionths
          p = fmt::format_to(p, FMT_COMPILE("{:.2f}"), cube.otbRevenue(i, s, d) + 0.0);
        }
        *p++ = '\n';
        out.buffer().append(prefix.data(), prefix.data() + prefix.size());
        out.buffer().append(tail, p);
      }
      out.flushIfFull();
    }
  }
  out.close();
  return kOk;
}

int runFinals(const CurvesArgs &a) {
  Request req = prepare(a, 0, [](cb::Date asOf) { return asOf; });
  const cb::CurveCube cube = req.source->cube(req.options);
  CsvOut out(a.out);
  fmt::format_to(std::back_inserter(out.buffer()), "stay_date,series,final,actual\n");
  if (req.empty) {
    out.close();
    return kOk;
  }
  for (cb::Date s = cube.firstNight(); s <= std::min(cube.lastNight(), cube.asOf()); ++s) {
    const std::string night = s.toIso();
    for (std::size_t i = 0; i < cube.series().size(); ++i)
      fmt::format_to(std::back_inserter(out.buffer()), "{},{},{},{}\n", night,
                     csvText(cube.series()[i]), *cube.final(i, s), *cube.actual(i, s));
    out.flushIfFull();
  }
  out.close();
  return kOk;
}

void addCommonOptions(CLI::App *cmd, CurvesArgs &a, const std::string &toDefault) {
  cmd->add_option("STORE", a.store, "Store file")->required()->check(CLI::ExistingFile);
  cmd->add_option("--from", a.from,
                  "First stay night (default: the first night stayed in the store)")
      ->check(kIsoDate);
  cmd->add_option("--to", a.to, "Last stay night (default: " + toDefault + ")")->check(kIsoDate);
  cmd->add_option("--by", a.by,
                  "Series: total (default), or segment, channel, room-type — the total (series "
                  "ALL) followed by one series per code")
      ->check(CLI::IsMember({"total", "segment", "channel", "room-type"}));
  cmd->add_option("--as-of", a.asOf,
                  "Reading date: the data as it stood at the end of this day (default: the "
                  "newest booking or cancellation; a later date is refused)")
      ->check(kIsoDate);
  cmd->add_option("--out", a.out, "Write the CSV to this file (default: standard output)");
}

} // namespace

void addCurveVerbs(CLI::App &app, VerbList &verbs) {
  auto a = std::make_shared<CurvesArgs>();

  auto *curves = app.add_subcommand(
      "curves", "Booking curves as CSV: stay_date,series,dba,otb_rooms,otb_revenue — rooms and "
                "revenue on the books DBA days before each night, for the cells known at the "
                "reading date");
  addCommonOptions(curves, *a,
                   "the last night stayed, but no later than the reading date + max DBA, as "
                   "nothing later is known yet");
  curves
      ->add_option("--max-dba", a->maxDba,
                   "Longest lead in days (default 365); d = max holds everything booked that "
                   "far ahead or more")
      ->check(CLI::Range(0, 3650));
  verbs.push_back({curves, [a] { return runCurves(*a); }});

  auto *finals = app.add_subcommand(
      "finals", "Finals and actuals as CSV: stay_date,series,final,actual — rooms on the books "
                "on the night, and those less no-shows, for nights up to the reading date");
  addCommonOptions(finals, *a, "the last night stayed, but no later than the reading date");
  verbs.push_back({finals, [a] { return runFinals(*a); }});
}

} // namespace cbcli
