#include "core/forecastmethod.h"

#include <algorithm>

namespace cb {

ForecastContext::ForecastContext(const CurveCube &cube, std::size_t series, Date asOf,
                                 const Property &property)
    : cube_(cube), series_(series), asOf_(asOf), property_(property) {
  if (asOf > cube.asOf())
    throw AsOfError("forecast reading date " + asOf.toIso() + " is after the cube's reading date " +
                    cube.asOf().toIso());
  if (series >= cube.series().size())
    throw std::out_of_range("forecast series index out of range");
}

std::optional<int> ForecastContext::otbNow(Date night) const {
  int h = night - asOf_;
  if (h < 0)
    return observedFinal(night);
  return otb(night, h);
}

std::optional<int> ForecastContext::observedFinal(Date night) const {
  if (night > asOf_ || night < cube_.firstNight() || night > cube_.lastNight())
    return std::nullopt;
  return cube_.final(series_, night);
}

std::optional<double> ForecastContext::final(Date night) const {
  const std::optional<int> observed = observedFinal(night);
  if (!observed)
    return std::nullopt;
  if (history_) {
    const auto i = static_cast<std::size_t>(night - cube_.firstNight());
    if (i < history_->size())
      return (*history_)[i];
  }
  return static_cast<double>(*observed);
}

void ForecastContext::useHistory(const std::vector<double> *demand) {
  history_ = demand;
  finalsReady_ = false;
}

const std::vector<double> &ForecastContext::finals() const {
  if (!finalsReady_) {
    finals_.clear();
    Date last = std::min(asOf_, cube_.lastNight());
    for (Date s = cube_.firstNight(); s <= last; ++s)
      finals_.push_back(final(s).value_or(0.0));
    finalsReady_ = true;
  }
  return finals_;
}

} // namespace cb
