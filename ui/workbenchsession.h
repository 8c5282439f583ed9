// The ui-side model layer: one open store and the figures screens show, without widgets,
// so everything a screen displays can be tested headless.
#pragma once

#include "core/nightindex.h"
#include "core/reservation.h"
#include "core/store.h"
#include "core/unconstrain.h"

#include <filesystem>
#include <memory>
#include <optional>
#include <string>
#include <vector>

namespace cbui {

/// A curve ready to draw: x = days before arrival (as negative numbers, arrival at 0),
/// y = rooms on the books.
struct CurveSeries {
  std::string label;
  std::vector<double> x;
  std::vector<double> y;
};

struct NightCurves {
  cb::Date night;
  cb::Date lastYearNight;
  CurveSeries thisYear; ///< only leads the data reaches (d ≥ night − reading date)
  CurveSeries lastYear;
  int capacity = 0;
  std::optional<int> readingLead; ///< lead of the reading date when the night is in the future
};

class WorkbenchSession {
public:
  /// Opens the store and loads its reservations; throws cb::StoreError.
  static std::unique_ptr<WorkbenchSession> open(const std::filesystem::path &store);

  const cb::Property &property() const { return property_; }
  const cb::StoreSummary &summary() const { return summary_; }
  const std::vector<cb::Segment> &segments() const { return segments_; }
  const std::filesystem::path &path() const { return path_; }
  /// Every reservation of the store, loaded once. Copies of the session share them (and the night
  /// index), so a background job's copy costs nothing at a million reservations.
  const std::vector<cb::Reservation> &reservations() const { return *reservations_; }
  /// The same pointer for this session and its copies, and for no other data while it is held:
  /// a screen keeps it beside what it computed from the reservations (a cube, say) to know
  /// whether that still fits the session it is given later.
  std::shared_ptr<const void> dataIdentity() const { return reservations_; }
  /// Which reservations cover each stay night (positions in reservations()).
  const cb::NightIndex &nightIndex() const { return *nightIndex_; }
  /// The reservations covering one stay night, in store order: a night's few hundred instead of
  /// a scan of them all (a million at a large property).
  std::vector<cb::Reservation> reservationsCovering(cb::Date night) const {
    return nightIndex_->reservationsCovering(*reservations_, night);
  }
  /// Newest activity and first arrivals of the reservations, found once when read (the forecast
  /// steps take them instead of a pass over a million reservations each).
  const cb::ReservationBounds &bounds() const { return bounds_; }
  /// Sales closures and denials/regrets: what unconstraining reads (core/unconstrain.h).
  const cb::CensorSources &censorSources() const { return *sources_; }
  const std::vector<cb::EventNote> &events() const { return events_; }
  /// The reading date every screen uses ("as of"); starts at the newest activity.
  cb::Date readingDate() const { return readingDate_; }
  /// Newest booking or cancellation date: the latest reading date the data supports.
  cb::Date newestActivity() const { return newest_; }
  /// Looks at the whole workbench as of an earlier date. Throws std::invalid_argument for a date
  /// after newestActivity() or before the first booking.
  void setReadingDate(cb::Date date);
  /// A sensible night to show first: the first Saturday two weeks or more after the reading date.
  cb::Date defaultNight() const;
  /// This year's and last year's (STLY alignment of the property) curve of `night`, leads
  /// 0…maxLead, for one segment or all (empty).
  NightCurves curves(cb::Date night, int maxLead, const std::string &segment = {}) const;

private:
  std::filesystem::path path_;
  cb::Property property_;
  cb::StoreSummary summary_;
  std::vector<cb::Segment> segments_;
  std::shared_ptr<const std::vector<cb::Reservation>> reservations_;
  std::shared_ptr<const cb::NightIndex> nightIndex_; ///< over reservations_, built once when read
  cb::ReservationBounds bounds_;                     ///< of reservations_
  std::shared_ptr<const cb::CensorSources> sources_; ///< shared by copies, as the reservations
  std::vector<cb::EventNote> events_;
  cb::Date readingDate_, newest_, firstBooked_;
};

} // namespace cbui
