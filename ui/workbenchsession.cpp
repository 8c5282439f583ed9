#include "ui/workbenchsession.h"

#include "core/bookingcurve.h"

#include <stdexcept>

namespace cbui {

std::unique_ptr<WorkbenchSession> WorkbenchSession::open(const std::filesystem::path &store) {
  auto s = std::unique_ptr<WorkbenchSession>(new WorkbenchSession());
  auto db = cb::Store::open(store);
  s->path_ = store;
  s->property_ = db->property();
  s->segments_ = db->segments();
  s->reservations_ = std::make_shared<const std::vector<cb::Reservation>>(db->reservations());
  s->summary_ = db->summary(*s->reservations_); // from the rows in hand: no second pass
  s->nightIndex_ = std::make_shared<const cb::NightIndex>(*s->reservations_);
  s->bounds_ = cb::boundsOf(*s->reservations_);
  s->sources_ =
      std::make_shared<const cb::CensorSources>(cb::CensorSources{db->closures(), db->denials()});
  s->events_ = db->events();
  s->readingDate_ = s->summary_.lastActivity.value_or(cb::Date::fromYmd(2000, 1, 1));
  s->newest_ = s->readingDate_;
  s->firstBooked_ = s->summary_.firstBooked.value_or(s->readingDate_);
  return s;
}

void WorkbenchSession::setReadingDate(cb::Date date) {
  if (date > newest_)
    throw std::invalid_argument("reading date " + date.toIso() +
                                " is after the newest booking or cancellation (" + newest_.toIso() +
                                ")");
  if (date < firstBooked_)
    throw std::invalid_argument("reading date " + date.toIso() + " is before the first booking (" +
                                firstBooked_.toIso() + ")");
  readingDate_ = date;
}

cb::Date WorkbenchSession::defaultNight() const {
  cb::Date d = readingDate_ + 14;
  while (d.isoWeekday() != 6)
    ++d;
  return d;
}

NightCurves WorkbenchSession::curves(cb::Date night, int maxLead,
                                     const std::string &segment) const {
  NightCurves out;
  out.night = night;
  out.lastYearNight = property_.stlyNight(night);
  out.capacity = property_.capacityOn(night);
  int known = night - readingDate_; // leads below this are after the reading date: unknown
  if (known > 0)
    out.readingLead = known;
  auto fill = [&](CurveSeries &series, cb::Date n, int minLead) {
    cb::NightCurve c = cb::bookingCurve(reservationsCovering(n), n, maxLead, segment);
    for (int d = maxLead; d >= std::max(minLead, 0); --d) {
      series.x.push_back(-d);
      series.y.push_back(c.rooms[static_cast<std::size_t>(d)]);
    }
  };
  out.thisYear.label = "This year " + night.toIso();
  out.lastYear.label = "Last year " + out.lastYearNight.toIso();
  if (known <= maxLead)
    fill(out.thisYear, night, known);
  fill(out.lastYear, out.lastYearNight, out.lastYearNight - readingDate_);
  return out;
}

} // namespace cbui
