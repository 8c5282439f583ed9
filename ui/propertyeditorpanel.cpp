#include "ui/propertyeditorpanel.h"

#include "core/store.h"
#include "core/textformat.h"
#include "ui/palette.h"
#include "ui/propertyeditmodel.h"
#include "ui/propertysummarypanel.h"
#include "ui/propertytables.h"
#include "ui/workbenchsession.h"

#include <QAction>
#include <QComboBox>
#include <QDateEdit>
#include <QDoubleSpinBox>
#include <QFormLayout>
#include <QGroupBox>
#include <QHBoxLayout>
#include <QHeaderView>
#include <QLabel>
#include <QLineEdit>
#include <QListWidget>
#include <QPainter>
#include <QPixmap>
#include <QPushButton>
#include <QSettings>
#include <QSpinBox>
#include <QStackedWidget>
#include <QStyledItemDelegate>
#include <QTableView>
#include <QUndoStack>
#include <QVBoxLayout>

#include <cmath>

namespace cbui {
namespace {

using Section = PropertyEditModel::Section;
QString q(const std::string &x) { return QString::fromStdString(x); }
const QString kDateFormat = QStringLiteral("ddd d MMM yyyy");

QIcon swatch(const QString &hex) {
  QPixmap pm(14, 14);
  pm.fill(QColor(hex));
  QPainter p(&pm);
  p.setPen(Qt::darkGray);
  p.drawRect(0, 0, 13, 13);
  return QIcon(pm);
}

void fillColours(QComboBox *box) {
  box->addItem(QStringLiteral("(none)"), QString());
  for (const auto &c : palette::segmentColours())
    box->addItem(swatch(QLatin1String(c.hex)), QString::fromUtf8(c.name), QLatin1String(c.hex));
}

// The segment table's colour column: a list of the palette's colours.
class ColourDelegate : public QStyledItemDelegate {
public:
  using QStyledItemDelegate::QStyledItemDelegate;
  QWidget *createEditor(QWidget *parent, const QStyleOptionViewItem &,
                        const QModelIndex &) const override {
    auto *box = new QComboBox(parent);
    fillColours(box);
    return box;
  }
  void setEditorData(QWidget *editor, const QModelIndex &index) const override {
    auto *box = static_cast<QComboBox *>(editor);
    const int i = box->findData(index.data(PropertyTableModel::ColourRole).toString().toUpper());
    box->setCurrentIndex(std::max(0, i));
  }
  void setModelData(QWidget *editor, QAbstractItemModel *model,
                    const QModelIndex &index) const override {
    model->setData(index, static_cast<QComboBox *>(editor)->currentData(), Qt::EditRole);
  }
};

QDateEdit *dateEdit() {
  auto *e = new QDateEdit(QDate::currentDate());
  e->setCalendarPopup(true);
  e->setDisplayFormat(kDateFormat);
  return e;
}

QLabel *hintLabel(const QString &text) {
  auto *l = new QLabel(text);
  l->setWordWrap(true);
  l->setTextFormat(Qt::PlainText);
  QPalette pal = l->palette();
  pal.setColor(QPalette::WindowText, pal.color(QPalette::PlaceholderText));
  l->setPalette(pal);
  return l;
}

} // namespace

PropertyEditorPanel::PropertyEditorPanel(QWidget *parent)
    : QWidget(parent), model_(new PropertyEditModel(this)), summary_(new PropertySummaryPanel),
      sections_(new QListWidget), pages_(new QStackedWidget),
      undoAction_(new QAction(QStringLiteral("&Undo"), this)),
      redoAction_(new QAction(QStringLiteral("&Redo"), this)) {
  auto *layout = new QHBoxLayout(this);
  sections_->setObjectName(QStringLiteral("propertySections"));
  sections_->setMaximumWidth(220);
  layout->addWidget(sections_);
  auto *right = new QVBoxLayout;
  readOnlyNote_ = new QLabel;
  readOnlyNote_->setWordWrap(true);
  readOnlyNote_->setStyleSheet(QStringLiteral("QLabel { background: #fff3d6; padding: 6px; }"));
  readOnlyNote_->hide();
  right->addWidget(readOnlyNote_);
  right->addWidget(pages_, 1);
  layout->addLayout(right, 1);

  pages_->addWidget(buildGeneral());
  pages_->addWidget(buildCapacity());
  pages_->addWidget(buildRoomTypes());
  pages_->addWidget(buildSegments());
  pages_->addWidget(buildChannels());
  pages_->addWidget(buildSeasons());
  pages_->addWidget(buildCosts());
  pages_->addWidget(buildEvents());
  for (const char *name : {"General", "Capacity changes", "Room types", "Segments", "Channels",
                           "Season bands", "Costs", "Events & holiday map"})
    sections_->addItem(QString::fromUtf8(name));
  sections_->setSpacing(3);
  connect(sections_, &QListWidget::currentRowChanged, this, [this](int row) {
    pages_->setCurrentIndex(row);
    QSettings(QStringLiteral("Curvebench"), QStringLiteral("curvebench"))
        .setValue(QStringLiteral("property/section"), row);
  });
  // The section last worked on, as the window remembers its screen.
  const int last = QSettings(QStringLiteral("Curvebench"), QStringLiteral("curvebench"))
                       .value(QStringLiteral("property/section"), 0)
                       .toInt();
  sections_->setCurrentRow(last >= 0 && last < pages_->count() ? last : 0);

  undoAction_->setShortcut(QKeySequence::Undo);
  redoAction_->setShortcuts(
      {QKeySequence(Qt::CTRL | Qt::SHIFT | Qt::Key_Z), QKeySequence(Qt::CTRL | Qt::Key_Y)});
  undoAction_->setObjectName(QStringLiteral("propertyUndo"));
  redoAction_->setObjectName(QStringLiteral("propertyRedo"));
  connect(undoAction_, &QAction::triggered, this, [this] {
    if (shown_)
      model_->undoStack()->undo();
  });
  connect(redoAction_, &QAction::triggered, this, [this] {
    if (shown_)
      model_->undoStack()->redo();
  });
  QUndoStack *stack = model_->undoStack();
  connect(stack, &QUndoStack::indexChanged, this, [this] { updateActions(); });
  connect(stack, &QUndoStack::cleanChanged, this, [this] { updateActions(); });
  updateActions();

  connect(model_, &PropertyEditModel::changed, this, [this] {
    for (auto &[section, label] : messages_) {
      label->clear();
      label->hide();
    }
    refresh();
  });
  connect(model_, &PropertyEditModel::storeWritten, this, &PropertyEditorPanel::storeWritten);
  connect(model_, &PropertyEditModel::refused, this, [this](int section, const QString &msg) {
    if (auto it = messages_.find(section); it != messages_.end()) {
      it->second->setText(QStringLiteral("⚠ %1 — nothing was saved").arg(msg));
      it->second->show();
    }
    refresh(); // the refused value goes back to what the store holds
  });
}

PropertyEditorPanel::~PropertyEditorPanel() {
  // The model and its undo stack are children, destroyed after this class's part of the object:
  // the stack clears itself on the way and its signals would call back into a half-destroyed
  // panel (found by UBSan). Cut every connection from the model's side first.
  disconnect(model_->undoStack(), nullptr, this, nullptr);
  disconnect(model_, nullptr, this, nullptr);
}

void PropertyEditorPanel::showSession(const WorkbenchSession &session) {
  summary_->showSession(session);
  if (auto msg = model_->setStorePath(session.path()); !msg.isEmpty()) {
    messages_[Section::General]->setText(QStringLiteral("⚠ %1").arg(msg));
    messages_[Section::General]->show();
  }
}

void PropertyEditorPanel::showSection(int index) { sections_->setCurrentRow(index); }

QString PropertyEditorPanel::message(int section) const {
  auto it = messages_.find(section);
  return it == messages_.end() ? QString() : it->second->text();
}

void PropertyEditorPanel::showEvent(QShowEvent *event) {
  QWidget::showEvent(event);
  shown_ = true;
  updateActions();
}

void PropertyEditorPanel::hideEvent(QHideEvent *event) {
  QWidget::hideEvent(event);
  shown_ = false;
  updateActions();
}

void PropertyEditorPanel::setReadOnly(bool readOnly, const QString &reason) {
  readOnly_ = readOnly;
  pages_->setEnabled(!readOnly);
  readOnlyNote_->setText(QStringLiteral("Read-only: %1. The settings are shown but cannot be "
                                        "changed in this window.")
                             .arg(reason));
  readOnlyNote_->setVisible(readOnly);
  updateActions();
}

void PropertyEditorPanel::updateActions() {
  QUndoStack *stack = model_->undoStack();
  undoAction_->setEnabled(shown_ && !readOnly_ && stack->canUndo());
  redoAction_->setEnabled(shown_ && !readOnly_ && stack->canRedo());
  undoAction_->setText(stack->canUndo() ? QStringLiteral("&Undo %1").arg(stack->undoText())
                                        : QStringLiteral("&Undo"));
  redoAction_->setText(stack->canRedo() ? QStringLiteral("&Redo %1").arg(stack->redoText())
                                        : QStringLiteral("&Redo"));
}

void PropertyEditorPanel::done(int section, const QString &refusal) {
  if (refusal.isEmpty()) {
    messages_[section]->clear();
    messages_[section]->hide();
  }
}

QWidget *PropertyEditorPanel::page(int section, const QString &title, const QString &hint,
                                   QWidget *content) {
  auto *w = new QWidget;
  auto *v = new QVBoxLayout(w);
  auto *t = new QLabel(title);
  QFont f = t->font();
  f.setPointSizeF(f.pointSizeF() * 1.3);
  f.setBold(true);
  t->setFont(f);
  v->addWidget(t);
  if (!hint.isEmpty())
    v->addWidget(hintLabel(hint));
  auto *msg = new QLabel;
  msg->setWordWrap(true);
  msg->setObjectName(QStringLiteral("refusal"));
  QPalette pal = msg->palette();
  pal.setColor(QPalette::WindowText, QColor(0xD5, 0x5E, 0x00)); // vermilion, with a ⚠ sign
  msg->setPalette(pal);
  msg->hide();
  messages_[section] = msg;
  v->addWidget(msg);
  v->addWidget(content, 1);
  return w;
}

QTableView *PropertyEditorPanel::table(PropertyTableModel *m) {
  auto *view = new QTableView;
  view->setModel(m);
  view->setSelectionBehavior(QAbstractItemView::SelectRows);
  view->setSelectionMode(QAbstractItemView::SingleSelection);
  view->setEditTriggers(QAbstractItemView::DoubleClicked | QAbstractItemView::EditKeyPressed |
                        QAbstractItemView::AnyKeyPressed);
  view->verticalHeader()->hide();
  view->verticalHeader()->setDefaultSectionSize(view->fontMetrics().height() + 8);
  // The free-text column takes the spare width: reason, name or event label.
  const int stretch = m->kind() == PropertyTableModel::CapacityChanges ||
                              m->kind() == PropertyTableModel::Events ||
                              m->kind() == PropertyTableModel::HolidayPairs
                          ? 2
                          : 1;
  view->horizontalHeader()->setStretchLastSection(false);
  connect(m, &QAbstractItemModel::modelReset, view, [view, stretch] {
    view->resizeColumnsToContents();
    view->horizontalHeader()->setSectionResizeMode(stretch, QHeaderView::Stretch);
  });
  view->setAlternatingRowColors(true);
  return view;
}

// ---- pages -----------------------------------------------------------------------------------

QWidget *PropertyEditorPanel::buildGeneral() {
  auto *content = new QWidget;
  auto *h = new QHBoxLayout(content);
  auto *box = new QGroupBox(QStringLiteral("Property"));
  auto *form = new QFormLayout(box);
  form->setFieldGrowthPolicy(QFormLayout::FieldsStayAtSizeHint);
  name_ = new QLineEdit;
  name_->setMinimumWidth(320);
  currency_ = new QLineEdit;
  currency_->setMaxLength(3);
  currency_->setMaximumWidth(80);
  capacity_ = new QSpinBox;
  capacity_->setRange(0, 100000);
  capacity_->setSuffix(QStringLiteral(" rooms"));
  capacity_->setGroupSeparatorShown(true);
  margin_ = new QDoubleSpinBox;
  margin_->setRange(0, 25);
  margin_->setDecimals(1);
  margin_->setSingleStep(0.5);
  margin_->setSuffix(QStringLiteral(" % of capacity"));
  stly_ = new QComboBox;
  stly_->addItem(QStringLiteral("Same weekday, 364 days earlier"));
  stly_->addItem(QStringLiteral("Same calendar date"));
  form->addRow(QStringLiteral("Name"), name_);
  form->addRow(QStringLiteral("Currency"), currency_);
  form->addRow(QStringLiteral("Base capacity"), capacity_);
  form->addRow(QStringLiteral("Sold out within"), margin_);
  form->addRow(QStringLiteral("Same time last year (STLY)"), stly_);
  form->addRow(hintLabel(QStringLiteral(
      "Base capacity holds until the first dated change (see Capacity changes). A night "
      "counts as sold out when rooms sold come within the margin of capacity. STLY compares a "
      "night with last year's night of the same weekday (364 days earlier) or the same calendar "
      "date; event notes can pair moving holidays (Events & holiday map).")));
  auto *left = new QVBoxLayout;
  left->addWidget(box);
  left->addStretch();
  h->addLayout(left, 3);
  auto *dataBox = new QGroupBox(QStringLiteral("The data"));
  auto *dv = new QVBoxLayout(dataBox);
  dv->addWidget(summary_);
  auto *right = new QVBoxLayout;
  right->addWidget(dataBox);
  right->addStretch();
  h->addLayout(right, 2);

  connect(name_, &QLineEdit::editingFinished, this, [this] {
    if (name_->text().trimmed() != q(model_->property().name))
      done(Section::General, model_->setName(name_->text()));
  });
  connect(currency_, &QLineEdit::editingFinished, this, [this] {
    if (currency_->text().trimmed().toUpper() != q(model_->property().currency))
      done(Section::General, model_->setCurrency(currency_->text()));
  });
  connect(capacity_, &QSpinBox::editingFinished, this, [this] {
    if (capacity_->value() != model_->property().capacity)
      done(Section::General, model_->setCapacity(capacity_->value()));
  });
  connect(margin_, &QDoubleSpinBox::editingFinished, this, [this] {
    const double share = margin_->value() / 100.0;
    if (std::abs(share - model_->property().selloutMargin) > 1e-9)
      done(Section::General, model_->setSelloutMargin(share));
  });
  connect(stly_, &QComboBox::activated, this, [this](int i) {
    const bool calendar = model_->property().stly == cb::StlyAlignment::CalendarDate;
    if ((i == 1) != calendar)
      done(Section::General, model_->setStlyCalendarDate(i == 1));
  });
  return page(Section::General, QStringLiteral("General"), {}, content);
}

QWidget *PropertyEditorPanel::buildCapacity() {
  capacityTable_ = new PropertyTableModel(PropertyTableModel::CapacityChanges, model_, this);
  auto *content = new QWidget;
  auto *v = new QVBoxLayout(content);
  auto *view = table(capacityTable_);
  v->addWidget(view, 1);
  auto *row = new QHBoxLayout;
  auto *from = dateEdit();
  auto *rooms = new QSpinBox;
  rooms->setRange(0, 100000);
  rooms->setSuffix(QStringLiteral(" rooms"));
  auto *reason = new QLineEdit;
  reason->setPlaceholderText(QStringLiteral("Reason (renovation, new wing, …)"));
  auto *add = new QPushButton(QStringLiteral("Add change"));
  auto *remove = new QPushButton(QStringLiteral("Remove selected"));
  row->addWidget(new QLabel(QStringLiteral("From")));
  row->addWidget(from);
  row->addWidget(rooms);
  row->addWidget(reason, 1);
  row->addWidget(add);
  row->addWidget(remove);
  v->addLayout(row);
  // A new change starts from the base capacity, not 0 rooms (which would close the hotel).
  connect(model_, &PropertyEditModel::changed, rooms, [this, rooms] {
    if (rooms->value() == 0)
      rooms->setValue(model_->property().capacity);
  });
  connect(add, &QPushButton::clicked, this, [this, from, rooms, reason] {
    const QString r = model_->addCapacityChange(from->date(), rooms->value(), reason->text());
    done(Section::Capacity, r);
    if (r.isEmpty())
      reason->clear();
  });
  connect(remove, &QPushButton::clicked, this, [this, view] {
    done(Section::Capacity, model_->removeCapacityChange(view->currentIndex().row()));
  });
  return page(Section::Capacity, QStringLiteral("Capacity changes"),
              QStringLiteral("Rooms available from a night on, until the next change; before the "
                             "first change the base capacity holds. 0 rooms closes the hotel. "
                             "Double-click a cell to edit it."),
              content);
}

QWidget *PropertyEditorPanel::buildRoomTypes() {
  roomTable_ = new PropertyTableModel(PropertyTableModel::RoomTypes, model_, this);
  auto *content = new QWidget;
  auto *v = new QVBoxLayout(content);
  auto *view = table(roomTable_);
  v->addWidget(view, 1);
  auto *row = new QHBoxLayout;
  auto *code = new QLineEdit;
  code->setPlaceholderText(QStringLiteral("Code"));
  code->setMaximumWidth(110);
  auto *name = new QLineEdit;
  name->setPlaceholderText(QStringLiteral("Name"));
  auto *rooms = new QSpinBox;
  rooms->setRange(0, 100000);
  rooms->setSuffix(QStringLiteral(" rooms"));
  auto *add = new QPushButton(QStringLiteral("Add room type"));
  auto *remove = new QPushButton(QStringLiteral("Remove selected"));
  row->addWidget(code);
  row->addWidget(name, 1);
  row->addWidget(rooms);
  row->addWidget(add);
  row->addWidget(remove);
  v->addLayout(row);
  connect(add, &QPushButton::clicked, this, [this, code, name, rooms] {
    const QString r = model_->addRoomType(code->text(), name->text(), rooms->value());
    done(Section::RoomTypes, r);
    if (r.isEmpty()) {
      code->clear();
      name->clear();
    }
  });
  connect(remove, &QPushButton::clicked, this, [this, view] {
    done(Section::RoomTypes, model_->removeRoomType(roomTable_->code(view->currentIndex().row())));
  });
  return page(Section::RoomTypes, QStringLiteral("Room types"),
              QStringLiteral("Codes as the reservations carry them. A room type still used by a "
                             "reservation or group block cannot be removed."),
              content);
}

QWidget *PropertyEditorPanel::buildSegments() {
  segmentTable_ = new PropertyTableModel(PropertyTableModel::Segments, model_, this);
  auto *content = new QWidget;
  auto *v = new QVBoxLayout(content);
  auto *view = table(segmentTable_);
  view->setItemDelegateForColumn(3, new ColourDelegate(view));
  v->addWidget(view, 1);
  auto *row = new QHBoxLayout;
  auto *code = new QLineEdit;
  code->setPlaceholderText(QStringLiteral("Code"));
  code->setMaximumWidth(110);
  auto *name = new QLineEdit;
  name->setPlaceholderText(QStringLiteral("Name"));
  auto *rank = new QSpinBox;
  rank->setRange(0, 99);
  rank->setPrefix(QStringLiteral("rank "));
  rank->setSpecialValueText(QStringLiteral("not ranked"));
  auto *colour = new QComboBox;
  fillColours(colour);
  auto *add = new QPushButton(QStringLiteral("Add segment"));
  auto *remove = new QPushButton(QStringLiteral("Remove selected"));
  row->addWidget(code);
  row->addWidget(name, 1);
  row->addWidget(rank);
  row->addWidget(colour);
  row->addWidget(add);
  row->addWidget(remove);
  v->addLayout(row);
  connect(add, &QPushButton::clicked, this, [this, code, name, rank, colour] {
    const QString r = model_->addSegment(code->text(), name->text(), rank->value(),
                                         colour->currentData().toString());
    done(Section::Segments, r);
    if (r.isEmpty()) {
      code->clear();
      name->clear();
    }
  });
  connect(remove, &QPushButton::clicked, this, [this, view] {
    done(Section::Segments, model_->removeSegment(segmentTable_->code(view->currentIndex().row())));
  });
  return page(Section::Segments, QStringLiteral("Segments"),
              QStringLiteral("Yield rank 1 is the highest-paying segment. Colours come from a "
                             "palette told apart with the common forms of colour blindness "
                             "(Okabe & Ito). A segment still used by a reservation, block, "
                             "denial, closure or forecast override cannot be removed."),
              content);
}

QWidget *PropertyEditorPanel::buildChannels() {
  channelTable_ = new PropertyTableModel(PropertyTableModel::Channels, model_, this);
  auto *content = new QWidget;
  auto *v = new QVBoxLayout(content);
  auto *view = table(channelTable_);
  v->addWidget(view, 1);
  auto *row = new QHBoxLayout;
  auto *code = new QLineEdit;
  code->setPlaceholderText(QStringLiteral("Code"));
  code->setMaximumWidth(110);
  auto *name = new QLineEdit;
  name->setPlaceholderText(QStringLiteral("Name"));
  auto *add = new QPushButton(QStringLiteral("Add channel"));
  auto *remove = new QPushButton(QStringLiteral("Remove selected"));
  row->addWidget(code);
  row->addWidget(name, 1);
  row->addWidget(add);
  row->addWidget(remove);
  v->addLayout(row);
  connect(add, &QPushButton::clicked, this, [this, code, name] {
    const QString r = model_->addChannel(code->text(), name->text());
    done(Section::Channels, r);
    if (r.isEmpty()) {
      code->clear();
      name->clear();
    }
  });
  connect(remove, &QPushButton::clicked, this, [this, view] {
    done(Section::Channels, model_->removeChannel(channelTable_->code(view->currentIndex().row())));
  });
  return page(Section::Channels, QStringLiteral("Channels"),
              QStringLiteral("Where bookings come from. A channel still used by a reservation "
                             "cannot be removed."),
              content);
}

QWidget *PropertyEditorPanel::buildSeasons() {
  auto *content = new QWidget;
  auto *v = new QVBoxLayout(content);
  auto *box = new QGroupBox(QStringLiteral("Bands of unconstrained demand over capacity"));
  auto *form = new QFormLayout(box);
  form->setFieldGrowthPolicy(QFormLayout::FieldsStayAtSizeHint);
  auto band = [] {
    auto *b = new QDoubleSpinBox;
    b->setRange(1, 200);
    b->setDecimals(1);
    b->setSingleStep(1);
    b->setSuffix(QStringLiteral(" %"));
    return b;
  };
  shoulder_ = band();
  peak_ = band();
  form->addRow(QStringLiteral("Shoulder from"), shoulder_);
  form->addRow(QStringLiteral("Peak from"), peak_);
  seasonsNow_ = hintLabel({});
  form->addRow(seasonsNow_);
  v->addWidget(box);
  v->addStretch();
  auto commit = [this] {
    const double s = shoulder_->value() / 100.0, p = peak_->value() / 100.0;
    const auto &b = model_->property().settings.seasons;
    if (std::abs(s - b.shoulderFrom) > 1e-9 || std::abs(p - b.peakFrom) > 1e-9)
      done(Section::Seasons, model_->setSeasonBands(s, p));
  };
  connect(shoulder_, &QDoubleSpinBox::editingFinished, this, commit);
  connect(peak_, &QDoubleSpinBox::editingFinished, this, commit);
  return page(Section::Seasons, QStringLiteral("Season bands"),
              QStringLiteral("A night is low season below the shoulder band, shoulder from it, "
                             "peak from the peak band. The defaults, 70 % and 90 %, are common "
                             "practice with no single source. Year Map colours nights by these "
                             "bands, and unconstraining uses them."),
              content);
}

QWidget *PropertyEditorPanel::buildCosts() {
  auto *content = new QWidget;
  auto *v = new QVBoxLayout(content);
  auto *box = new QGroupBox(QStringLiteral("Overbooking and groups"));
  auto *form = new QFormLayout(box);
  form->setFieldGrowthPolicy(QFormLayout::FieldsStayAtSizeHint);
  walkCost_ = new QDoubleSpinBox;
  walkCost_->setRange(0, 1000000);
  walkCost_->setDecimals(2);
  walkCost_->setGroupSeparatorShown(true);
  walkCost_->setSpecialValueText(QStringLiteral("not set"));
  lateDays_ = new QSpinBox;
  lateDays_->setRange(0, 365);
  lateDays_->setSuffix(QStringLiteral(" days before arrival or fewer"));
  tentative_ = new QDoubleSpinBox;
  tentative_->setRange(0, 100);
  tentative_->setDecimals(0);
  tentative_->setSuffix(QStringLiteral(" %"));
  form->addRow(QStringLiteral("Cost of walking a guest"), walkCost_);
  form->addRow(QStringLiteral("A cancellation is late at"), lateDays_);
  form->addRow(QStringLiteral("Tentative groups turn definite"), tentative_);
  v->addWidget(box);
  v->addWidget(hintLabel(QStringLiteral(
      "Walk cost: relocation, transport and goodwill for one guest who cannot be housed; the "
      "overbooking figures weigh it against an empty room. Tentative groups count with this "
      "chance in group forecasts; 50 % is a placeholder with no source — set your own. "
      "Displacement of a group offer uses the offer's own costs (commission, amenities per "
      "room-night), entered with the offer, not these settings.")));
  v->addStretch();
  connect(walkCost_, &QDoubleSpinBox::editingFinished, this, [this] {
    if (std::abs(walkCost_->value() - model_->property().settings.walkCost) > 1e-9)
      done(Section::Costs, model_->setWalkCost(walkCost_->value()));
  });
  connect(lateDays_, &QSpinBox::editingFinished, this, [this] {
    if (lateDays_->value() != model_->property().settings.lateCancelDays)
      done(Section::Costs, model_->setLateCancelDays(lateDays_->value()));
  });
  connect(tentative_, &QDoubleSpinBox::editingFinished, this, [this] {
    const double p = tentative_->value() / 100.0;
    if (std::abs(p - model_->property().settings.tentativeProbability) > 1e-9)
      done(Section::Costs, model_->setTentativeProbability(p));
  });
  return page(Section::Costs, QStringLiteral("Costs"), {}, content);
}

QWidget *PropertyEditorPanel::buildEvents() {
  eventTable_ = new PropertyTableModel(PropertyTableModel::Events, model_, this);
  pairTable_ = new PropertyTableModel(PropertyTableModel::HolidayPairs, model_, this);
  auto *content = new QWidget;
  auto *v = new QVBoxLayout(content);
  auto *view = table(eventTable_);
  v->addWidget(view, 3);
  auto *row = new QHBoxLayout;
  auto *from = dateEdit();
  auto *to = dateEdit();
  auto *label = new QLineEdit;
  label->setPlaceholderText(QStringLiteral("Label (the same label each year)"));
  auto *add = new QPushButton(QStringLiteral("Add event"));
  auto *remove = new QPushButton(QStringLiteral("Remove selected"));
  row->addWidget(from);
  row->addWidget(new QLabel(QStringLiteral("to")));
  row->addWidget(to);
  row->addWidget(label, 1);
  row->addWidget(add);
  row->addWidget(remove);
  v->addLayout(row);
  connect(from, &QDateEdit::dateChanged, to, [to](const QDate &d) {
    if (to->date() < d)
      to->setDate(d);
  });
  connect(add, &QPushButton::clicked, this, [this, from, to, label] {
    const QString r = model_->addEvent(from->date(), to->date(), label->text());
    done(Section::Events, r);
    if (r.isEmpty())
      label->clear();
  });
  connect(remove, &QPushButton::clicked, this,
          [this, view] { done(Section::Events, model_->removeEvent(view->currentIndex().row())); });
  auto *pairs = new QGroupBox(QStringLiteral("Holiday map (from the event notes, read-only)"));
  auto *pv = new QVBoxLayout(pairs);
  holidayHint_ = hintLabel({});
  pv->addWidget(holidayHint_);
  pv->addWidget(table(pairTable_));
  v->addWidget(pairs, 2);
  return page(Section::Events, QStringLiteral("Events & holiday map"),
              QStringLiteral("Event notes mark fairs, holidays and other nights out of the "
                             "ordinary. Double-click a cell to edit it."),
              content);
}

// ---- refresh ---------------------------------------------------------------------------------

void PropertyEditorPanel::refresh() {
  const cb::Property &p = model_->property();
  const QSignalBlocker b1(name_), b2(currency_), b3(capacity_), b4(margin_), b5(stly_),
      b6(shoulder_), b7(peak_), b8(walkCost_), b9(lateDays_), b10(tentative_);
  name_->setText(q(p.name));
  currency_->setText(q(p.currency));
  capacity_->setValue(p.capacity);
  margin_->setValue(p.selloutMargin * 100.0);
  stly_->setCurrentIndex(p.stly == cb::StlyAlignment::CalendarDate ? 1 : 0);
  shoulder_->setValue(p.settings.seasons.shoulderFrom * 100.0);
  peak_->setValue(p.settings.seasons.peakFrom * 100.0);
  seasonsNow_->setText(
      QStringLiteral("With capacity %1: shoulder from %2 rooms of demand, peak from %3.")
          .arg(q(cb::formatCount(p.capacity)),
               q(cb::formatCount(static_cast<std::int64_t>(
                   std::ceil(p.settings.seasons.shoulderFrom * p.capacity - 1e-9)))),
               q(cb::formatCount(static_cast<std::int64_t>(
                   std::ceil(p.settings.seasons.peakFrom * p.capacity - 1e-9))))));
  walkCost_->setPrefix(q(p.currency) + QLatin1Char(' '));
  walkCost_->setValue(p.settings.walkCost);
  lateDays_->setValue(p.settings.lateCancelDays);
  tentative_->setValue(p.settings.tentativeProbability * 100.0);
  holidayHint_->setText(
      QStringLiteral("Two event notes with the same label a year apart pair their nights: this "
                     "year's fair is paced against last year's fair. The other nights compare "
                     "with %1. Edit the notes above to change the pairs.")
          .arg(p.stly == cb::StlyAlignment::CalendarDate
                   ? QStringLiteral("the same calendar date last year")
                   : QStringLiteral("the same weekday 364 days earlier")));
}

} // namespace cbui
