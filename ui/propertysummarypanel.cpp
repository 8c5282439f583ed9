#include "ui/propertysummarypanel.h"

#include "core/textformat.h"
#include "ui/workbenchsession.h"

#include <QLabel>
#include <QVBoxLayout>

namespace cbui {
namespace {

QString q(const std::string &s) { return QString::fromStdString(s); }

} // namespace

PropertySummaryPanel::PropertySummaryPanel(QWidget *parent)
    : QWidget(parent), label_(new QLabel(this)) {
  auto *layout = new QVBoxLayout(this);
  layout->addWidget(label_);
  layout->addStretch();
  label_->setTextFormat(Qt::RichText);
  label_->setTextInteractionFlags(Qt::TextSelectableByMouse);
  label_->setWordWrap(true);
}

void PropertySummaryPanel::showSession(const WorkbenchSession &session) {
  const auto &p = session.property();
  const auto &s = session.summary();
  auto count = [&](const std::string &status) {
    auto it = s.byStatus.find(status);
    return q(cb::formatCount(it == s.byStatus.end() ? 0 : it->second));
  };
  QString html;
  html += QStringLiteral("<h2>%1</h2>").arg(q(p.name).toHtmlEscaped());
  html += QStringLiteral("<table cellspacing=4>");
  auto row = [&](const QString &k, const QString &v) {
    html += QStringLiteral("<tr><td><b>%1</b></td><td align=right>%2</td></tr>").arg(k, v);
  };
  row(QStringLiteral("Capacity"), q(cb::formatCount(p.capacity)) + QStringLiteral(" rooms"));
  row(QStringLiteral("Currency"), q(p.currency));
  row(QStringLiteral("Data as of"), q(session.readingDate().toIso()));
  row(QStringLiteral("Reservations"), q(cb::formatCount(s.reservations)));
  row(QStringLiteral("· checked out"), count("checked-out"));
  row(QStringLiteral("· on the books"), count("booked"));
  row(QStringLiteral("· cancelled"), count("cancelled"));
  row(QStringLiteral("· no-shows"), count("no-show"));
  row(QStringLiteral("Arrivals from"),
      s.firstArrival ? q(s.firstArrival->toIso()) : QStringLiteral("–"));
  row(QStringLiteral("Arrivals to"),
      s.lastArrival ? q(s.lastArrival->toIso()) : QStringLiteral("–"));
  row(QStringLiteral("Segments"), QString::number(session.segments().size()));
  row(QStringLiteral("Group blocks"), q(cb::formatCount(s.blocks)));
  row(QStringLiteral("Denials / regrets"), q(cb::formatCount(s.denials)));
  html += QStringLiteral("</table>");
  label_->setText(html);
}

QString PropertySummaryPanel::text() const { return label_->text(); }

} // namespace cbui
