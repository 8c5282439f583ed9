// The one-page morning brief (PDF): reading date and property, the next 14 nights' table and
// chart from the Horizon (computeHorizon), the notable pickups, likely sell-outs and pace alerts
// of the next 90 nights, and the advisory caution. Made from the GUI (File menu) and the command
// line (`curvebench brief`); painting needs a QApplication (the chart is a widget), not a display.
#pragma once

#include <QDate>
#include <QString>

#include <cstddef>
#include <vector>

class QWidget;

namespace cbui {

class WorkbenchSession;
struct HorizonData;

/// Nights in the brief's table and chart, and nights its lists look through.
constexpr int kBriefNights = 14;
constexpr int kBriefLookahead = 90; // as the Horizon's default, so both show the same figures

/// Rows (indices into HorizonData::rows) the brief lists beside its table, at most `maxItems`
/// each: the largest positive pickups over 1 and 7 days (largest first, earlier night on a tie),
/// nights flagged "full" or "sell-out likely" and nights flagged "pace up" / "pace down" (in
/// night order).
struct BriefHighlights {
  std::vector<std::size_t> pickup1, pickup7, sellouts, paceAlerts;
};
BriefHighlights briefHighlights(const HorizonData &data, std::size_t maxItems = 5);

/// Computes the horizon as of `asOf` (the session's reading date when invalid; the session's own
/// reading date is restored afterwards) and writes the brief to `file` as a one-page A4
/// landscape PDF. False, with the reason in `error`, when the date is outside the data, core
/// throws, or the file cannot be written.
bool renderMorningBrief(WorkbenchSession &session, const QDate &asOf, const QString &file,
                        QString *error = nullptr);

/// The File menu's "Morning brief (PDF)…": asks where to save (suggested
/// morning-brief-DATE.pdf) and writes the brief of the session's reading date, with a wait cursor.
/// Returns the status line ("Saved …" / "Not saved: …"), empty when the user cancelled.
QString saveMorningBriefAs(QWidget *parent, WorkbenchSession &session);

/// Paints the brief of `data` (already computed: at least the lookahead's nights) into the PDF.
bool writeMorningBriefPdf(const HorizonData &data, const QString &propertyName, int capacity,
                          const QString &file, QString *error = nullptr);

} // namespace cbui
