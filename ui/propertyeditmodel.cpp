#include "ui/propertyeditmodel.h"

#include "core/holidaymap.h"
#include "core/propertysettings.h"
#include "core/store.h"
#include "core/textformat.h"
#include "ui/palette.h"

#include <QRegularExpression>
#include <QUndoCommand>
#include <QUndoStack>

#include <algorithm>
#include <cmath>
#include <exception>
#include <optional>
#include <utility>

namespace cbui {

struct PropertyEditModel::Data {
  cb::Property property;
  std::vector<cb::RoomType> roomTypes;
  std::vector<cb::Segment> segments;
  std::vector<cb::Channel> channels;
  std::vector<cb::StoredEvent> events;
};

/// One edit on the undo stack. The first redo() (QUndoStack::push calls it) writes nothing: the
/// edit was written before it was pushed, so a failed write never reaches the stack.
class StoreEditCommand : public QUndoCommand {
public:
  StoreEditCommand(PropertyEditModel *model, int section, const QString &text,
                   PropertyEditModel::Write redo, PropertyEditModel::Write undo)
      : QUndoCommand(text), model_(model), section_(section), redo_(std::move(redo)),
        undo_(std::move(undo)) {}
  void redo() override {
    if (first_) {
      first_ = false;
      return;
    }
    apply(redo_, QStringLiteral("Redo"));
  }
  void undo() override { apply(undo_, QStringLiteral("Undo")); }

private:
  void apply(const PropertyEditModel::Write &w, const QString &what) {
    try {
      model_->write(w);
    } catch (const std::exception &e) {
      emit model_->refused(
          section_,
          QStringLiteral("%1 of “%2” failed: %3").arg(what, text(), QString::fromUtf8(e.what())));
    }
  }
  PropertyEditModel *model_;
  int section_;
  PropertyEditModel::Write redo_, undo_;
  bool first_ = true;
};

namespace {

std::string s(const QString &q) { return q.trimmed().toStdString(); }
QString q(const std::string &x) { return QString::fromStdString(x); }
cb::Date toDate(const QDate &d) {
  return cb::Date::fromYmd(d.year(), static_cast<unsigned>(d.month()),
                           static_cast<unsigned>(d.day()));
}
QDate toQDate(cb::Date d) {
  return QDate(d.year(), static_cast<int>(d.month()), static_cast<int>(d.day()));
}
QString percent(double share) { return QStringLiteral("%1 %").arg(share * 100.0, 0, 'f', 1); }

// A code as stored: trimmed, upper case, letters, digits, '-' and '_' only.
QString codeProblem(const QString &code, const QString &what) {
  static const QRegularExpression valid(QStringLiteral("^[A-Z0-9_-]{1,20}$"));
  if (code.trimmed().isEmpty())
    return QStringLiteral("A %1 needs a code").arg(what);
  if (!valid.match(code.trimmed().toUpper()).hasMatch())
    return QStringLiteral("A %1 code has 1 to 20 letters, digits, “-” or “_”").arg(what);
  return {};
}

QString colourProblem(const QString &colour) {
  if (colour.isEmpty())
    return {};
  for (const auto &c : palette::segmentColours())
    if (colour.compare(QLatin1String(c.hex), Qt::CaseInsensitive) == 0)
      return {};
  return QStringLiteral("Pick a colour from the colour-blind-safe list");
}

QString capacityChangeProblem(const std::vector<cb::CapacityChange> &changes) {
  for (std::size_t i = 0; i < changes.size(); ++i) {
    if (changes[i].rooms < 0)
      return QStringLiteral("Rooms cannot be negative (0 closes the hotel from that date)");
    for (std::size_t j = 0; j < i; ++j)
      if (changes[i].from == changes[j].from)
        return QStringLiteral("There is already a capacity change dated %1")
            .arg(toQDate(changes[i].from).toString(QStringLiteral("d MMM yyyy")));
  }
  return {};
}

QString eventProblem(const QDate &from, const QDate &to, const QString &label) {
  if (!from.isValid() || !to.isValid())
    return QStringLiteral("An event needs a first and a last day");
  if (to < from)
    return QStringLiteral("The last day is before the first day");
  if (label.trimmed().isEmpty())
    return QStringLiteral("An event needs a label (the same label a year apart pairs the nights)");
  return {};
}

template <class T> std::optional<T> findCode(const std::vector<T> &list, const std::string &code) {
  for (const auto &x : list)
    if (x.code == code)
      return x;
  return std::nullopt;
}

} // namespace

PropertyEditModel::PropertyEditModel(QObject *parent)
    : QObject(parent), data_(std::make_unique<Data>()), undo_(new QUndoStack(this)) {}

PropertyEditModel::~PropertyEditModel() = default;

QString PropertyEditModel::setStorePath(const std::filesystem::path &path) {
  if (path != path_) {
    undo_->clear();
    path_ = path;
  }
  try {
    reread();
  } catch (const std::exception &e) {
    *data_ = Data{};
    emit changed();
    return QString::fromUtf8(e.what());
  }
  emit changed();
  return {};
}

bool PropertyEditModel::hasStore() const { return !path_.empty(); }
const std::filesystem::path &PropertyEditModel::storePath() const { return path_; }
const cb::Property &PropertyEditModel::property() const { return data_->property; }
const std::vector<cb::RoomType> &PropertyEditModel::roomTypes() const { return data_->roomTypes; }
const std::vector<cb::Segment> &PropertyEditModel::segments() const { return data_->segments; }
const std::vector<cb::Channel> &PropertyEditModel::channels() const { return data_->channels; }
const std::vector<cb::StoredEvent> &PropertyEditModel::events() const { return data_->events; }

std::vector<HolidayPair> PropertyEditModel::holidayPairs() const {
  std::vector<cb::EventNote> notes;
  for (const auto &e : data_->events)
    notes.push_back(e.note);
  const auto map = cb::HolidayMap::fromEvents(notes);
  std::vector<HolidayPair> out;
  for (const auto &[night, last] : map.pairs()) {
    HolidayPair p{toQDate(night), toQDate(last), toQDate(data_->property.stlyNight(night)), {}};
    for (const auto &n : notes) // the first note covering the night, as fromEvents() pairs it
      if (n.from <= night && night <= n.to) {
        p.event = q(n.label);
        break;
      }
    out.push_back(p);
  }
  return out;
}

void PropertyEditModel::reread() {
  auto store = cb::Store::open(path_);
  Data d;
  d.property = store->property();
  d.roomTypes = store->roomTypes();
  d.segments = store->segments();
  d.channels = store->channels();
  d.events = store->storedEvents();
  *data_ = std::move(d);
}

void PropertyEditModel::write(const Write &w) {
  {
    auto store = cb::Store::open(path_);
    cb::Store::Transaction tx(*store);
    w(*store);
    tx.commit();
  }
  reread();
  emit changed();
  emit storeWritten();
}

QString PropertyEditModel::refuse(Section section, const QString &message) {
  emit refused(section, message);
  return message;
}

QString PropertyEditModel::run(Section section, const QString &text, Write redo, Write undo) {
  if (!hasStore())
    return refuse(section, QStringLiteral("Open a store first"));
  try {
    write(redo);
  } catch (const std::exception &e) {
    return refuse(section, QString::fromUtf8(e.what()));
  }
  undo_->push(new StoreEditCommand(this, section, text, std::move(redo), std::move(undo)));
  return {};
}

QString PropertyEditModel::runProperty(Section section, const QString &text,
                                       const cb::Property &after) {
  if (auto msg = cb::validateSettings(after.settings); !msg.empty())
    return refuse(section, q(msg)); // backstop: the setters check their own values first
  const cb::Property before = data_->property;
  return run(
      section, text, [after](cb::Store &st) { st.setProperty(after); },
      [before](cb::Store &st) { st.setProperty(before); });
}

// ---- general ---------------------------------------------------------------------------------

QString PropertyEditModel::setName(const QString &name) {
  if (name.trimmed().isEmpty())
    return refuse(General, QStringLiteral("The property needs a name"));
  cb::Property p = data_->property;
  p.name = s(name);
  return runProperty(General, QStringLiteral("rename the property"), p);
}

QString PropertyEditModel::setCurrency(const QString &code) {
  static const QRegularExpression iso(QStringLiteral("^[A-Z]{3}$"));
  const QString c = code.trimmed().toUpper();
  if (!iso.match(c).hasMatch())
    return refuse(General, QStringLiteral("A currency is a three-letter code such as EUR or CHF"));
  cb::Property p = data_->property;
  p.currency = c.toStdString();
  return runProperty(General, QStringLiteral("currency %1").arg(c), p);
}

QString PropertyEditModel::setCapacity(int rooms) {
  if (rooms < 0)
    return refuse(General, QStringLiteral("Capacity cannot be negative"));
  if (rooms == 0)
    return refuse(General, QStringLiteral("The base capacity needs at least 1 room (a dated "
                                          "change to 0 rooms closes the hotel for a while)"));
  cb::Property p = data_->property;
  p.capacity = rooms;
  return runProperty(General, QStringLiteral("capacity %1 rooms").arg(q(cb::formatCount(rooms))),
                     p);
}

QString PropertyEditModel::setSelloutMargin(double share) {
  if (!std::isfinite(share) || share < 0 || share > 0.25)
    return refuse(General, QStringLiteral("The sell-out margin is between 0 % and 25 % of "
                                          "capacity"));
  cb::Property p = data_->property;
  p.selloutMargin = share;
  return runProperty(General, QStringLiteral("sell-out margin %1").arg(percent(share)), p);
}

QString PropertyEditModel::setStlyCalendarDate(bool calendarDate) {
  cb::Property p = data_->property;
  p.stly = calendarDate ? cb::StlyAlignment::CalendarDate : cb::StlyAlignment::Weekday364;
  return runProperty(General,
                     calendarDate ? QStringLiteral("STLY by calendar date")
                                  : QStringLiteral("STLY by weekday (364 days)"),
                     p);
}

// ---- capacity changes ------------------------------------------------------------------------

QString PropertyEditModel::addCapacityChange(const QDate &from, int rooms, const QString &reason) {
  if (!from.isValid())
    return refuse(Capacity, QStringLiteral("A capacity change needs a date"));
  cb::Property p = data_->property;
  p.capacityChanges.push_back({toDate(from), rooms, s(reason)});
  if (auto msg = capacityChangeProblem(p.capacityChanges); !msg.isEmpty())
    return refuse(Capacity, msg);
  std::sort(p.capacityChanges.begin(), p.capacityChanges.end(),
            [](const auto &a, const auto &b) { return a.from < b.from; });
  return runProperty(Capacity, QStringLiteral("add capacity change"), p);
}

QString PropertyEditModel::editCapacityChange(int row, const QDate &from, int rooms,
                                              const QString &reason) {
  cb::Property p = data_->property;
  if (row < 0 || row >= static_cast<int>(p.capacityChanges.size()))
    return refuse(Capacity, QStringLiteral("No such capacity change"));
  if (!from.isValid())
    return refuse(Capacity, QStringLiteral("A capacity change needs a date"));
  p.capacityChanges[static_cast<std::size_t>(row)] = {toDate(from), rooms, s(reason)};
  if (auto msg = capacityChangeProblem(p.capacityChanges); !msg.isEmpty())
    return refuse(Capacity, msg);
  std::sort(p.capacityChanges.begin(), p.capacityChanges.end(),
            [](const auto &a, const auto &b) { return a.from < b.from; });
  return runProperty(Capacity, QStringLiteral("edit capacity change"), p);
}

QString PropertyEditModel::removeCapacityChange(int row) {
  cb::Property p = data_->property;
  if (row < 0 || row >= static_cast<int>(p.capacityChanges.size()))
    return refuse(Capacity, QStringLiteral("Select the capacity change to remove"));
  p.capacityChanges.erase(p.capacityChanges.begin() + row);
  return runProperty(Capacity, QStringLiteral("remove capacity change"), p);
}

// ---- room types, segments, channels ----------------------------------------------------------

QString PropertyEditModel::addRoomType(const QString &code, const QString &name, int rooms) {
  if (auto msg = codeProblem(code, QStringLiteral("room type")); !msg.isEmpty())
    return refuse(RoomTypes, msg);
  const cb::RoomType r{code.trimmed().toUpper().toStdString(), s(name), rooms};
  if (findCode(data_->roomTypes, r.code))
    return refuse(RoomTypes, QStringLiteral("Room type %1 exists already").arg(q(r.code)));
  if (rooms < 0)
    return refuse(RoomTypes, QStringLiteral("Rooms cannot be negative"));
  return run(
      RoomTypes, QStringLiteral("add room type %1").arg(q(r.code)),
      [r](cb::Store &st) { st.upsertRoomType(r); },
      [r](cb::Store &st) { st.deleteRoomType(r.code); });
}

QString PropertyEditModel::editRoomType(const QString &code, const QString &name, int rooms) {
  const auto before = findCode(data_->roomTypes, s(code));
  if (!before)
    return refuse(RoomTypes, QStringLiteral("No room type %1").arg(code));
  if (rooms < 0)
    return refuse(RoomTypes, QStringLiteral("Rooms cannot be negative"));
  const cb::RoomType after{before->code, s(name), rooms};
  return run(
      RoomTypes, QStringLiteral("edit room type %1").arg(q(after.code)),
      [after](cb::Store &st) { st.upsertRoomType(after); },
      [b = *before](cb::Store &st) { st.upsertRoomType(b); });
}

QString PropertyEditModel::removeRoomType(const QString &code) {
  const auto before = findCode(data_->roomTypes, s(code));
  if (!before)
    return refuse(RoomTypes, QStringLiteral("Select the room type to remove"));
  return run(
      RoomTypes, QStringLiteral("remove room type %1").arg(q(before->code)),
      [c = before->code](cb::Store &st) { st.deleteRoomType(c); },
      [b = *before](cb::Store &st) { st.upsertRoomType(b); });
}

QString PropertyEditModel::addSegment(const QString &code, const QString &name, int yieldRank,
                                      const QString &colour) {
  if (auto msg = codeProblem(code, QStringLiteral("segment")); !msg.isEmpty())
    return refuse(Segments, msg);
  const cb::Segment g{code.trimmed().toUpper().toStdString(), s(name), yieldRank,
                      colour.toUpper().toStdString()};
  if (findCode(data_->segments, g.code))
    return refuse(Segments, QStringLiteral("Segment %1 exists already").arg(q(g.code)));
  if (yieldRank < 0)
    return refuse(Segments, QStringLiteral("The yield rank is 1 (highest-paying) or more; 0 = "
                                           "not ranked"));
  if (auto msg = colourProblem(colour); !msg.isEmpty())
    return refuse(Segments, msg);
  return run(
      Segments, QStringLiteral("add segment %1").arg(q(g.code)),
      [g](cb::Store &st) { st.upsertSegment(g); },
      [g](cb::Store &st) { st.deleteSegment(g.code); });
}

QString PropertyEditModel::editSegment(const QString &code, const QString &name, int yieldRank,
                                       const QString &colour) {
  const auto before = findCode(data_->segments, s(code));
  if (!before)
    return refuse(Segments, QStringLiteral("No segment %1").arg(code));
  if (yieldRank < 0)
    return refuse(Segments, QStringLiteral("The yield rank is 1 (highest-paying) or more; 0 = "
                                           "not ranked"));
  if (auto msg = colourProblem(colour); !msg.isEmpty())
    return refuse(Segments, msg);
  const cb::Segment after{before->code, s(name), yieldRank, colour.toUpper().toStdString()};
  return run(
      Segments, QStringLiteral("edit segment %1").arg(q(after.code)),
      [after](cb::Store &st) { st.upsertSegment(after); },
      [b = *before](cb::Store &st) { st.upsertSegment(b); });
}

QString PropertyEditModel::removeSegment(const QString &code) {
  const auto before = findCode(data_->segments, s(code));
  if (!before)
    return refuse(Segments, QStringLiteral("Select the segment to remove"));
  return run(
      Segments, QStringLiteral("remove segment %1").arg(q(before->code)),
      [c = before->code](cb::Store &st) { st.deleteSegment(c); },
      [b = *before](cb::Store &st) { st.upsertSegment(b); });
}

QString PropertyEditModel::addChannel(const QString &code, const QString &name) {
  if (auto msg = codeProblem(code, QStringLiteral("channel")); !msg.isEmpty())
    return refuse(Channels, msg);
  const cb::Channel c{code.trimmed().toUpper().toStdString(), s(name)};
  if (findCode(data_->channels, c.code))
    return refuse(Channels, QStringLiteral("Channel %1 exists already").arg(q(c.code)));
  return run(
      Channels, QStringLiteral("add channel %1").arg(q(c.code)),
      [c](cb::Store &st) { st.upsertChannel(c); },
      [c](cb::Store &st) { st.deleteChannel(c.code); });
}

QString PropertyEditModel::editChannel(const QString &code, const QString &name) {
  const auto before = findCode(data_->channels, s(code));
  if (!before)
    return refuse(Channels, QStringLiteral("No channel %1").arg(code));
  const cb::Channel after{before->code, s(name)};
  return run(
      Channels, QStringLiteral("edit channel %1").arg(q(after.code)),
      [after](cb::Store &st) { st.upsertChannel(after); },
      [b = *before](cb::Store &st) { st.upsertChannel(b); });
}

QString PropertyEditModel::removeChannel(const QString &code) {
  const auto before = findCode(data_->channels, s(code));
  if (!before)
    return refuse(Channels, QStringLiteral("Select the channel to remove"));
  return run(
      Channels, QStringLiteral("remove channel %1").arg(q(before->code)),
      [c = before->code](cb::Store &st) { st.deleteChannel(c); },
      [b = *before](cb::Store &st) { st.upsertChannel(b); });
}

// ---- seasons and costs -----------------------------------------------------------------------

QString PropertyEditModel::setSeasonBands(double shoulderFrom, double peakFrom) {
  if (!std::isfinite(shoulderFrom) || !std::isfinite(peakFrom) || shoulderFrom <= 0 ||
      peakFrom > 2.0)
    return refuse(Seasons, QStringLiteral("Bands lie between 1 % and 200 % of capacity"));
  if (peakFrom < shoulderFrom)
    return refuse(Seasons, QStringLiteral("Peak starts at %1, below shoulder at %2: peak must "
                                          "start at or above shoulder")
                               .arg(percent(peakFrom), percent(shoulderFrom)));
  cb::Property p = data_->property;
  p.settings.seasons.shoulderFrom = shoulderFrom;
  p.settings.seasons.peakFrom = peakFrom;
  return runProperty(
      Seasons, QStringLiteral("season bands %1 / %2").arg(percent(shoulderFrom), percent(peakFrom)),
      p);
}

QString PropertyEditModel::setWalkCost(double amount) {
  if (!std::isfinite(amount) || amount < 0)
    return refuse(Costs, QStringLiteral("The walk cost cannot be negative (0 = not set)"));
  cb::Property p = data_->property;
  p.settings.walkCost = amount;
  return runProperty(Costs, QStringLiteral("walk cost"), p);
}

QString PropertyEditModel::setLateCancelDays(int days) {
  if (days < 0 || days > 365)
    return refuse(Costs, QStringLiteral("Late-cancel days lie between 0 and 365"));
  cb::Property p = data_->property;
  p.settings.lateCancelDays = days;
  return runProperty(Costs, QStringLiteral("late-cancel days %1").arg(days), p);
}

QString PropertyEditModel::setTentativeProbability(double probability) {
  if (!std::isfinite(probability) || probability < 0 || probability > 1)
    return refuse(Costs, QStringLiteral("A probability lies between 0 % and 100 %"));
  cb::Property p = data_->property;
  p.settings.tentativeProbability = probability;
  return runProperty(Costs, QStringLiteral("tentative groups count %1").arg(percent(probability)),
                     p);
}

// ---- events ----------------------------------------------------------------------------------

QString PropertyEditModel::addEvent(const QDate &from, const QDate &to, const QString &label) {
  if (auto msg = eventProblem(from, to, label); !msg.isEmpty())
    return refuse(Events, msg);
  const cb::EventNote e{toDate(from), toDate(to), s(label)};
  // The id the store will give, so undo deletes this note and redo puts it back under it.
  auto id = std::make_shared<std::int64_t>(0);
  return run(
      Events, QStringLiteral("add event %1").arg(q(e.label)),
      [e, id](cb::Store &st) {
        if (*id == 0)
          *id = st.addEvent(e);
        else
          st.putEvent(*id, e);
      },
      [id](cb::Store &st) { st.deleteEvent(*id); });
}

QString PropertyEditModel::editEvent(int row, const QDate &from, const QDate &to,
                                     const QString &label) {
  if (row < 0 || row >= static_cast<int>(data_->events.size()))
    return refuse(Events, QStringLiteral("No such event note"));
  if (auto msg = eventProblem(from, to, label); !msg.isEmpty())
    return refuse(Events, msg);
  const cb::StoredEvent before = data_->events[static_cast<std::size_t>(row)];
  const cb::EventNote after{toDate(from), toDate(to), s(label)};
  return run(
      Events, QStringLiteral("edit event %1").arg(q(after.label)),
      [id = before.id, after](cb::Store &st) { st.putEvent(id, after); },
      [before](cb::Store &st) { st.putEvent(before.id, before.note); });
}

QString PropertyEditModel::removeEvent(int row) {
  if (row < 0 || row >= static_cast<int>(data_->events.size()))
    return refuse(Events, QStringLiteral("Select the event note to remove"));
  const cb::StoredEvent before = data_->events[static_cast<std::size_t>(row)];
  return run(
      Events, QStringLiteral("remove event %1").arg(q(before.note.label)),
      [id = before.id](cb::Store &st) { st.deleteEvent(id); },
      [before](cb::Store &st) { st.putEvent(before.id, before.note); });
}

} // namespace cbui
