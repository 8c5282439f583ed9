// The row height of the workbench's tables: one line of text and a little air, so a screen shows
// as many rows as fit (Qt's default leaves room for an editor's frame in every row).
#pragma once

#include <QHeaderView>
#include <QTableView>

namespace cbui {

inline void useCompactRows(QTableView *view) {
  view->verticalHeader()->setDefaultSectionSize(view->fontMetrics().height() + 6);
}

} // namespace cbui
