// Year Map's calendar view: one row per month, one column per day of the month, each night a
// cell coloured by the panel's choice (season class, demand / capacity, a segment's share) with
// its letter or percentage written in it, forecast nights hatched, the reading date outlined and
// the legend (with its bands) drawn underneath. Hover shows the night's figures; a click opens it.
// Keyboard: a focused night (outlined while the map has the keyboard focus) moves with ← / → (one
// night), ↑ / ↓ (the same day one month row up or down, the last day of a shorter month), Home /
// End (first / last night of its month row), Ctrl+Home / Ctrl+End (first / last night of the
// year); Enter opens it as a click does.
#pragma once

#include <QDate>
#include <QWidget>

#include <optional>

// Forward declarations only: moc of Qt 6.4 cannot parse the C++20 library headers core uses.
namespace cbui {
struct YearMapData;

class YearMapView : public QWidget {
  Q_OBJECT
public:
  explicit YearMapView(QWidget *parent = nullptr);
  /// The map to draw (not owned; nullptr clears), colouring as cbui::YearMapColouring, segment an
  /// index into map->segments (for the segment share), title above the map.
  void setMap(const YearMapData *map, int colouring, int segment, const QString &title);
  /// The cell of `night` in widget coordinates (empty when it is not on the map).
  QRect cellRect(const QDate &night) const;
  /// The night under `pos`, if any.
  std::optional<QDate> nightAt(const QPoint &pos) const;
  /// The night the keyboard is on (invalid before the first key or click on this map's year).
  QDate focusedNight() const { return focus_; }
  /// Puts the keyboard on `night` (ignored when it is not on the map).
  void setFocusedNight(const QDate &night);
  /// Saves the map (with its legend) as PNG or PDF, by the file's extension.
  bool exportTo(const QString &file);
  QSize sizeHint() const override { return {1200, 560}; }
  QSize minimumSizeHint() const override { return {700, 380}; }

signals:
  void nightActivated(QDate night);

protected:
  void paintEvent(QPaintEvent *event) override;
  void mouseReleaseEvent(QMouseEvent *event) override;
  void keyPressEvent(QKeyEvent *event) override;
  void focusInEvent(QFocusEvent *event) override;
  void focusOutEvent(QFocusEvent *event) override;
  bool event(QEvent *event) override;

private:
  void paintMap(QPainter &p, const QRect &area) const;
  QRect cellIn(const QRect &area, int month, int day) const;
  const YearMapData *data_ = nullptr;
  int colouring_ = 0, segment_ = 0;
  QString title_;
  QDate focus_;
};

} // namespace cbui
