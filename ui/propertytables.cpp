#include "ui/propertytables.h"

#include "core/store.h"
#include "core/textformat.h"
#include "ui/palette.h"
#include "ui/propertyeditmodel.h"

#include <QColor>

namespace cbui {
namespace {

QString q(const std::string &x) { return QString::fromStdString(x); }
QDate toQDate(cb::Date d) {
  return QDate(d.year(), static_cast<int>(d.month()), static_cast<int>(d.day()));
}
const QString kDateFormat = QStringLiteral("ddd d MMM yyyy");
QString day(const QDate &d) { return d.toString(kDateFormat); }

QString colourName(const std::string &hex) {
  if (hex.empty())
    return QStringLiteral("(none)");
  for (const auto &c : palette::segmentColours())
    if (q(hex).compare(QLatin1String(c.hex), Qt::CaseInsensitive) == 0)
      return QString::fromUtf8(c.name);
  return q(hex);
}

} // namespace

PropertyTableModel::PropertyTableModel(Kind kind, PropertyEditModel *model, QObject *parent)
    : QAbstractTableModel(parent), kind_(kind), model_(model) {
  if (kind_ == HolidayPairs)
    pairs_ = model_->holidayPairs();
  connect(model_, &PropertyEditModel::changed, this, [this] {
    beginResetModel();
    if (kind_ == HolidayPairs)
      pairs_ = model_->holidayPairs();
    endResetModel();
  });
}

QString PropertyTableModel::code(int row) const {
  if (row < 0 || row >= rowCount())
    return {};
  const auto r = static_cast<std::size_t>(row);
  switch (kind_) {
  case RoomTypes: return q(model_->roomTypes()[r].code);
  case Segments: return q(model_->segments()[r].code);
  case Channels: return q(model_->channels()[r].code);
  default: return {};
  }
}

int PropertyTableModel::rowCount(const QModelIndex &parent) const {
  if (parent.isValid())
    return 0;
  switch (kind_) {
  case CapacityChanges: return static_cast<int>(model_->property().capacityChanges.size());
  case RoomTypes: return static_cast<int>(model_->roomTypes().size());
  case Segments: return static_cast<int>(model_->segments().size());
  case Channels: return static_cast<int>(model_->channels().size());
  case Events: return static_cast<int>(model_->events().size());
  case HolidayPairs: return static_cast<int>(pairs_.size());
  }
  return 0;
}

int PropertyTableModel::columnCount(const QModelIndex &parent) const {
  if (parent.isValid())
    return 0;
  switch (kind_) {
  case CapacityChanges:
  case RoomTypes: return 3;
  case Segments:
  case Events:
  case HolidayPairs: return 4;
  case Channels: return 2;
  }
  return 0;
}

QVariant PropertyTableModel::headerData(int section, Qt::Orientation orientation, int role) const {
  if (orientation != Qt::Horizontal || role != Qt::DisplayRole)
    return {};
  static const QStringList capacity{QStringLiteral("From night"), QStringLiteral("Rooms"),
                                    QStringLiteral("Reason")};
  static const QStringList rooms{QStringLiteral("Code"), QStringLiteral("Name"),
                                 QStringLiteral("Rooms")};
  static const QStringList segments{QStringLiteral("Code"), QStringLiteral("Name"),
                                    QStringLiteral("Yield rank"), QStringLiteral("Colour")};
  static const QStringList channels{QStringLiteral("Code"), QStringLiteral("Name")};
  static const QStringList events{QStringLiteral("First day"), QStringLiteral("Last day"),
                                  QStringLiteral("Event"), QStringLiteral("Nights")};
  static const QStringList pairs{QStringLiteral("Night this year"), QStringLiteral("Paced against"),
                                 QStringLiteral("Event"), QStringLiteral("Without the pair")};
  const QStringList *names = nullptr;
  switch (kind_) {
  case CapacityChanges: names = &capacity; break;
  case RoomTypes: names = &rooms; break;
  case Segments: names = &segments; break;
  case Channels: names = &channels; break;
  case Events: names = &events; break;
  case HolidayPairs: names = &pairs; break;
  }
  return section >= 0 && section < names->size() ? names->at(section) : QVariant();
}

Qt::ItemFlags PropertyTableModel::flags(const QModelIndex &index) const {
  if (!index.isValid())
    return Qt::NoItemFlags;
  Qt::ItemFlags f = Qt::ItemIsEnabled | Qt::ItemIsSelectable;
  const bool codeColumn =
      (kind_ == RoomTypes || kind_ == Segments || kind_ == Channels) && index.column() == 0;
  const bool derived = kind_ == HolidayPairs || (kind_ == Events && index.column() == 3);
  if (!codeColumn && !derived)
    f |= Qt::ItemIsEditable;
  return f;
}

QVariant PropertyTableModel::data(const QModelIndex &index, int role) const {
  if (!index.isValid() || index.row() >= rowCount())
    return {};
  const auto r = static_cast<std::size_t>(index.row());
  const int c = index.column();
  const bool show = role == Qt::DisplayRole, edit = role == Qt::EditRole;
  const bool numeric = (kind_ == CapacityChanges && c == 1) || (kind_ == RoomTypes && c == 2) ||
                       (kind_ == Segments && c == 2) || (kind_ == Events && c == 3);
  if (role == Qt::TextAlignmentRole && numeric)
    return QVariant::fromValue(Qt::AlignRight | Qt::AlignVCenter);
  switch (kind_) {
  case CapacityChanges: {
    const auto &x = model_->property().capacityChanges[r];
    if (c == 0 && (show || edit))
      return show ? QVariant(day(toQDate(x.from))) : QVariant(toQDate(x.from));
    if (c == 1 && (show || edit))
      return show ? QVariant(q(cb::formatCount(x.rooms))) : QVariant(x.rooms);
    if (c == 2 && (show || edit))
      return q(x.reason);
    break;
  }
  case RoomTypes: {
    const auto &x = model_->roomTypes()[r];
    if (show || edit) {
      if (c == 0)
        return q(x.code);
      if (c == 1)
        return q(x.name);
      return show ? QVariant(q(cb::formatCount(x.rooms))) : QVariant(x.rooms);
    }
    break;
  }
  case Segments: {
    const auto &x = model_->segments()[r];
    if (c == 3) {
      if (role == Qt::DecorationRole && !x.colour.empty())
        return QColor(q(x.colour));
      if (role == ColourRole || edit)
        return q(x.colour);
      if (show)
        return colourName(x.colour);
      break;
    }
    if (show || edit) {
      if (c == 0)
        return q(x.code);
      if (c == 1)
        return q(x.name);
      if (show && x.yieldRank == 0)
        return QStringLiteral("not ranked");
      return x.yieldRank;
    }
    if (role == Qt::ToolTipRole && c == 2)
      return QStringLiteral("1 = the highest-paying segment; 0 = not ranked");
    break;
  }
  case Channels: {
    const auto &x = model_->channels()[r];
    if (show || edit)
      return c == 0 ? q(x.code) : q(x.name);
    break;
  }
  case Events: {
    const auto &x = model_->events()[r].note;
    if (c == 0 && (show || edit))
      return show ? QVariant(day(toQDate(x.from))) : QVariant(toQDate(x.from));
    if (c == 1 && (show || edit))
      return show ? QVariant(day(toQDate(x.to))) : QVariant(toQDate(x.to));
    if (c == 2 && (show || edit))
      return q(x.label);
    if (c == 3 && show)
      return (x.to - x.from) + 1;
    break;
  }
  case HolidayPairs: {
    if (!show)
      break;
    const auto &x = pairs_[r];
    if (c == 0)
      return day(x.night);
    if (c == 1)
      return day(x.lastYearNight);
    if (c == 2)
      return x.event;
    return day(x.defaultNight);
  }
  }
  return {};
}

bool PropertyTableModel::setData(const QModelIndex &index, const QVariant &value, int role) {
  if (role != Qt::EditRole || !index.isValid() || !(flags(index) & Qt::ItemIsEditable))
    return false;
  const auto r = static_cast<std::size_t>(index.row());
  const int c = index.column();
  auto toInt = [&](int fallback) {
    bool ok = false;
    const int v = value.toInt(&ok);
    return ok ? v : fallback;
  };
  QString refusal;
  switch (kind_) {
  case CapacityChanges: {
    const auto &x = model_->property().capacityChanges[r];
    QDate from = toQDate(x.from);
    int rooms = x.rooms;
    QString reason = q(x.reason);
    if (c == 0)
      from = value.toDate();
    else if (c == 1)
      rooms = toInt(-1);
    else
      reason = value.toString();
    refusal = model_->editCapacityChange(index.row(), from, rooms, reason);
    break;
  }
  case RoomTypes: {
    const auto &x = model_->roomTypes()[r];
    refusal = model_->editRoomType(q(x.code), c == 1 ? value.toString() : q(x.name),
                                   c == 2 ? toInt(-1) : x.rooms);
    break;
  }
  case Segments: {
    const auto &x = model_->segments()[r];
    refusal = model_->editSegment(q(x.code), c == 1 ? value.toString() : q(x.name),
                                  c == 2 ? toInt(-1) : x.yieldRank,
                                  c == 3 ? value.toString() : q(x.colour));
    break;
  }
  case Channels: {
    const auto &x = model_->channels()[r];
    refusal = model_->editChannel(q(x.code), value.toString());
    break;
  }
  case Events: {
    const auto &x = model_->events()[r].note;
    refusal = model_->editEvent(index.row(), c == 0 ? value.toDate() : toQDate(x.from),
                                c == 1 ? value.toDate() : toQDate(x.to),
                                c == 2 ? value.toString() : q(x.label));
    break;
  }
  case HolidayPairs: return false;
  }
  return refusal.isEmpty();
}

} // namespace cbui
