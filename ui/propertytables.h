// The Property screen's lists as table models over PropertyEditModel: capacity changes, room
// types, segments, channels, event notes and the holiday map's pairs. Editing a cell calls the
// edit model (an undoable command that writes the store); a refused value leaves the cell as it
// was and the edit model's `refused` signal carries the message.
#pragma once

#include "ui/propertyeditmodel.h"

#include <QAbstractTableModel>

#include <vector>

namespace cbui {

class PropertyTableModel : public QAbstractTableModel {
public:
  enum Kind { CapacityChanges, RoomTypes, Segments, Channels, Events, HolidayPairs };
  /// The role that gives a segment's colour as "#rrggbb" (empty = none) in the colour column.
  static constexpr int ColourRole = Qt::UserRole + 1;

  PropertyTableModel(Kind kind, PropertyEditModel *model, QObject *parent = nullptr);
  Kind kind() const { return kind_; }
  /// The code of a row (room types, segments, channels); empty for other lists.
  QString code(int row) const;

  int rowCount(const QModelIndex &parent = {}) const override;
  int columnCount(const QModelIndex &parent = {}) const override;
  QVariant data(const QModelIndex &index, int role = Qt::DisplayRole) const override;
  QVariant headerData(int section, Qt::Orientation orientation,
                      int role = Qt::DisplayRole) const override;
  Qt::ItemFlags flags(const QModelIndex &index) const override;
  bool setData(const QModelIndex &index, const QVariant &value, int role = Qt::EditRole) override;

private:
  Kind kind_;
  PropertyEditModel *model_;
  std::vector<HolidayPair> pairs_; ///< HolidayPairs: computed once per change
};

} // namespace cbui
