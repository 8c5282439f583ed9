// The Property screen's model layer, offscreen: every edit writes the store (read back through a
// fresh cb::Store), undo writes the exact old values back, redo the new ones, and a refused edit
// writes nothing and leaves the undo stack as it was. The table models show and edit the lists;
// the holiday map's pairs are worked out by hand from core/holidaymap.h's rule. Last, the main
// window: an edit reloads the session with the new capacity, Undo / Redo only act while the
// Property screen is shown.
#include "core/store.h"
#include "testsupport.h"
#include "ui/mainwindow.h"
#include "ui/propertyeditmodel.h"
#include "ui/propertyeditorpanel.h"
#include "ui/propertytables.h"
#include "ui/workbenchsession.h"

#include <QAction>
#include <QApplication>
#include <QLineEdit>
#include <QSignalSpy>
#include <QStandardPaths>
#include <QTableView>
#include <QTest>
#include <QUndoStack>

#include <memory>

namespace {

cb::Date d(const char *iso) { return *cb::Date::parseIso(iso); }

cb::Property startProperty() {
  cb::Property p;
  p.name = "Harbour Lights";
  p.currency = "CHF";
  p.capacity = 1200;
  p.capacityChanges = {{d("2026-01-10"), 1100, "east wing works"}};
  p.stly = cb::StlyAlignment::Weekday364;
  p.selloutMargin = 0.02;
  p.settings.seasons = {0.65, 0.85};
  p.settings.walkCost = 180;
  p.settings.lateCancelDays = 3;
  p.settings.tentativeProbability = 0.4;
  return p;
}

void fillStore(const std::filesystem::path &path) {
  auto store = cb::Store::create(path, startProperty());
  store->upsertRoomType({"DBL", "Double", 800});
  store->upsertRoomType({"SGL", "Single", 400});
  store->upsertSegment({"CORP", "Corporate", 1, "#0072B2"});
  store->upsertSegment({"LEIS", "Leisure", 2, "#E69F00"});
  store->upsertChannel({"WEB", "Own website"});
  cb::Reservation r;
  r.id = "R1";
  r.bookedOn = d("2026-01-02");
  r.arrival = d("2026-02-01");
  r.departure = d("2026-02-03");
  r.rooms = 1;
  r.roomType = "DBL";
  r.segment = "CORP";
  r.channel = "WEB";
  r.rate = 120;
  cb::Store::Transaction tx(*store);
  store->upsertReservation(r, 0);
  tx.commit();
}

std::unique_ptr<cb::Store> reopen(const std::filesystem::path &p) { return cb::Store::open(p); }

// Every field of the property, settings included, as text, so a QCOMPARE names what differs.
QString dump(const cb::Property &p) {
  QString out = QStringLiteral("%1|%2|%3|%4|%5|%6/%7|%8|%9|%10")
                    .arg(QString::fromStdString(p.name), QString::fromStdString(p.currency))
                    .arg(p.capacity)
                    .arg(p.stly == cb::StlyAlignment::CalendarDate ? 1 : 0)
                    .arg(p.selloutMargin)
                    .arg(p.settings.seasons.shoulderFrom)
                    .arg(p.settings.seasons.peakFrom)
                    .arg(p.settings.walkCost)
                    .arg(p.settings.lateCancelDays)
                    .arg(p.settings.tentativeProbability);
  for (const auto &c : p.capacityChanges)
    out += QStringLiteral("|%1:%2:%3")
               .arg(QString::fromStdString(c.from.toIso()))
               .arg(c.rooms)
               .arg(QString::fromStdString(c.reason));
  return out;
}

} // namespace

class PropertyEditorTest : public QObject {
  Q_OBJECT
private slots:
  void initTestCase() { QStandardPaths::setTestModeEnabled(true); }

  void generalEditsWriteUndoAndRedo() {
    cbtest::TempDir dir;
    const auto path = dir / "h.curvebench";
    fillStore(path);
    cbui::PropertyEditModel m;
    QVERIFY(m.setStorePath(path).isEmpty());
    const QString before = dump(reopen(path)->property());
    QSignalSpy written(&m, &cbui::PropertyEditModel::storeWritten);

    QCOMPARE(m.setCapacity(1250), QString());
    QCOMPARE(reopen(path)->property().capacity, 1250);
    QCOMPARE(m.property().capacity, 1250); // the model reread the store
    QCOMPARE(m.setSelloutMargin(0.05), QString());
    QCOMPARE(m.setStlyCalendarDate(true), QString());
    QCOMPARE(m.setCurrency(QStringLiteral(" eur ")), QString());
    QCOMPARE(m.setName(QStringLiteral("Harbour Lights Annex")), QString());
    auto after = reopen(path)->property();
    QCOMPARE(after.selloutMargin, 0.05);
    QVERIFY(after.stly == cb::StlyAlignment::CalendarDate);
    QCOMPARE(after.currency, std::string("EUR"));
    QCOMPARE(after.name, std::string("Harbour Lights Annex"));
    QCOMPARE(m.undoStack()->count(), 5);
    QCOMPARE(written.count(), 5);

    QCOMPARE(m.setSeasonBands(0.72, 0.95), QString());
    QCOMPARE(m.setWalkCost(240.5), QString());
    QCOMPARE(m.setLateCancelDays(7), QString());
    QCOMPARE(m.setTentativeProbability(0.75), QString());
    after = reopen(path)->property();
    QCOMPARE(after.settings.seasons.shoulderFrom, 0.72);
    QCOMPARE(after.settings.seasons.peakFrom, 0.95);
    QCOMPARE(after.settings.walkCost, 240.5);
    QCOMPARE(after.settings.lateCancelDays, 7);
    QCOMPARE(after.settings.tentativeProbability, 0.75);
    const QString edited = dump(after);

    while (m.undoStack()->canUndo())
      m.undoStack()->undo();
    QCOMPARE(dump(reopen(path)->property()), before); // every field as it was
    QCOMPARE(written.count(), 9 + 9);
    while (m.undoStack()->canRedo())
      m.undoStack()->redo();
    QCOMPARE(dump(reopen(path)->property()), edited);
  }

  void refusedEditsWriteNothing() {
    cbtest::TempDir dir;
    const auto path = dir / "h.curvebench";
    fillStore(path);
    cbui::PropertyEditModel m;
    QVERIFY(m.setStorePath(path).isEmpty());
    const QString before = dump(reopen(path)->property());
    QSignalSpy written(&m, &cbui::PropertyEditModel::storeWritten);
    QSignalSpy refused(&m, &cbui::PropertyEditModel::refused);

    QCOMPARE(m.setCapacity(-5), QStringLiteral("Capacity cannot be negative"));
    QVERIFY(!m.setCapacity(0).isEmpty());
    QCOMPARE(m.setSeasonBands(0.80, 0.60),
             QStringLiteral("Peak starts at 60.0 %, below shoulder at 80.0 %: peak must start "
                            "at or above shoulder"));
    QVERIFY(!m.setCurrency(QStringLiteral("EURO")).isEmpty());
    QVERIFY(!m.setName(QStringLiteral("  ")).isEmpty());
    QVERIFY(!m.setSelloutMargin(-0.01).isEmpty());
    QVERIFY(!m.setWalkCost(-1).isEmpty());
    QVERIFY(!m.setLateCancelDays(400).isEmpty());
    QVERIFY(!m.setTentativeProbability(1.2).isEmpty());
    QVERIFY(!m.addCapacityChange(QDate(2026, 1, 10), 900, QStringLiteral("same day")).isEmpty());
    QVERIFY(!m.addCapacityChange(QDate(2026, 5, 1), -3, {}).isEmpty());
    QVERIFY(!m.addRoomType(QStringLiteral("DBL"), QStringLiteral("again"), 3).isEmpty());
    QVERIFY(!m.addRoomType(QStringLiteral("two words"), {}, 3).isEmpty());
    QVERIFY(!m.addSegment(QStringLiteral("GRP"), QStringLiteral("Groups"), 3,
                          QStringLiteral("#FF0000")) // not in the colour-blind-safe palette
                 .isEmpty());
    QVERIFY(!m.addEvent(QDate(2026, 3, 5), QDate(2026, 3, 4), QStringLiteral("Fair")).isEmpty());
    QVERIFY(!m.addEvent(QDate(2026, 3, 5), QDate(2026, 3, 6), QStringLiteral(" ")).isEmpty());
    // Refused by the store itself: the segment, room type and channel are used by R1.
    QCOMPARE(m.removeSegment(QStringLiteral("CORP")),
             QStringLiteral("segment CORP is still used (1 reservation); it cannot be deleted"));
    QVERIFY(m.removeRoomType(QStringLiteral("DBL")).contains(QStringLiteral("still used")));
    QVERIFY(m.removeChannel(QStringLiteral("WEB")).contains(QStringLiteral("still used")));

    QCOMPARE(refused.count(), 19);
    QCOMPARE(refused.at(0).at(0).toInt(), int(cbui::PropertyEditModel::General));
    QCOMPARE(refused.at(2).at(0).toInt(), int(cbui::PropertyEditModel::Seasons));
    QCOMPARE(written.count(), 0);
    QCOMPARE(m.undoStack()->count(), 0);
    auto store = reopen(path);
    QCOMPARE(dump(store->property()), before);
    QCOMPARE(store->roomTypes().size(), std::size_t(2));
    QCOMPARE(store->segments().size(), std::size_t(2));
    QCOMPARE(store->channels().size(), std::size_t(1));
    QVERIFY(store->events().empty());
  }

  void capacityChangesAddEditRemove() {
    cbtest::TempDir dir;
    const auto path = dir / "h.curvebench";
    fillStore(path);
    cbui::PropertyEditModel m;
    QVERIFY(m.setStorePath(path).isEmpty());
    QCOMPARE(m.addCapacityChange(QDate(2025, 11, 1), 1000, QStringLiteral("west wing")), QString());
    // Kept in date order: the new, earlier change comes first.
    auto changes = reopen(path)->property().capacityChanges;
    QCOMPARE(changes.size(), std::size_t(2));
    QCOMPARE(changes[0].from.toIso(), std::string("2025-11-01"));
    QCOMPARE(changes[0].rooms, 1000);
    QCOMPARE(changes[1].rooms, 1100);
    QCOMPARE(reopen(path)->property().capacityOn(d("2025-12-01")), 1000);

    cbui::PropertyTableModel table(cbui::PropertyTableModel::CapacityChanges, &m);
    QCOMPARE(table.rowCount(), 2);
    QCOMPARE(table.data(table.index(0, 0)).toString(), QStringLiteral("Sat 1 Nov 2025"));
    QCOMPARE(table.data(table.index(1, 1)).toString(), QStringLiteral("1,100"));
    QCOMPARE(table.data(table.index(1, 2)).toString(), QStringLiteral("east wing works"));
    QVERIFY(table.setData(table.index(1, 1), 1050));
    QCOMPARE(reopen(path)->property().capacityChanges[1].rooms, 1050);
    QVERIFY(!table.setData(table.index(1, 1), -1)); // refused, nothing written
    QCOMPARE(reopen(path)->property().capacityChanges[1].rooms, 1050);
    QCOMPARE(m.removeCapacityChange(0), QString());
    QCOMPARE(reopen(path)->property().capacityChanges.size(), std::size_t(1));
    QCOMPARE(m.undoStack()->count(), 3);
    m.undoStack()->undo(); // the removed change is back
    m.undoStack()->undo(); // 1,100 again
    changes = reopen(path)->property().capacityChanges;
    QCOMPARE(changes.size(), std::size_t(2));
    QCOMPARE(changes[1].rooms, 1100);
    QCOMPARE(changes[1].reason, std::string("east wing works"));
    m.undoStack()->undo();
    QCOMPARE(dump(reopen(path)->property()), dump(startProperty()));
  }

  void referenceListsAddEditRemoveUndo() {
    cbtest::TempDir dir;
    const auto path = dir / "h.curvebench";
    fillStore(path);
    cbui::PropertyEditModel m;
    QVERIFY(m.setStorePath(path).isEmpty());

    QCOMPARE(m.addRoomType(QStringLiteral("ste"), QStringLiteral("Suite"), 12), QString());
    QCOMPARE(
        m.addSegment(QStringLiteral("GRP"), QStringLiteral("Groups"), 3, QStringLiteral("#009e73")),
        QString());
    QCOMPARE(m.addChannel(QStringLiteral("GDS"), QStringLiteral("Travel agents")), QString());
    auto store = reopen(path);
    QCOMPARE(store->roomTypes().back(), (cb::RoomType{"STE", "Suite", 12})); // code upper case
    QCOMPARE(store->segments().at(1), (cb::Segment{"GRP", "Groups", 3, "#009E73"}));
    QCOMPARE(store->channels().front(), (cb::Channel{"GDS", "Travel agents"}));

    cbui::PropertyTableModel segments(cbui::PropertyTableModel::Segments, &m);
    QCOMPARE(segments.rowCount(), 3);
    QCOMPARE(segments.code(1), QStringLiteral("GRP"));
    QCOMPARE(segments.data(segments.index(1, 3)).toString(), QStringLiteral("Bluish green"));
    QCOMPARE(segments.data(segments.index(1, 3), Qt::DecorationRole).value<QColor>(),
             QColor(0x00, 0x9E, 0x73));
    QVERIFY(!(segments.flags(segments.index(1, 0)) & Qt::ItemIsEditable)); // codes stay
    QVERIFY(segments.setData(segments.index(1, 3), QStringLiteral("#CC79A7")));
    QVERIFY(segments.setData(segments.index(1, 2), 4));
    QVERIFY(!segments.setData(segments.index(1, 3), QStringLiteral("#123456")));
    QCOMPARE(reopen(path)->segments().at(1), (cb::Segment{"GRP", "Groups", 4, "#CC79A7"}));

    cbui::PropertyTableModel rooms(cbui::PropertyTableModel::RoomTypes, &m);
    QVERIFY(rooms.setData(rooms.index(0, 1), QStringLiteral("Double room")));
    QCOMPARE(reopen(path)->roomTypes().front(), (cb::RoomType{"DBL", "Double room", 800}));
    QCOMPARE(rooms.data(rooms.index(0, 2)).toString(), QStringLiteral("800"));

    // Remove the unused ones, then undo everything: the store's lists are as they were.
    QCOMPARE(m.removeSegment(QStringLiteral("GRP")), QString());
    QCOMPARE(m.removeRoomType(QStringLiteral("STE")), QString());
    QCOMPARE(m.removeChannel(QStringLiteral("GDS")), QString());
    QCOMPARE(reopen(path)->segments().size(), std::size_t(2));
    m.undoStack()->undo();
    m.undoStack()->undo();
    m.undoStack()->undo();
    store = reopen(path);
    QCOMPARE(store->segments().at(1), (cb::Segment{"GRP", "Groups", 4, "#CC79A7"}));
    QCOMPARE(store->roomTypes().back(), (cb::RoomType{"STE", "Suite", 12}));
    while (m.undoStack()->canUndo())
      m.undoStack()->undo();
    store = reopen(path);
    QCOMPARE(store->roomTypes(),
             (std::vector<cb::RoomType>{{"DBL", "Double", 800}, {"SGL", "Single", 400}}));
    QCOMPARE(store->segments(), (std::vector<cb::Segment>{{"CORP", "Corporate", 1, "#0072B2"},
                                                          {"LEIS", "Leisure", 2, "#E69F00"}}));
    QCOMPARE(store->channels(), (std::vector<cb::Channel>{{"WEB", "Own website"}}));
    m.undoStack()->redo(); // STE again
    QCOMPARE(reopen(path)->roomTypes().back(), (cb::RoomType{"STE", "Suite", 12}));
  }

  // Rule of core/holidaymap.h: "Boat Fair" 2025-03-12…15 and 2026-03-18…21 pair night k with
  // night k; without the pair 2026-03-18 would compare with 2025-03-19 (364 days earlier).
  void eventsAndHolidayMap() {
    cbtest::TempDir dir;
    const auto path = dir / "h.curvebench";
    fillStore(path);
    cbui::PropertyEditModel m;
    QVERIFY(m.setStorePath(path).isEmpty());
    QCOMPARE(m.addEvent(QDate(2025, 3, 12), QDate(2025, 3, 15), QStringLiteral("Boat Fair")),
             QString());
    QCOMPARE(m.addEvent(QDate(2026, 3, 18), QDate(2026, 3, 20), QStringLiteral("boat fair ")),
             QString());
    QCOMPARE(m.addEvent(QDate(2026, 3, 18), QDate(2026, 3, 18), QStringLiteral("Gala")), QString());
    cbui::PropertyTableModel pairs(cbui::PropertyTableModel::HolidayPairs, &m);
    QCOMPARE(pairs.rowCount(), 3);
    QCOMPARE(pairs.data(pairs.index(0, 0)).toString(), QStringLiteral("Wed 18 Mar 2026"));
    QCOMPARE(pairs.data(pairs.index(0, 1)).toString(), QStringLiteral("Wed 12 Mar 2025"));
    QCOMPARE(pairs.data(pairs.index(0, 2)).toString(), QStringLiteral("boat fair"));
    QCOMPARE(pairs.data(pairs.index(0, 3)).toString(), QStringLiteral("Wed 19 Mar 2025"));
    QCOMPARE(pairs.data(pairs.index(2, 1)).toString(), QStringLiteral("Fri 14 Mar 2025"));

    cbui::PropertyTableModel events(cbui::PropertyTableModel::Events, &m);
    QCOMPARE(events.rowCount(), 3);
    QCOMPARE(events.data(events.index(0, 3)).toInt(), 4); // nights of the 2025 fair
    // This year's fair one night longer: its 4th night pairs with last year's 4th.
    QVERIFY(events.setData(events.index(1, 1), QDate(2026, 3, 21)));
    QCOMPARE(pairs.rowCount(), 4);
    QCOMPARE(pairs.data(pairs.index(3, 1)).toString(), QStringLiteral("Sat 15 Mar 2025"));

    const auto stored = reopen(path)->storedEvents();
    QCOMPARE(m.removeEvent(1), QString()); // this year's fair
    QCOMPARE(pairs.rowCount(), 0);
    QCOMPARE(reopen(path)->events().size(), std::size_t(2));
    m.undoStack()->undo(); // back under its id, before "Gala" of the same first day
    QVERIFY(reopen(path)->storedEvents() == stored);
    QCOMPARE(pairs.rowCount(), 4);
    m.undoStack()->undo(); // the edit: three nights again
    QCOMPARE(reopen(path)->events().at(1).to.toIso(), std::string("2026-03-20"));
    m.undoStack()->undo();
    m.undoStack()->undo();
    m.undoStack()->undo();
    QVERIFY(reopen(path)->events().empty());
    m.undoStack()->redo(); // the 2025 fair, under the id it had
    QCOMPARE(reopen(path)->storedEvents().front().id, stored.front().id);
  }

  // The window: a capacity edit reloads the session (its capacity moves), Ctrl+Z's action acts
  // only while the Property screen is shown.
  void windowReloadsAfterAnEditAndUndoFollowsTheScreen() {
    cbtest::TempDir dir;
    const auto path = dir / "h.curvebench";
    fillStore(path);
    cbui::MainWindow w;
    w.show();
    QSignalSpy loaded(&w, &cbui::MainWindow::sessionLoaded);
    w.openStore(path);
    QVERIFY(loaded.wait(cbtest::kBackgroundWaitMs));
    w.showScreen(cbui::MainWindow::HorizonScreen);
    auto *editor = w.propertyEditor();
    QCOMPARE(editor->model()->property().capacity, 1200);
    QCOMPARE(editor->model()->setCapacity(1300), QString());
    QVERIFY(loaded.wait(cbtest::kBackgroundWaitMs));
    QCOMPARE(w.session()->property().capacity, 1300);
    QVERIFY(!editor->undoAction()->isEnabled()); // another screen is shown
    editor->undoAction()->trigger();
    QCOMPARE(reopen(path)->property().capacity, 1300);
    w.showScreen(cbui::MainWindow::PropertyScreen);
    QVERIFY(editor->undoAction()->isEnabled());
    QCOMPARE(editor->undoAction()->text(), QStringLiteral("&Undo capacity 1,300 rooms"));
    editor->undoAction()->trigger();
    QCOMPARE(reopen(path)->property().capacity, 1200);
    QVERIFY(loaded.wait(cbtest::kBackgroundWaitMs));
    QCOMPARE(w.session()->property().capacity, 1200);
    // A refusal shows on its page; nothing written.
    QVERIFY(!editor->model()->setSeasonBands(0.9, 0.5).isEmpty());
    QVERIFY(editor->message(cbui::PropertyEditModel::Seasons).contains(QStringLiteral("below")));
    QCOMPARE(reopen(path)->property().settings.seasons.peakFrom, 0.85);

    // As a user: rename a segment in its table (the view's editor), then Ctrl+Z in the window.
    editor->showSection(cbui::PropertyEditModel::Segments);
    QTableView *view = nullptr;
    for (auto *v : editor->findChildren<QTableView *>())
      if (v->isVisible())
        view = v;
    QVERIFY(view);
    QVERIFY(QTest::qWaitForWindowActive(&w));
    const QModelIndex name = view->model()->index(0, 1);
    QCOMPARE(name.data().toString(), QStringLiteral("Corporate"));
    view->setFocus();
    view->setCurrentIndex(name);
    view->edit(name);
    auto *line = qobject_cast<QLineEdit *>(QApplication::focusWidget());
    QVERIFY(line);
    line->selectAll();
    QTest::keyClicks(line, QStringLiteral("Corporate accounts"));
    QTest::keyClick(line, Qt::Key_Return);
    // The delegate commits on Return through a queued call.
    QTRY_COMPARE(reopen(path)->segments().front().name, std::string("Corporate accounts"));
    QCOMPARE(view->model()->index(0, 1).data().toString(), QStringLiteral("Corporate accounts"));
    QTest::keySequence(&w, QKeySequence::Undo);
    QCOMPARE(reopen(path)->segments().front().name, std::string("Corporate"));
    QTest::keySequence(&w, QKeySequence(Qt::CTRL | Qt::SHIFT | Qt::Key_Z));
    QCOMPARE(reopen(path)->segments().front().name, std::string("Corporate accounts"));
    QVERIFY(loaded.wait(cbtest::kBackgroundWaitMs)); // the reload after the edits
  }
};

QTEST_MAIN(PropertyEditorTest)
#include "test_propertyeditor.moc"
