// The Date Study's right-hand column: the forecast to arrival (value, accuracy, description,
// formula), demand against capacity (unconstrained beside constrained), and the tabs — segments
// with protection (and the advisory caution), expert override, reservations behind the OTB.
// Shows what the panel gives it; computes nothing.
#pragma once

#include <QString>
#include <QStringList>
#include <QWidget>

class QDoubleSpinBox;
class QLabel;
class QLineEdit;
class QListWidget;
class QPushButton;
class QTabWidget;
class QTableWidget;

namespace cbui {

/// Demand against capacity as shown (already formatted; "—" where there is no figure).
struct CapacityTexts {
  QString demand, band, spill, capacity, sold, occupancy, sellout;
};

/// One row of the segment table; numbers are kept for the CSV export.
struct SegmentRowText {
  QString segment;
  int otb = 0;
  double forecast = 0;
  double rate = 0;
  QString rateText;
  int protect = -1; ///< < 0: none
  int limit = 0;
  bool open = true;
};

/// One row of the reservations table.
struct ReservationRowText {
  QString id, bookedOn, status, segment, arrival, rateText;
  int rooms = 0, nights = 0;
  double rate = 0;
};

class DateStudyDetails : public QWidget {
  Q_OBJECT
public:
  enum Tab { SegmentsTab = 0, OverrideTab = 1, ReservationsTab = 2 };

  explicit DateStudyDetails(QWidget *parent = nullptr);

  void setForecast(const QString &value, const QString &accuracy, const QString &description,
                   const QString &formula);
  void setCapacity(const CapacityTexts &texts);
  void setSegmentsPending(const QString &note);
  void setSegments(const QList<SegmentRowText> &rows, const QString &note);
  void setOverrideHistory(const QStringList &lines);
  void setReservations(const QList<ReservationRowText> &rows, const QString &summary);
  void setDrillText(const QString &text);
  void clearOverrideReason();
  /// Enables or disables the override form (disabled with `why` as its tooltip).
  void setOverrideEditable(bool editable, const QString &why = {});
  void showTab(Tab tab);
  Tab currentTab() const;

  QString forecastText() const;
  QTableWidget *segmentTable() const { return segTable_; }
  QTableWidget *reservationTable() const { return resTable_; }
  QListWidget *overrideHistory() const { return ovHistory_; }

signals:
  void overrideRequested(double value, const QString &reason);
  /// Double-click on a segment row: its code.
  void segmentActivated(const QString &code);
  /// "Reservations behind OTB" pressed.
  void drillRequested();
  void tabShown(int tab);
  /// A table's "CSV…" or "XLSX…" button (the format from the suggested name's extension): the
  /// caller asks for a file name and writes it.
  void exportRequested(QTableWidget *table, const QString &suggestedName);

private:
  QLabel *fcValue_, *fcMae_, *fcDesc_, *fcFormula_;
  QLabel *demand_, *band_, *spill_, *capacity_, *sold_, *occupancy_, *sellout_;
  QTabWidget *tabs_;
  QTableWidget *segTable_, *resTable_;
  QLabel *segNotes_, *resSummary_;
  QDoubleSpinBox *ovValue_;
  QLineEdit *ovReason_;
  QPushButton *ovSave_ = nullptr;
  QListWidget *ovHistory_;
  QPushButton *drill_;
};

} // namespace cbui
