#include "ui/datestudypanel.h"

#include "ui/datestudymodel.h"
#include "ui/workbenchsession.h"

#include <QLabel>
#include <QVBoxLayout>

#include <memory>

namespace cbui {

struct DateStudyPanel::Impl {
  WorkbenchSession *session = nullptr;
  std::unique_ptr<DateStudyModel> model;
  QLabel *title = nullptr;
};

DateStudyPanel::DateStudyPanel(QWidget *parent) : QWidget(parent), d_(new Impl) {
  auto *layout = new QVBoxLayout(this);
  d_->title = new QLabel(tr("No store open"));
  layout->addWidget(d_->title);
}

DateStudyPanel::~DateStudyPanel() { delete d_; }

void DateStudyPanel::setSession(WorkbenchSession *session) {
  d_->session = session;
  d_->model = session ? std::make_unique<DateStudyModel>(*session) : nullptr;
  if (session)
    setNight(session->defaultNight());
  else
    d_->title->setText(tr("No store open"));
}

void DateStudyPanel::setNight(cb::Date night) {
  if (!d_->model)
    return;
  d_->model->setNight(night);
  d_->title->setText(QString::fromStdString(night.toIso()));
}

} // namespace cbui
