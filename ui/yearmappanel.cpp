// Year Map's panel: see yearmappanel.h.
#include "ui/yearmappanel.h"

#include "ui/csvexport.h"
#include "ui/tableexport.h"
#include "ui/workbenchsession.h"
#include "ui/yearmapmodel.h"
#include "ui/yearmapview.h"

#include <QComboBox>
#include <QFileDialog>
#include <QFutureWatcher>
#include <QHBoxLayout>
#include <QLabel>
#include <QLocale>
#include <QProgressBar>
#include <QPushButton>
#include <QSpinBox>
#include <QStandardItemModel>
#include <QVBoxLayout>
#include <QtConcurrent/QtConcurrentRun>

#include <algorithm>
#include <memory>
#include <optional>
#include <variant>

namespace cbui {
namespace {

using Result = std::variant<YearMapData, QString>;

QDate toQDate(cb::Date d) {
  return QDate(d.year(), static_cast<int>(d.month()), static_cast<int>(d.day()));
}

} // namespace

struct YearMapPanel::Impl {
  WorkbenchSession *session = nullptr;
  QSpinBox *year = new QSpinBox;
  QComboBox *colouring = new QComboBox;
  QComboBox *segment = new QComboBox;
  QLabel *status = new QLabel;
  QProgressBar *busy = new QProgressBar;
  YearMapView *view = new YearMapView;
  std::optional<YearMapData> data;
  int generation = 0;
};

YearMapPanel::YearMapPanel(QWidget *parent) : QWidget(parent), d_(new Impl) {
  d_->year->setObjectName(QStringLiteral("yearMapYear"));
  d_->colouring->setObjectName(QStringLiteral("yearMapColouring"));
  d_->segment->setObjectName(QStringLiteral("yearMapSegment"));
  d_->status->setObjectName(QStringLiteral("yearMapStatus"));
  d_->view->setObjectName(QStringLiteral("yearMapView"));
  d_->year->setRange(2000, 2100);
  d_->year->setToolTip(QStringLiteral("Calendar year of nights to show"));
  d_->colouring->addItem(QStringLiteral("Season class"));
  d_->colouring->addItem(QStringLiteral("Demand / capacity"));
  d_->colouring->setToolTip(
      QStringLiteral("Season class (peak / shoulder / low, the property's bands) or rooms over "
                     "capacity; rooms are actuals for past nights, the unconstrained forecast "
                     "for future ones"));
  d_->segment->addItem(QStringLiteral("Hotel total"), QString());
  d_->segment->setSizeAdjustPolicy(QComboBox::AdjustToContents);
  d_->segment->setToolTip(QStringLiteral("A segment colours each night by its share of the "
                                         "hotel's rooms (actual or forecast)"));
  d_->status->setSizePolicy(QSizePolicy::Ignored, QSizePolicy::Preferred);
  d_->busy->setRange(0, 0);
  d_->busy->setMaximumWidth(100);
  d_->busy->setMaximumHeight(14);
  d_->busy->hide();

  auto *controls = new QHBoxLayout;
  controls->addWidget(new QLabel(QStringLiteral("Year")));
  controls->addWidget(d_->year);
  controls->addSpacing(8);
  controls->addWidget(new QLabel(QStringLiteral("Segment")));
  controls->addWidget(d_->segment);
  controls->addSpacing(8);
  controls->addWidget(new QLabel(QStringLiteral("Colour by")));
  controls->addWidget(d_->colouring);
  controls->addWidget(d_->busy);
  controls->addWidget(d_->status, 1);
  auto *exportCsv = new QPushButton(QStringLiteral("Nights CSV…"));
  auto *exportXlsx = new QPushButton(QStringLiteral("XLSX…"));
  exportXlsx->setToolTip(QStringLiteral("Save every night's figures of the year as an Excel "
                                        "workbook"));
  auto *exportMap = new QPushButton(QStringLiteral("Map PNG/PDF…"));
  exportCsv->setToolTip(QStringLiteral("Save every night's figures of the year as CSV"));
  exportMap->setToolTip(QStringLiteral("Save the map with its legend as PNG or PDF"));
  controls->addWidget(exportCsv);
  controls->addWidget(exportXlsx);
  controls->addWidget(exportMap);
  auto *layout = new QVBoxLayout(this);
  layout->addLayout(controls);
  layout->addWidget(d_->view, 1);

  connect(d_->year, &QSpinBox::valueChanged, this, &YearMapPanel::recompute);
  connect(d_->colouring, &QComboBox::currentIndexChanged, this, &YearMapPanel::redraw);
  connect(d_->segment, &QComboBox::currentIndexChanged, this, &YearMapPanel::redraw);
  connect(d_->view, &YearMapView::nightActivated, this, &YearMapPanel::nightActivated);
  auto exportNights = [this](TableFormat format) {
    if (!d_->data)
      return;
    const auto table = yearMapTable(*d_->data);
    const QString done =
        saveTableAs(this, *table, QStringLiteral("year-map-%1").arg(d_->data->year), format);
    if (!done.isEmpty())
      d_->status->setText(done);
  };
  connect(exportCsv, &QPushButton::clicked, this,
          [exportNights] { exportNights(TableFormat::Csv); });
  connect(exportXlsx, &QPushButton::clicked, this,
          [exportNights] { exportNights(TableFormat::Xlsx); });
  connect(exportMap, &QPushButton::clicked, this, [this] {
    const QString file = QFileDialog::getSaveFileName(
        this, QStringLiteral("Save the Year Map"), QStringLiteral("year-map.png"),
        QStringLiteral("PNG image (*.png);;PDF document (*.pdf)"));
    if (!file.isEmpty())
      d_->status->setText(d_->view->exportTo(file)
                              ? QStringLiteral("Saved %1").arg(file)
                              : QStringLiteral("Could not write %1").arg(file));
  });
}

YearMapPanel::~YearMapPanel() { delete d_; }

const YearMapData *YearMapPanel::data() const { return d_->data ? &*d_->data : nullptr; }
YearMapView *YearMapPanel::view() const { return d_->view; }

void YearMapPanel::setSession(WorkbenchSession *session) {
  const bool fresh = session != d_->session;
  d_->session = session;
  if (!session) {
    ++d_->generation;
    d_->view->setMap(nullptr, 0, 0, QString());
    d_->data.reset();
    d_->busy->hide();
    return;
  }
  if (fresh) {
    QSignalBlocker a(d_->year), b(d_->segment);
    // Years with data, and the next one (its nights are forecast as far as 365 days ahead).
    const int last = session->readingDate().year();
    const auto &first = session->summary().firstArrival;
    d_->year->setRange(first ? std::min(first->year(), last) : last, last + 1);
    d_->year->setValue(last);
    d_->segment->clear();
    d_->segment->addItem(QStringLiteral("Hotel total"), QString());
    for (const auto &s : session->segments()) {
      const QString code = QString::fromStdString(s.code);
      d_->segment->addItem(
          s.name.empty() ? code
                         : QStringLiteral("%1 (%2)").arg(QString::fromStdString(s.name), code),
          code);
    }
  }
  recompute();
}

void YearMapPanel::setYear(int year) { d_->year->setValue(year); }
void YearMapPanel::setColouring(int colouring) { d_->colouring->setCurrentIndex(colouring); }
void YearMapPanel::setSegment(const QString &code) {
  d_->segment->setCurrentIndex(std::max(0, d_->segment->findData(code)));
}

void YearMapPanel::recompute() {
  if (!d_->session)
    return;
  const int generation = ++d_->generation;
  const int year = d_->year->value();
  d_->busy->show();
  d_->status->setText(QStringLiteral("Forecasting the rest of %1 …").arg(year));
  auto copy = std::make_shared<const WorkbenchSession>(*d_->session);
  auto *watcher = new QFutureWatcher<Result>(this);
  connect(watcher, &QFutureWatcher<Result>::finished, this, [this, watcher, generation] {
    Result r = watcher->result();
    watcher->deleteLater();
    if (generation != d_->generation)
      return;
    d_->busy->hide();
    if (const auto *msg = std::get_if<QString>(&r)) {
      d_->data.reset();
      d_->view->setMap(nullptr, 0, 0, QString());
      d_->status->setText(QStringLiteral("No map: %1").arg(*msg));
      return;
    }
    d_->data = std::move(std::get<YearMapData>(r));
    redraw();
    emit computed();
  });
  watcher->setFuture(QtConcurrent::run([copy, year]() -> Result {
    try {
      return computeYearMap(*copy, year);
    } catch (const std::exception &e) {
      return QString::fromStdString(e.what());
    }
  }));
}

void YearMapPanel::redraw() {
  if (!d_->data)
    return;
  const YearMapData &data = *d_->data;
  const QString code = d_->segment->currentData().toString();
  int segment = -1;
  for (std::size_t i = 0; i < data.segments.size(); ++i)
    if (QString::fromStdString(data.segments[i]) == code)
      segment = static_cast<int>(i);
  // A segment is coloured by its share of the hotel; season and demand are hotel-level.
  d_->colouring->setEnabled(segment < 0);
  const int colouring = segment >= 0 ? static_cast<int>(YearMapColouring::SegmentShare)
                                     : d_->colouring->currentIndex();
  QString title =
      segment >= 0
          ? QStringLiteral("%1 %2: share of the hotel's rooms")
                .arg(data.year)
                .arg(QString::fromStdString(data.segmentLabels[static_cast<std::size_t>(segment)]))
      : colouring == 0
          ? QStringLiteral("%1, hotel total: season class by rooms / capacity").arg(data.year)
          : QStringLiteral("%1, hotel total: rooms / capacity").arg(data.year);
  title += QStringLiteral(" · actuals to %1, forecast after")
               .arg(QLocale().toString(toQDate(data.asOf), QStringLiteral("d MMM yyyy")));
  d_->view->setMap(&data, colouring, std::max(segment, 0), title);
  d_->status->setText(data.method.empty()
                          ? QStringLiteral("Every night of %1 is past: actuals").arg(data.year)
                          : QStringLiteral("Forecast: %1 · hover a night for its figures; click "
                                           "it, or move with the arrow keys and press Enter, "
                                           "for Date Study")
                                .arg(QString::fromStdString(data.method)));
  d_->status->setToolTip(d_->status->text());
}

} // namespace cbui
