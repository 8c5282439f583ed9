// The Group offer screen's model layer: see groupoffermodel.h.
#include "ui/groupoffermodel.h"

#include "core/groupmodel.h"
#include "core/store.h"
#include "core/textformat.h"
#include "ui/csvexport.h"

#include <QBrush>
#include <QColor>
#include <QDate>
#include <QFont>
#include <QStandardItemModel>
#include <QStringList>

#include <cmath>
#include <exception>

namespace cbui {
namespace {

QString q(const std::string &s) { return QString::fromStdString(s); }

QString dateText(cb::Date d) {
  return QDate(d.year(), static_cast<int>(d.month()), static_cast<int>(d.day()))
      .toString(QStringLiteral("ddd d MMM yyyy"));
}

QString money(double v, const std::string &currency) { return q(cb::formatMoney(v, currency)); }

/// Grouped number with `decimals` places (English grouping, as cb::formatMoney).
QString grouped(double v, int decimals) {
  if (decimals == 2)
    return money(v, {});
  const double scale = std::pow(10.0, decimals);
  const double r = std::round(v * scale) / scale;
  const auto whole = static_cast<std::int64_t>(std::trunc(r));
  QString text = q(cb::formatCount(whole));
  if (r < 0 && whole == 0)
    text.prepend(QLatin1Char('-'));
  if (decimals > 0) {
    const auto frac =
        static_cast<int>(std::lround(std::fabs(r - static_cast<double>(whole)) * scale));
    text += QStringLiteral(".%1").arg(frac, decimals, 10, QLatin1Char('0'));
  }
  return text;
}

/// Passes the forecast's progress on and remembers a cancel.
struct ProgressRelay {
  cb::ProgressFn inner = nullptr;
  void *context = nullptr;
  bool cancelled = false;
};

bool relay(void *context, std::int64_t done, std::int64_t total) {
  auto *r = static_cast<ProgressRelay *>(context);
  if (r->inner && !r->inner(r->context, done, total))
    r->cancelled = true;
  return !r->cancelled;
}

QStandardItem *textCell(const QString &text) {
  auto *item = new QStandardItem(text);
  item->setEditable(false);
  return item;
}

QStandardItem *numberCell(double v, int decimals) {
  auto *item = textCell(grouped(v, decimals));
  item->setTextAlignment(Qt::AlignRight | Qt::AlignVCenter);
  item->setData(QString::number(v, 'f', decimals + 2), kCsvValueRole);
  return item;
}

QStandardItem *countCell(std::int64_t n) {
  auto *item = textCell(q(cb::formatCount(n)));
  item->setTextAlignment(Qt::AlignRight | Qt::AlignVCenter);
  item->setData(static_cast<qlonglong>(n), kCsvValueRole);
  return item;
}

} // namespace

std::vector<cb::OfferNight> GroupOffer::offerNights() const {
  std::vector<cb::OfferNight> out;
  for (int i = 0; i < nights(); ++i)
    out.push_back({arrival + i, rooms[static_cast<std::size_t>(i)], rate, otherRevenue, cost});
  return out;
}

QString checkGroupOffer(const GroupOffer &offer, cb::Date asOf) {
  if (offer.rooms.empty())
    return QStringLiteral("The offer has no nights: give it one night or more.");
  if (offer.nights() > kMaxOfferNights)
    return QStringLiteral("The offer has %1 nights; the check takes at most %2.")
        .arg(offer.nights())
        .arg(kMaxOfferNights);
  for (int i = 0; i < offer.nights(); ++i)
    if (offer.rooms[static_cast<std::size_t>(i)] < 1)
      return QStringLiteral("%1 has %2 rooms: every night of the offer needs 1 room or more "
                            "(shorten the stay instead).")
          .arg(dateText(offer.arrival + i))
          .arg(offer.rooms[static_cast<std::size_t>(i)]);
  if (offer.arrival <= asOf)
    return QStringLiteral("The first night, %1, is on or before the reading date %2: the check "
                          "is for nights still to come.")
        .arg(dateText(offer.arrival), dateText(asOf));
  if (offer.arrival - asOf > kMaxOfferDaysAhead)
    return QStringLiteral("The first night, %1, is more than %2 days after the reading date: "
                          "there is no forecast that far ahead.")
        .arg(dateText(offer.arrival))
        .arg(kMaxOfferDaysAhead);
  if (!std::isfinite(offer.rate) || offer.rate < 0)
    return QStringLiteral("The rate cannot be negative.");
  if (!std::isfinite(offer.otherRevenue) || offer.otherRevenue < 0)
    return QStringLiteral("Other revenue cannot be negative.");
  if (!std::isfinite(offer.cost) || offer.cost < 0)
    return QStringLiteral("The cost cannot be negative.");
  return {};
}

GroupOffer startingOffer(const WorkbenchSession &session) {
  GroupOffer o;
  o.name = "New group";
  o.arrival = session.readingDate() + 28;
  while (o.arrival.isoWeekday() != 4)
    ++o.arrival;
  o.rooms = {20, 20, 20};
  o.rate = std::round(cb::transientAdr(session.reservations(), session.readingDate()));
  return o;
}

GroupOfferResult evaluateGroupOffer(const WorkbenchSession &session, const GroupOffer &offer,
                                    cb::ProgressFn progress, void *context) {
  GroupOfferResult r;
  r.offer = offer;
  r.asOf = session.readingDate();
  r.currency = session.property().currency;
  r.error = checkGroupOffer(offer, r.asOf);
  if (!r.error.isEmpty())
    return r;
  ProgressRelay control{progress, context, false};
  try {
    // Blocks are not part of the session: read them from the store (a handle of our own, as
    // this runs off the UI thread).
    const std::vector<cb::BlockRecord> blocks = cb::Store::open(session.path())->blockRecords();
    cb::OutlookOptions o; // the CLI's defaults
    o.asOf = r.asOf;
    o.progress = relay;
    o.progressContext = &control;
    r.method = o.method;
    r.displacement =
        cb::displacementFromData(session.reservations(), blocks, session.property(),
                                 session.censorSources(), session.events(), offer.offerNights(), o);
    const cb::GroupModel model(blocks, session.reservations());
    for (const cb::DisplacementNight &n : r.displacement.nights) {
      GroupsHeld h;
      for (std::size_t i = 0; i < model.blocks().size(); ++i) {
        const cb::GroupBlock &b = model.blocks()[i].block;
        if (b.arrival <= n.night && n.night < b.departure) {
          h.blocked += b.roomsPerNight;
          h.pickedUp += model.pickedUp(i, n.night, r.asOf);
        }
      }
      r.held.push_back(h);
    }
  } catch (const std::exception &e) {
    if (control.cancelled) {
      r.cancelled = true;
      return r;
    }
    r.error = QStringLiteral("The check failed: %1").arg(q(e.what()));
    return r;
  }
  r.cancelled = control.cancelled;
  return r;
}

QString nightVerdict(const cb::DisplacementNight &n) {
  if (n.shoulder)
    return n.net < 0 ? QStringLiteral("Shoulder: loses") : QStringLiteral("Shoulder: no loss");
  return n.net > 0 ? QStringLiteral("Group pays") : QStringLiteral("Group does not pay");
}

QString offerVerdict(const cb::Displacement &d) {
  return d.worthIt ? QStringLiteral("the group brings more than the transient business it "
                                    "displaces.")
                   : QStringLiteral("the group displaces more transient value than it brings: "
                                    "decline or re-price.");
}

QString offerTotals(const GroupOfferResult &r) {
  const cb::Displacement &d = r.displacement;
  return QStringLiteral("Group value %1 − displaced transient value %2 = net %3%4 (shoulder "
                        "nights included; %5 of transient room-nights go on to the next night)")
      .arg(money(d.groupValue, r.currency), money(d.displacedValue, r.currency),
           d.net > 0 ? QStringLiteral("+") : QString(), money(d.net, r.currency),
           q(cb::formatPercent(d.continuationShare, 0)));
}

QString breakEvenText(const GroupOfferResult &r) {
  const cb::Displacement &d = r.displacement;
  if (!d.breakEvenRate)
    return QStringLiteral("No break-even rate: the offer has no rooms.");
  QString text = QStringLiteral("Break-even group rate: %1 per room-night")
                     .arg(money(*d.breakEvenRate, r.currency));
  if (*d.breakEvenRate < 0)
    text += QStringLiteral(" (below zero: other revenue less cost already covers the displaced "
                           "transient business)");
  return text + QStringLiteral(" — the offered rate is %1.").arg(money(r.offer.rate, r.currency));
}

void fillGroupOfferTable(QStandardItemModel &table, const GroupOfferResult &r) {
  table.clear();
  const QString cur = r.currency.empty() ? QString() : QStringLiteral(" (%1)").arg(q(r.currency));
  table.setHorizontalHeaderLabels(
      {QStringLiteral("Night"), QStringLiteral("Day"), QStringLiteral("Type"),
       QStringLiteral("Capacity"), QStringLiteral("Transient OTB"), QStringLiteral("Groups held"),
       QStringLiteral("Transient demand"), QStringLiteral("± sd"), QStringLiteral("Offered rooms"),
       QStringLiteral("Displaced rooms"), QStringLiteral("Transient rate") + cur,
       QStringLiteral("Displaced revenue") + cur, QStringLiteral("Group value") + cur,
       QStringLiteral("Net") + cur, QStringLiteral("Verdict"), QStringLiteral("Notes")});
  if (!r.ok())
    return;
  const cb::Date first = r.offer.arrival;
  for (std::size_t k = 0; k < r.displacement.nights.size(); ++k) {
    const cb::DisplacementNight &n = r.displacement.nights[k];
    const GroupsHeld held = k < r.held.size() ? r.held[k] : GroupsHeld{};
    QList<QStandardItem *> row(GroupOfferColumnCount, nullptr);
    row[ColNight] = textCell(
        QDate(n.night.year(), static_cast<int>(n.night.month()), static_cast<int>(n.night.day()))
            .toString(QStringLiteral("d MMM yyyy")));
    row[ColNight]->setData(q(n.night.toIso()), kCsvValueRole);
    static const char *const days[] = {"Mon", "Tue", "Wed", "Thu", "Fri", "Sat", "Sun"};
    row[ColWeekday] = textCell(QString::fromLatin1(days[n.night.isoWeekday() - 1]));
    row[ColKind] = textCell(n.shoulder ? QStringLiteral("shoulder") : QStringLiteral("offer"));
    row[ColKind]->setToolTip(!n.shoulder ? QStringLiteral("A night of the group's stay")
                             : n.night < first
                                 ? QStringLiteral("The night before the group arrives")
                                 : QStringLiteral("The night the group leaves"));
    row[ColCapacity] = countCell(n.input.capacity);
    row[ColOtb] = countCell(n.input.transientOtb);
    row[ColGroupsHeld] = numberCell(n.input.groupRooms, 1);
    row[ColGroupsHeld]->setToolTip(
        QStringLiteral("Expected rooms of the groups already held: %1 blocked, %2 picked up")
            .arg(held.blocked)
            .arg(held.pickedUp));
    row[ColTransientMean] = numberCell(n.input.transientMean, 1);
    row[ColTransientSd] = numberCell(n.input.transientSd, 1);
    row[ColOffered] = countCell(n.offer.rooms);
    row[ColDisplaced] = numberCell(n.displacedRooms, 2);
    row[ColTransientRate] = numberCell(n.input.transientRate, 2);
    row[ColDisplacedValue] = numberCell(n.displacedValue, 2);
    row[ColGroupValue] = numberCell(n.groupValue, 2);
    row[ColNet] = numberCell(n.net, 2);
    row[ColVerdict] = textCell(nightVerdict(n));
    row[ColVerdict]->setToolTip(
        n.shoulder  ? QStringLiteral("The group brings nothing on a shoulder night; a guest turned "
                                      "away on the next night may have stayed this one too")
        : n.net > 0 ? QStringLiteral("The group's value is more than the transient "
                                     "revenue it displaces on this night")
                    : QStringLiteral("The transient revenue displaced on this night "
                                     "is more than the group's value"));
    QStringList notes;
    for (const std::string &s : n.notes)
      notes << q(s);
    row[ColNotes] = textCell(notes.join(QStringLiteral("; ")));
    row[ColNotes]->setToolTip(row[ColNotes]->text());
    if (n.shoulder) {
      for (QStandardItem *item : row) {
        QFont f = item->font();
        f.setItalic(true);
        item->setFont(f);
        item->setBackground(QColor(0xEE, 0xEE, 0xEE));
      }
    } else if (n.net <= 0) {
      QFont f = row[ColVerdict]->font();
      f.setBold(true);
      row[ColVerdict]->setFont(f);
    }
    table.appendRow(row);
  }
}

} // namespace cbui
