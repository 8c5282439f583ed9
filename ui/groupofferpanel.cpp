// Group offer screen: see groupofferpanel.h.
#include "ui/groupofferpanel.h"

#include "core/advice.h"
#include "core/textformat.h"
#include "ui/groupofferchart.h"
#include "ui/groupoffermodel.h"
#include "ui/tableexport.h"
#include "ui/workbenchsession.h"

#include <QCheckBox>
#include <QDateEdit>
#include <QDoubleSpinBox>
#include <QFileDialog>
#include <QFormLayout>
#include <QFutureWatcher>
#include <QHBoxLayout>
#include <QHeaderView>
#include <QIdentityProxyModel>
#include <QLabel>
#include <QLineEdit>
#include <QProgressBar>
#include <QPushButton>
#include <QSpinBox>
#include <QSplitter>
#include <QStandardItemModel>
#include <QTableView>
#include <QTableWidget>
#include <QTimer>
#include <QVBoxLayout>
#include <QtConcurrent/QtConcurrentRun>

#include <algorithm>
#include <atomic>
#include <cstdlib>
#include <memory>
#include <optional>

namespace cbui {
namespace {

struct Control {
  std::atomic<bool> cancel{false};
  std::atomic<std::int64_t> done{0}, total{0};
};

bool progressOf(void *context, std::int64_t done, std::int64_t total) {
  auto *c = static_cast<Control *>(context);
  c->done = done;
  c->total = total;
  return !c->cancel;
}

QDate toQDate(cb::Date d) {
  return QDate(d.year(), static_cast<int>(d.month()), static_cast<int>(d.day()));
}
cb::Date fromQDate(const QDate &d) {
  return cb::Date::fromYmd(d.year(), static_cast<unsigned>(d.month()),
                           static_cast<unsigned>(d.day()));
}

QDoubleSpinBox *moneyEdit(const QString &tip) {
  auto *s = new QDoubleSpinBox;
  s->setRange(0, 1e6);
  s->setDecimals(2);
  s->setGroupSeparatorShown(true);
  s->setToolTip(tip);
  return s;
}

/// The on-screen table's headers on two lines (split at the space nearest the middle), so the
/// whole table fits; the exports read the model itself, with one-line headers.
class TwoLineHeaders : public QIdentityProxyModel {
public:
  using QIdentityProxyModel::QIdentityProxyModel;
  QVariant headerData(int section, Qt::Orientation orientation, int role) const override {
    QVariant v = QIdentityProxyModel::headerData(section, orientation, role);
    if (role != Qt::DisplayRole || orientation != Qt::Horizontal)
      return v;
    QString text = v.toString();
    qsizetype best = -1;
    for (qsizetype i = 0; i < text.size(); ++i)
      if (text[i] == QLatin1Char(' ') &&
          (best < 0 || std::abs(text.size() / 2 - i) < std::abs(text.size() / 2 - best)))
        best = i;
    if (best > 0 && text.size() > 8)
      text[best] = QLatin1Char('\n');
    return text;
  }
};

} // namespace

struct GroupOfferPanel::Impl {
  const WorkbenchSession *session = nullptr; ///< not owned
  std::filesystem::path storePath;
  // Editor.
  QLineEdit *name = new QLineEdit;
  QDateEdit *arrival = new QDateEdit;
  QSpinBox *nights = new QSpinBox;
  QCheckBox *same = new QCheckBox(QStringLiteral("Same for every night"));
  QSpinBox *sameRooms = new QSpinBox;
  QTableWidget *rooms = new QTableWidget(0, 2);
  QDoubleSpinBox *rate = moneyEdit(QStringLiteral("Group rate per room-night"));
  QDoubleSpinBox *other = moneyEdit(
      QStringLiteral("Other revenue per room-night the group brings: meals, meeting rooms"));
  QDoubleSpinBox *cost = moneyEdit(QStringLiteral(
      "Cost per room-night of taking the group: commission, amenities, complimentary rooms"));
  QPushButton *evaluateButton = new QPushButton(QStringLiteral("Evaluate"));
  QPushButton *cancelButton = new QPushButton(QStringLiteral("Cancel"));
  QProgressBar *progress = new QProgressBar;
  QLabel *message = new QLabel;
  // Result.
  QLabel *verdict = new QLabel; ///< the headline
  QLabel *details = new QLabel; ///< totals and break-even rate, or what is wrong
  QLabel *caution = new QLabel;
  QLabel *basis = new QLabel; ///< what the figures rest on
  GroupOfferChart *chart = new GroupOfferChart;
  QStandardItemModel *model = nullptr;
  QTableView *table = new QTableView;
  QTimer *poll = nullptr;
  std::shared_ptr<Control> control;
  std::optional<GroupOfferResult> result;
  int generation = 0;
  bool running = false;

  /// Rows of the rooms table follow the arrival and the number of nights; existing rooms kept.
  void syncRoomRows() {
    const int n = nights->value();
    const int before = rooms->rowCount();
    rooms->setRowCount(n);
    for (int i = 0; i < n; ++i) {
      auto *night = new QTableWidgetItem(
          arrival->date().addDays(i).toString(QStringLiteral("ddd d MMM yyyy")));
      night->setFlags(night->flags() & ~Qt::ItemIsEditable);
      rooms->setItem(i, 0, night);
      if (i >= before || !rooms->item(i, 1)) {
        auto *r = new QTableWidgetItem;
        r->setData(Qt::EditRole, i > 0 && rooms->item(i - 1, 1)
                                     ? rooms->item(i - 1, 1)->data(Qt::EditRole).toInt()
                                     : sameRooms->value());
        r->setTextAlignment(Qt::AlignRight | Qt::AlignVCenter);
        rooms->setItem(i, 1, r);
      }
    }
    applySame();
  }

  /// "Same for every night": every night gets the one figure and the table is read-only.
  void applySame() {
    for (int i = 0; i < rooms->rowCount(); ++i) {
      QTableWidgetItem *r = rooms->item(i, 1);
      if (same->isChecked())
        r->setData(Qt::EditRole, sameRooms->value());
      r->setFlags(same->isChecked() ? (r->flags() & ~Qt::ItemIsEditable)
                                    : (r->flags() | Qt::ItemIsEditable));
    }
    sameRooms->setEnabled(same->isChecked());
  }

  void busy(bool on) {
    running = on;
    progress->setVisible(on);
    cancelButton->setVisible(on);
    evaluateButton->setEnabled(!on);
    if (on)
      poll->start(150);
    else
      poll->stop();
  }

  /// No result: the headline says why, `detail` (red) what to correct, if anything.
  void clearResult(const QString &why, const QString &detail = {}) {
    result.reset();
    fillGroupOfferTable(*model, GroupOfferResult{});
    chart->setData({});
    verdict->setText(why);
    verdict->setStyleSheet({});
    details->setText(detail);
    details->setStyleSheet(QStringLiteral("color: #A03000; font-weight: bold"));
    caution->clear();
    basis->clear();
  }

  void show(GroupOfferResult r) {
    result = std::move(r);
    const GroupOfferResult &res = *result;
    fillGroupOfferTable(*model, res);
    table->resizeColumnsToContents();
    table->setColumnWidth(ColNotes, std::min(table->columnWidth(ColNotes), 420));
    GroupOfferChartData c;
    for (const cb::DisplacementNight &n : res.displacement.nights) {
      QString label = toQDate(n.night).toString(QStringLiteral("ddd\nd MMM"));
      if (n.shoulder)
        label += QStringLiteral("\n(shoulder)");
      c.labels << label;
      c.shoulder << n.shoulder;
      c.capacity << n.input.capacity;
      c.transientDemand << n.input.transientMean;
      c.groupsHeld << n.input.groupRooms;
      c.offered << n.offer.rooms;
      c.displaced << n.displacedRooms;
    }
    chart->setData(c);
    const QString who = res.offer.name.empty() ? QStringLiteral("The group")
                                               : QString::fromStdString(res.offer.name);
    const QString colour =
        res.displacement.worthIt ? QStringLiteral("#006040") : QStringLiteral("#A03000");
    verdict->setText(QStringLiteral("Verdict for %1: %2").arg(who, offerVerdict(res.displacement)));
    verdict->setStyleSheet(QStringLiteral("color: %1").arg(colour));
    details->setText(offerTotals(res) + QLatin1Char('\n') + breakEvenText(res));
    details->setStyleSheet({});
    caution->setText(QString::fromUtf8(cb::kAdvisoryCaution.data(),
                                       static_cast<qsizetype>(cb::kAdvisoryCaution.size())));
    basis->setText(QStringLiteral("As of %1 · transient demand: the %2 forecast of transient "
                                  "business · transient rate: its ADR over the last 365 nights")
                       .arg(toQDate(res.asOf).toString(QStringLiteral("d MMM yyyy")),
                            QString::fromStdString(res.method)));
    message->clear();
    message->setStyleSheet({});
  }
};

GroupOfferPanel::GroupOfferPanel(QWidget *parent) : QWidget(parent), d_(new Impl) {
  d_->model = new QStandardItemModel(this);
  d_->poll = new QTimer(this);
  d_->name->setObjectName(QStringLiteral("offerName"));
  d_->arrival->setObjectName(QStringLiteral("offerArrival"));
  d_->nights->setObjectName(QStringLiteral("offerNights"));
  d_->rooms->setObjectName(QStringLiteral("offerRooms"));
  d_->name->setPlaceholderText(QStringLiteral("e.g. Medical congress"));
  d_->arrival->setDisplayFormat(QStringLiteral("ddd d MMM yyyy"));
  d_->arrival->setCalendarPopup(true);
  d_->arrival->setToolTip(QStringLiteral("First night of the stay"));
  d_->nights->setRange(1, kMaxOfferNights);
  d_->nights->setToolTip(QStringLiteral("Nights of the stay; the shoulder nights (the night "
                                        "before arrival and the night of departure) are checked "
                                        "as well"));
  d_->sameRooms->setRange(0, 100000);
  d_->sameRooms->setValue(20);
  d_->sameRooms->setSuffix(QStringLiteral(" rooms"));
  d_->same->setChecked(true);
  d_->same->setToolTip(QStringLiteral("Untick to give each night its own number of rooms"));
  d_->rooms->setHorizontalHeaderLabels({QStringLiteral("Night"), QStringLiteral("Rooms")});
  d_->rooms->verticalHeader()->hide();
  d_->rooms->horizontalHeader()->setSectionResizeMode(0, QHeaderView::Stretch);
  d_->rooms->horizontalHeader()->setSectionResizeMode(1, QHeaderView::ResizeToContents);
  d_->rooms->setToolTip(QStringLiteral("Rooms the group asks for on each night"));
  d_->rooms->setMinimumHeight(110);
  d_->message->setWordWrap(true);
  d_->verdict->setWordWrap(true);
  d_->verdict->setTextFormat(Qt::PlainText);
  QFont headline = d_->verdict->font();
  headline.setPointSizeF(headline.pointSizeF() * 1.3);
  headline.setBold(true);
  d_->verdict->setFont(headline);
  d_->details->setWordWrap(true);
  d_->details->setTextFormat(Qt::PlainText);
  d_->basis->setWordWrap(true);
  d_->caution->setWordWrap(true);
  // Word-wrapped labels are not always given the lines they need: keep room for them.
  const int line = fontMetrics().lineSpacing();
  d_->message->setMinimumHeight(4 * line);
  d_->message->setAlignment(Qt::AlignTop | Qt::AlignLeft);
  d_->details->setMinimumHeight(2 * line);
  QFont italic = d_->caution->font();
  italic.setItalic(true);
  d_->caution->setFont(italic);
  d_->caution->setObjectName(QStringLiteral("offerCaution"));
  d_->progress->setMaximumHeight(14);
  d_->progress->hide();
  d_->cancelButton->hide();
  d_->evaluateButton->setDefault(true);
  d_->evaluateButton->setToolTip(
      QStringLiteral("Check the offer against the transient forecast, night by night"));

  // The editor, on the left.
  auto *editor = new QWidget;
  editor->setMaximumWidth(290);
  auto *form = new QFormLayout;
  form->addRow(QStringLiteral("Group"), d_->name);
  form->addRow(QStringLiteral("Arrival"), d_->arrival);
  form->addRow(QStringLiteral("Nights"), d_->nights);
  form->addRow(QStringLiteral("Rooms / night"), d_->sameRooms);
  auto *editorLay = new QVBoxLayout(editor);
  editorLay->setContentsMargins(0, 0, 0, 0);
  editorLay->addLayout(form);
  editorLay->addWidget(d_->same);
  editorLay->addWidget(d_->rooms, 1);
  editorLay->addWidget(new QLabel(QStringLiteral("Per room-night:")));
  auto *money = new QFormLayout;
  money->addRow(QStringLiteral("Group rate"), d_->rate);
  money->addRow(QStringLiteral("Other revenue"), d_->other);
  money->addRow(QStringLiteral("Cost"), d_->cost);
  editorLay->addLayout(money);
  auto *run = new QHBoxLayout;
  run->addWidget(d_->evaluateButton);
  run->addWidget(d_->cancelButton);
  run->addWidget(d_->progress, 1);
  editorLay->addLayout(run);
  editorLay->addWidget(d_->message);

  // The result, on the right.
  auto *right = new QWidget;
  auto *rightLay = new QVBoxLayout(right);
  rightLay->setContentsMargins(0, 0, 0, 0);
  rightLay->addWidget(d_->verdict);
  rightLay->addWidget(d_->details);
  rightLay->addWidget(d_->caution);
  auto *csv = new QPushButton(QStringLiteral("Table CSV…"));
  auto *xlsx = new QPushButton(QStringLiteral("XLSX…"));
  auto *img = new QPushButton(QStringLiteral("Chart PNG/PDF…"));
  auto *exports = new QHBoxLayout;
  exports->addWidget(d_->basis, 1);
  exports->addWidget(csv);
  exports->addWidget(xlsx);
  exports->addWidget(img);
  rightLay->addLayout(exports);
  auto *shown = new TwoLineHeaders(this);
  shown->setSourceModel(d_->model);
  d_->table->setModel(shown);
  d_->table->verticalHeader()->hide();
  d_->table->setSelectionBehavior(QAbstractItemView::SelectRows);
  d_->table->horizontalHeader()->setStretchLastSection(true);
  auto *split = new QSplitter(Qt::Vertical);
  split->addWidget(d_->chart);
  split->addWidget(d_->table);
  split->setStretchFactor(0, 3);
  split->setStretchFactor(1, 2);
  split->setSizes({300, 200}); // the chart larger, whatever the first contents
  rightLay->addWidget(split, 1);

  auto *outer = new QHBoxLayout(this);
  outer->setContentsMargins(4, 4, 4, 4);
  outer->addWidget(editor);
  outer->addWidget(right, 1);
  d_->clearResult(QStringLiteral("Enter the group's offer and press Evaluate."));
  d_->syncRoomRows();

  connect(d_->arrival, &QDateEdit::dateChanged, this, [this] { d_->syncRoomRows(); });
  connect(d_->nights, &QSpinBox::valueChanged, this, [this] { d_->syncRoomRows(); });
  connect(d_->same, &QCheckBox::toggled, this, [this] { d_->applySame(); });
  connect(d_->sameRooms, &QSpinBox::valueChanged, this, [this] { d_->applySame(); });
  connect(d_->evaluateButton, &QPushButton::clicked, this, &GroupOfferPanel::evaluate);
  connect(d_->cancelButton, &QPushButton::clicked, this, &GroupOfferPanel::cancel);
  connect(d_->poll, &QTimer::timeout, this, [this] {
    if (d_->control && d_->control->total > 0) {
      d_->progress->setRange(0, static_cast<int>(d_->control->total));
      d_->progress->setValue(static_cast<int>(d_->control->done));
    }
  });
  auto save = [this](TableFormat format) {
    if (!d_->result)
      return;
    const QString said = saveTableAs(this, *d_->model, QStringLiteral("group-offer"), format);
    if (!said.isEmpty())
      d_->message->setText(said);
  };
  connect(csv, &QPushButton::clicked, this, [save] { save(TableFormat::Csv); });
  connect(xlsx, &QPushButton::clicked, this, [save] { save(TableFormat::Xlsx); });
  connect(img, &QPushButton::clicked, this, [this] {
    if (!d_->result)
      return;
    const QString f = QFileDialog::getSaveFileName(this, QStringLiteral("Export the chart"),
                                                   QStringLiteral("group-offer.png"),
                                                   QStringLiteral("PNG (*.png);;PDF (*.pdf)"));
    if (!f.isEmpty())
      d_->message->setText(d_->chart->exportTo(f) ? QStringLiteral("Saved %1").arg(f)
                                                  : QStringLiteral("Could not write %1").arg(f));
  });
}

GroupOfferPanel::~GroupOfferPanel() {
  cancel();
  delete d_;
}

void GroupOfferPanel::setSession(WorkbenchSession *session) {
  cancel();
  ++d_->generation; // a running check's result is for the old session: dropped
  d_->busy(false);
  if (!session) {
    d_->session = nullptr;
    d_->clearResult(QStringLiteral("Open a store to check a group offer."));
    return;
  }
  const bool fresh = session->path() != d_->storePath;
  d_->storePath = session->path();
  d_->session = session;
  const QString cur = QString::fromStdString(session->property().currency) + QLatin1Char(' ');
  for (QDoubleSpinBox *s : {d_->rate, d_->other, d_->cost})
    s->setPrefix(cur);
  d_->arrival->setMinimumDate(toQDate(session->readingDate() + 1));
  if (fresh)
    setOffer(startingOffer(*d_->session));
  d_->clearResult(QStringLiteral("Enter the group's offer and press Evaluate (data as of %1).")
                      .arg(toQDate(session->readingDate()).toString(QStringLiteral("d MMM yyyy"))));
  d_->message->clear();
  if (isVisible())
    evaluate();
}

void GroupOfferPanel::showEvent(QShowEvent *event) {
  QWidget::showEvent(event);
  if (d_->session && !d_->result && !d_->running && d_->message->text().isEmpty())
    evaluate();
}

void GroupOfferPanel::setOffer(const GroupOffer &offer) {
  const QSignalBlocker a(d_->arrival), b(d_->nights), c(d_->same), e(d_->sameRooms);
  d_->name->setText(QString::fromStdString(offer.name));
  // The minimum date keeps the editor from showing nights already past; an offer given in code
  // (a test, a saved what-if) may still name one, and the check says so.
  d_->arrival->setMinimumDate(std::min(d_->arrival->minimumDate(), toQDate(offer.arrival)));
  d_->arrival->setDate(toQDate(offer.arrival));
  d_->nights->setValue(std::max(1, offer.nights()));
  const bool allSame =
      !offer.rooms.empty() && std::all_of(offer.rooms.begin(), offer.rooms.end(),
                                          [&](int r) { return r == offer.rooms.front(); });
  d_->same->setChecked(allSame);
  if (!offer.rooms.empty())
    d_->sameRooms->setValue(offer.rooms.front());
  d_->rooms->setRowCount(0);
  d_->syncRoomRows();
  for (int i = 0; i < offer.nights() && i < d_->rooms->rowCount(); ++i)
    d_->rooms->item(i, 1)->setData(Qt::EditRole, offer.rooms[static_cast<std::size_t>(i)]);
  d_->rate->setValue(offer.rate);
  d_->other->setValue(offer.otherRevenue);
  d_->cost->setValue(offer.cost);
}

GroupOffer GroupOfferPanel::offer() const {
  GroupOffer o;
  o.name = d_->name->text().trimmed().toStdString();
  o.arrival = fromQDate(d_->arrival->date());
  for (int i = 0; i < d_->rooms->rowCount(); ++i)
    o.rooms.push_back(d_->rooms->item(i, 1)->data(Qt::EditRole).toInt());
  o.rate = d_->rate->value();
  o.otherRevenue = d_->other->value();
  o.cost = d_->cost->value();
  return o;
}

void GroupOfferPanel::evaluate() {
  if (!d_->session) {
    d_->message->setText(QStringLiteral("Open a store first."));
    emit evaluated();
    return;
  }
  cancel();
  const GroupOffer o = offer();
  const QString wrong = checkGroupOffer(o, d_->session->readingDate());
  if (!wrong.isEmpty()) {
    ++d_->generation;
    d_->busy(false);
    d_->clearResult(QStringLiteral("No verdict: the offer needs a correction."), wrong);
    d_->message->setText(wrong);
    d_->message->setStyleSheet(QStringLiteral("color: #A03000; font-weight: bold"));
    emit evaluated();
    return;
  }
  const int generation = ++d_->generation;
  d_->control = std::make_shared<Control>();
  d_->progress->setRange(0, 0);
  d_->busy(true);
  d_->message->setStyleSheet({});
  d_->message->setText(QStringLiteral("Forecasting transient demand up to %1 …")
                           .arg(toQDate(o.departure()).toString(QStringLiteral("ddd d MMM yyyy"))));
  // A copy: the check runs in the background while the window may change the session.
  auto session = std::make_shared<const WorkbenchSession>(*d_->session);
  auto control = d_->control;
  auto *watcher = new QFutureWatcher<GroupOfferResult>(this);
  connect(watcher, &QFutureWatcher<GroupOfferResult>::finished, this, [this, watcher, generation] {
    GroupOfferResult r = watcher->result();
    watcher->deleteLater();
    if (generation != d_->generation)
      return; // superseded
    d_->busy(false);
    if (r.cancelled) {
      d_->clearResult(QStringLiteral("No verdict: the check was cancelled."));
      d_->message->setText(QStringLiteral("Check cancelled."));
    } else if (!r.error.isEmpty()) {
      d_->clearResult(QStringLiteral("No verdict."), r.error);
      d_->message->setText(r.error);
      d_->message->setStyleSheet(QStringLiteral("color: #A03000; font-weight: bold"));
    } else {
      d_->show(std::move(r));
    }
    emit evaluated();
  });
  watcher->setFuture(QtConcurrent::run([session, o, control] {
    return evaluateGroupOffer(*session, o, progressOf, control.get());
  }));
}

void GroupOfferPanel::cancel() {
  if (d_->control)
    d_->control->cancel = true;
}

bool GroupOfferPanel::isRunning() const { return d_->running; }
const GroupOfferResult *GroupOfferPanel::result() const {
  return d_->result ? &*d_->result : nullptr;
}
QAbstractItemModel *GroupOfferPanel::table() const { return d_->model; }
GroupOfferChart *GroupOfferPanel::chart() const { return d_->chart; }
QTableWidget *GroupOfferPanel::roomsEditor() const { return d_->rooms; }
QCheckBox *GroupOfferPanel::sameEveryNight() const { return d_->same; }
QSpinBox *GroupOfferPanel::nightsEditor() const { return d_->nights; }
QString GroupOfferPanel::messageText() const { return d_->message->text(); }
QString GroupOfferPanel::verdictText() const {
  return d_->verdict->text() + QLatin1Char('\n') + d_->details->text();
}
QString GroupOfferPanel::cautionText() const { return d_->caution->text(); }

} // namespace cbui
