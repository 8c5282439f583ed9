// The Property screen's model: the property, its reference lists and event notes as read from the
// store, and every edit as an undoable command that writes to the store (one transaction each).
// No widgets here; the screen (propertyeditorpanel.h) and the tests drive it.
//
// An edit is checked first; a refused edit returns the message (and emits `refused`) and writes
// nothing. A done edit is written, then put on the undo stack; undo writes the exact old values
// back, redo the new ones. After every write the model rereads the store and emits `changed` and
// `storeWritten` (the main window then reloads its session: capacity and settings move forecasts).
#pragma once

#include <QDate>
#include <QObject>
#include <QString>

#include <filesystem>
#include <functional>
#include <memory>
#include <vector>

class QUndoStack;

// Forward declarations only: moc of Qt 6.4 cannot parse the C++20 library headers core uses.
namespace cb {
struct Property;
struct RoomType;
struct Segment;
struct Channel;
struct StoredEvent;
class Store;
} // namespace cb

namespace cbui {

/// One pair of the holiday map: a night this year and the night last year it is paced against.
struct HolidayPair {
  QDate night;
  QDate lastYearNight;
  QDate defaultNight; ///< what the property's STLY alignment alone would give
  QString event;      ///< the event note the pair comes from
};

class PropertyEditModel : public QObject {
  Q_OBJECT
public:
  /// The screen's sections; a refusal names the section its message belongs to.
  enum Section { General, Capacity, RoomTypes, Segments, Channels, Seasons, Costs, Events };

  explicit PropertyEditModel(QObject *parent = nullptr);
  ~PropertyEditModel() override;

  /// Reads the store at `path`. Another path than before clears the undo history; the same path
  /// rereads it (after a session reload) and keeps the history. Returns the error message, or an
  /// empty string.
  QString setStorePath(const std::filesystem::path &path);
  bool hasStore() const;
  const std::filesystem::path &storePath() const;
  QUndoStack *undoStack() const { return undo_; }

  const cb::Property &property() const;
  const std::vector<cb::RoomType> &roomTypes() const;
  const std::vector<cb::Segment> &segments() const;
  const std::vector<cb::Channel> &channels() const;
  const std::vector<cb::StoredEvent> &events() const;
  /// Pairs derived from event notes with the same label a year apart (core/holidaymap.h), by
  /// night. They are not stored: edit the event notes to change them.
  std::vector<HolidayPair> holidayPairs() const;

  // Edits. Each returns an empty string when written and undoable, else the refusal message.
  QString setName(const QString &name);
  QString setCurrency(const QString &code);
  QString setCapacity(int rooms);
  QString setSelloutMargin(double share);
  QString setStlyCalendarDate(bool calendarDate);

  QString addCapacityChange(const QDate &from, int rooms, const QString &reason);
  QString editCapacityChange(int row, const QDate &from, int rooms, const QString &reason);
  QString removeCapacityChange(int row);

  QString addRoomType(const QString &code, const QString &name, int rooms);
  QString editRoomType(const QString &code, const QString &name, int rooms);
  QString removeRoomType(const QString &code);

  /// `colour` is "#rrggbb" from palette::segmentColours(), or empty.
  QString addSegment(const QString &code, const QString &name, int yieldRank,
                     const QString &colour);
  QString editSegment(const QString &code, const QString &name, int yieldRank,
                      const QString &colour);
  QString removeSegment(const QString &code);

  QString addChannel(const QString &code, const QString &name);
  QString editChannel(const QString &code, const QString &name);
  QString removeChannel(const QString &code);

  /// Shares of capacity (0.7 = 70 %).
  QString setSeasonBands(double shoulderFrom, double peakFrom);
  QString setWalkCost(double amount);
  QString setLateCancelDays(int days);
  QString setTentativeProbability(double probability);

  QString addEvent(const QDate &from, const QDate &to, const QString &label);
  QString editEvent(int row, const QDate &from, const QDate &to, const QString &label);
  QString removeEvent(int row);

signals:
  /// The model reread the store after a write (an edit, undo or redo) or a new path.
  void changed();
  /// An edit, undo or redo wrote to the store.
  void storeWritten();
  /// An edit was refused (nothing written), or an undo / redo failed.
  void refused(int section, const QString &message);

private:
  friend class StoreEditCommand;
  using Write = std::function<void(cb::Store &)>;
  /// Writes `redo` in one transaction; on success pushes a command whose undo is `undo`.
  QString run(Section section, const QString &text, Write redo, Write undo);
  QString runProperty(Section section, const QString &text, const cb::Property &after);
  QString refuse(Section section, const QString &message);
  /// Writes in one transaction and rereads; throws what the store threw.
  void write(const Write &w);
  void reread();

  struct Data;
  std::unique_ptr<Data> data_;
  std::filesystem::path path_;
  QUndoStack *undo_;
};

} // namespace cbui
