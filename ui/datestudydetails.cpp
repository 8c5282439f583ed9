#include "ui/datestudydetails.h"

#include "core/advice.h"
#include "ui/csvexport.h"

#include <QDoubleSpinBox>
#include <QFormLayout>
#include <QGridLayout>
#include <QGroupBox>
#include <QHBoxLayout>
#include <QHeaderView>
#include <QLabel>
#include <QLineEdit>
#include <QListWidget>
#include <QLocale>
#include <QPushButton>
#include <QTabWidget>
#include <QTableWidget>
#include <QVBoxLayout>

#include <cmath>

namespace cbui {
namespace {

QTableWidgetItem *cell(const QString &text, const QVariant &csvValue = {}) {
  auto *item = new QTableWidgetItem(text);
  item->setFlags(item->flags() & ~Qt::ItemIsEditable);
  if (csvValue.isValid()) {
    item->setTextAlignment(Qt::AlignRight | Qt::AlignVCenter);
    item->setData(kCsvValueRole, csvValue);
  }
  return item;
}

QString whole(double v) { return QLocale().toString(static_cast<qlonglong>(std::llround(v))); }
QString oneDecimal(double v) { return QLocale().toString(v, 'f', 1); }

QLabel *figure() {
  auto *l = new QLabel;
  l->setAlignment(Qt::AlignRight | Qt::AlignVCenter);
  return l;
}

// A table with its CSV and XLSX buttons under it, on one tab page.
QWidget *tablePage(QTableWidget *table, QWidget *above, QWidget *below, QPushButton *csv,
                   QPushButton *xlsx) {
  auto *page = new QWidget;
  auto *lay = new QVBoxLayout(page);
  if (above)
    lay->addWidget(above);
  lay->addWidget(table, 1);
  if (below)
    lay->addWidget(below);
  auto *row = new QHBoxLayout;
  row->addStretch(1);
  row->addWidget(csv);
  row->addWidget(xlsx);
  lay->addLayout(row);
  return page;
}

} // namespace

DateStudyDetails::DateStudyDetails(QWidget *parent) : QWidget(parent) {
  auto *col = new QVBoxLayout(this);
  col->setContentsMargins(4, 0, 0, 0);

  auto *fcBox = new QGroupBox(tr("Forecast to arrival"));
  auto *fcLay = new QVBoxLayout(fcBox);
  fcValue_ = new QLabel;
  fcMae_ = new QLabel;
  fcDesc_ = new QLabel;
  fcFormula_ = new QLabel;
  fcValue_->setStyleSheet(QStringLiteral("font-size: 13pt;"));
  fcFormula_->setStyleSheet(QStringLiteral("font-family: monospace; color: #333;"));
  for (QLabel *l : {fcValue_, fcMae_, fcDesc_, fcFormula_}) {
    l->setWordWrap(true);
    fcLay->addWidget(l);
  }
  col->addWidget(fcBox);

  auto *capBox = new QGroupBox(tr("Demand against capacity (hotel)"));
  auto *grid = new QGridLayout(capBox);
  demand_ = figure();
  band_ = figure();
  spill_ = figure();
  capacity_ = figure();
  sold_ = figure();
  occupancy_ = figure();
  sellout_ = figure();
  grid->addWidget(new QLabel(tr("<b>Unconstrained</b>")), 0, 0, 1, 2);
  grid->addWidget(new QLabel(tr("<b>Constrained</b>")), 0, 2, 1, 2);
  const std::pair<const char *, QLabel *> left[] = {
      {"Demand", demand_}, {"80 % band", band_}, {"Spill", spill_}};
  const std::pair<const char *, QLabel *> right[] = {
      {"Capacity", capacity_}, {"Rooms sold (expected)", sold_}, {"Occupancy", occupancy_}};
  for (int i = 0; i < 3; ++i) {
    grid->addWidget(new QLabel(tr(left[i].first)), i + 1, 0);
    grid->addWidget(left[i].second, i + 1, 1);
    grid->addWidget(new QLabel(tr(right[i].first)), i + 1, 2);
    grid->addWidget(right[i].second, i + 1, 3);
  }
  grid->addWidget(new QLabel(tr("Sell-out probability")), 4, 0, 1, 3);
  grid->addWidget(sellout_, 4, 3);
  grid->setColumnStretch(1, 1);
  grid->setColumnStretch(3, 1);
  col->addWidget(capBox);

  tabs_ = new QTabWidget;
  // Segments and protection, with the caution.
  segTable_ = new QTableWidget(0, 7);
  segTable_->setHorizontalHeaderLabels({tr("Segment"), tr("OTB"), tr("Forecast"), tr("Rate"),
                                        tr("Protect"), tr("Limit"), tr("Status")});
  segTable_->verticalHeader()->hide();
  segTable_->horizontalHeader()->setSectionResizeMode(QHeaderView::ResizeToContents);
  segTable_->setToolTip(tr("Double-click a segment to see its reservations"));
  segNotes_ = new QLabel;
  segNotes_->setWordWrap(true);
  auto *notes = new QWidget;
  auto *notesLay = new QVBoxLayout(notes);
  notesLay->setContentsMargins(0, 0, 0, 0);
  auto *caution = new QLabel(QString::fromUtf8(cb::kAdvisoryCaution));
  caution->setWordWrap(true);
  caution->setStyleSheet(QStringLiteral("color: #7a4a00; font-style: italic;"));
  notesLay->addWidget(segNotes_);
  notesLay->addWidget(caution);
  auto *segCsv = new QPushButton(tr("Table CSV…"));
  auto *segXlsx = new QPushButton(tr("XLSX…"));
  tabs_->addTab(tablePage(segTable_, nullptr, notes, segCsv, segXlsx),
                tr("Segments && protection"));

  // Expert override.
  auto *ovPage = new QWidget;
  auto *ovLay = new QVBoxLayout(ovPage);
  auto *form = new QFormLayout;
  ovValue_ = new QDoubleSpinBox;
  ovValue_->setRange(0, 100000);
  ovValue_->setDecimals(0);
  ovReason_ = new QLineEdit;
  ovReason_->setPlaceholderText(tr("Why (e.g. city marathon announced)"));
  auto *save = new QPushButton(tr("Save override"));
  ovSave_ = save;
  form->addRow(tr("Final rooms"), ovValue_);
  form->addRow(tr("Reason"), ovReason_);
  ovLay->addLayout(form);
  ovLay->addWidget(save);
  ovLay->addWidget(new QLabel(tr("History of this night")));
  ovHistory_ = new QListWidget;
  ovLay->addWidget(ovHistory_, 1);
  tabs_->addTab(ovPage, tr("Override"));

  // Drill-down.
  resSummary_ = new QLabel;
  resSummary_->setWordWrap(true);
  resTable_ = new QTableWidget(0, 8);
  resTable_->setHorizontalHeaderLabels({tr("Id"), tr("Booked on"), tr("Status"), tr("Segment"),
                                        tr("Rooms"), tr("Arrival"), tr("Nights"), tr("Rate")});
  resTable_->verticalHeader()->hide();
  auto *resCsv = new QPushButton(tr("Table CSV…"));
  auto *resXlsx = new QPushButton(tr("XLSX…"));
  tabs_->addTab(tablePage(resTable_, resSummary_, nullptr, resCsv, resXlsx), tr("Reservations"));
  col->addWidget(tabs_, 1);

  drill_ = new QPushButton(tr("Reservations behind OTB"));
  col->addWidget(drill_);

  connect(tabs_, &QTabWidget::currentChanged, this, &DateStudyDetails::tabShown);
  connect(save, &QPushButton::clicked, this,
          [this] { emit overrideRequested(ovValue_->value(), ovReason_->text()); });
  connect(drill_, &QPushButton::clicked, this, &DateStudyDetails::drillRequested);
  connect(segTable_, &QTableWidget::cellDoubleClicked, this,
          [this](int row, int) { emit segmentActivated(segTable_->item(row, 0)->text()); });
  connect(segCsv, &QPushButton::clicked, this,
          [this] { emit exportRequested(segTable_, QStringLiteral("segments.csv")); });
  connect(resCsv, &QPushButton::clicked, this,
          [this] { emit exportRequested(resTable_, QStringLiteral("reservations.csv")); });
  connect(segXlsx, &QPushButton::clicked, this,
          [this] { emit exportRequested(segTable_, QStringLiteral("segments.xlsx")); });
  connect(resXlsx, &QPushButton::clicked, this,
          [this] { emit exportRequested(resTable_, QStringLiteral("reservations.xlsx")); });
}

void DateStudyDetails::setForecast(const QString &value, const QString &accuracy,
                                   const QString &description, const QString &formula) {
  fcValue_->setText(value);
  fcMae_->setText(accuracy);
  fcDesc_->setText(description);
  fcFormula_->setText(formula);
}

void DateStudyDetails::setCapacity(const CapacityTexts &t) {
  demand_->setText(t.demand);
  band_->setText(t.band);
  spill_->setText(t.spill);
  capacity_->setText(t.capacity);
  sold_->setText(t.sold);
  occupancy_->setText(t.occupancy);
  sellout_->setText(t.sellout);
}

void DateStudyDetails::setSegmentsPending(const QString &note) {
  segTable_->setRowCount(0);
  segNotes_->setText(note);
}

void DateStudyDetails::setSegments(const QList<SegmentRowText> &rows, const QString &note) {
  segTable_->setRowCount(static_cast<int>(rows.size()));
  for (int i = 0; i < rows.size(); ++i) {
    const SegmentRowText &r = rows[i];
    segTable_->setItem(i, 0, cell(r.segment));
    segTable_->setItem(i, 1, cell(whole(r.otb), r.otb));
    segTable_->setItem(i, 2, cell(oneDecimal(r.forecast), QString::number(r.forecast, 'f', 1)));
    segTable_->setItem(i, 3, cell(r.rateText, QString::number(r.rate, 'f', 2)));
    segTable_->setItem(
        i, 4, r.protect >= 0 ? cell(whole(r.protect), r.protect) : cell(tr("—"), QString()));
    segTable_->setItem(i, 5, cell(whole(r.limit), r.limit));
    segTable_->setItem(i, 6, cell(r.open ? tr("open") : tr("closed")));
  }
  segNotes_->setText(note);
}

void DateStudyDetails::setOverrideHistory(const QStringList &lines) {
  ovHistory_->clear();
  ovHistory_->addItems(lines);
}

void DateStudyDetails::setReservations(const QList<ReservationRowText> &rows,
                                       const QString &summary) {
  resTable_->setRowCount(static_cast<int>(rows.size()));
  for (int i = 0; i < rows.size(); ++i) {
    const ReservationRowText &r = rows[i];
    resTable_->setItem(i, 0, cell(r.id));
    resTable_->setItem(i, 1, cell(r.bookedOn));
    resTable_->setItem(i, 2, cell(r.status));
    resTable_->setItem(i, 3, cell(r.segment));
    resTable_->setItem(i, 4, cell(whole(r.rooms), r.rooms));
    resTable_->setItem(i, 5, cell(r.arrival));
    resTable_->setItem(i, 6, cell(whole(r.nights), r.nights));
    resTable_->setItem(i, 7, cell(r.rateText, QString::number(r.rate, 'f', 2)));
  }
  resTable_->resizeColumnsToContents();
  resSummary_->setText(summary);
}

void DateStudyDetails::setDrillText(const QString &text) { drill_->setText(text); }
void DateStudyDetails::setOverrideEditable(bool editable, const QString &why) {
  for (QWidget *w : std::initializer_list<QWidget *>{ovValue_, ovReason_, ovSave_}) {
    w->setEnabled(editable);
    w->setToolTip(editable ? QString() : why);
  }
}

void DateStudyDetails::clearOverrideReason() { ovReason_->clear(); }
void DateStudyDetails::showTab(Tab tab) { tabs_->setCurrentIndex(tab); }
DateStudyDetails::Tab DateStudyDetails::currentTab() const {
  return static_cast<Tab>(tabs_->currentIndex());
}
QString DateStudyDetails::forecastText() const { return fcValue_->text(); }

} // namespace cbui
