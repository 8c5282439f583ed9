#include "core/protection.h"

#include "core/demandmath.h"

#include <algorithm>
#include <cmath>
#include <numeric>
#include <stdexcept>

namespace cb {
namespace {

void requireFares(double pHi, double pLo, const char *what) {
  if (!std::isfinite(pHi) || !std::isfinite(pLo) || !(pLo > 0) || !(pLo < pHi))
    throw std::invalid_argument(std::string(what) + ": requires 0 < pLo < pHi");
}

/// The checks both EMSR variants share: at least one class, finite figures, rate > 0, mean and
/// sd ≥ 0, rates strictly falling.
void requireSortedClasses(const std::vector<ClassDemand> &sorted, const char *what) {
  for (std::size_t k = 0; k < sorted.size(); ++k) {
    const ClassDemand &c = sorted[k];
    if (!std::isfinite(c.rate) || !std::isfinite(c.mean) || !std::isfinite(c.sd))
      throw std::invalid_argument(std::string(what) + ": class " + c.code +
                                  " has a non-finite figure");
    if (!(c.rate > 0))
      throw std::invalid_argument(std::string(what) + ": class " + c.code + " has rate <= 0");
    if (c.mean < 0 || c.sd < 0)
      throw std::invalid_argument(std::string(what) + ": class " + c.code +
                                  " has a negative mean or sd");
    if (k > 0 && !(c.rate < sorted[k - 1].rate))
      throw std::invalid_argument(std::string(what) + ": class " + c.code +
                                  " is not priced below the class before it (sort by rate and "
                                  "merge equal rates first)");
  }
}

/// Half up: 2.5 → 3, 62.652934 → 63. Clamped first so the int conversion is always defined.
int roundHalfUp(double y) { return static_cast<int>(std::floor(std::clamp(y, -1e9, 1e9) + 0.5)); }

} // namespace

double littlewoodNormal(double pHi, double pLo, double mu, double sigma) {
  requireFares(pHi, pLo, "littlewoodNormal");
  if (!std::isfinite(mu) || !std::isfinite(sigma) || sigma < 0)
    throw std::invalid_argument("littlewoodNormal: requires finite mu and sigma >= 0");
  if (sigma == 0)
    return mu; // demand is exactly mu: every quantile is mu
  return mu + sigma * normalQuantile(1.0 - pLo / pHi);
}

int littlewoodPoisson(double pHi, double pLo, double mean) {
  requireFares(pHi, pLo, "littlewoodPoisson");
  return poissonQuantile((pHi - pLo) / pHi, mean);
}

std::vector<double> emsrbProtection(const std::vector<ClassDemand> &sorted) {
  requireSortedClasses(sorted, "emsrbProtection");
  std::vector<double> y;
  double sumMean = 0, sumVar = 0, sumRevenue = 0, sumRate = 0;
  for (std::size_t j = 0; j + 1 < sorted.size(); ++j) {
    sumMean += sorted[j].mean;
    sumVar += sorted[j].sd * sorted[j].sd;
    sumRevenue += sorted[j].rate * sorted[j].mean;
    sumRate += sorted[j].rate;
    const double sigma = std::sqrt(sumVar);
    if (sigma == 0) { // the aggregated demand above is certain: protect exactly it
      y.push_back(sumMean);
      continue;
    }
    // The weighted average rate is undefined when classes 1…j expect no demand at all (mean 0,
    // sd > 0); the plain average of their rates is then used: still above p_{j+1}, so the
    // quantile stays finite. Our choice, no source.
    const double pbar = sumMean > 0 ? sumRevenue / sumMean : sumRate / static_cast<double>(j + 1);
    y.push_back(sumMean + sigma * normalQuantile(1.0 - sorted[j + 1].rate / pbar));
  }
  return y;
}

std::vector<double> emsraProtection(const std::vector<ClassDemand> &sorted) {
  requireSortedClasses(sorted, "emsraProtection");
  std::vector<double> y;
  for (std::size_t j = 0; j + 1 < sorted.size(); ++j) {
    double level = 0;
    for (std::size_t k = 0; k <= j; ++k) {
      const ClassDemand &c = sorted[k];
      level +=
          c.sd == 0 ? c.mean : c.mean + c.sd * normalQuantile(1.0 - sorted[j + 1].rate / c.rate);
    }
    y.push_back(level);
  }
  return y;
}

ProtectionResult protect(const ProtectionInput &input) {
  if (input.capacity < 0 || input.sold < 0)
    throw std::invalid_argument("protect: capacity and rooms sold must be >= 0");
  if (input.classes.empty())
    throw std::invalid_argument("protect: no classes");
  for (const ClassDemand &c : input.classes) {
    if (!std::isfinite(c.rate) || !std::isfinite(c.mean) || !std::isfinite(c.sd))
      throw std::invalid_argument("protect: class " + c.code + " has a non-finite figure");
    if (!(c.rate > 0))
      throw std::invalid_argument("protect: class " + c.code + " has rate <= 0");
    if (c.sd < 0)
      throw std::invalid_argument("protect: class " + c.code + " has sd < 0");
  }

  // Rank by rate, highest first; equal rates keep the order given (stable sort).
  std::vector<std::size_t> order(input.classes.size());
  std::iota(order.begin(), order.end(), std::size_t{0});
  std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) {
    return input.classes[a].rate > input.classes[b].rate;
  });

  // Classes with equal rates are one fare to the hotel: merge them (means add, variances add,
  // independent normal demand) and compute the levels between the distinct rates only. Demand
  // to come below 0 (a forecast under what is already on the books) is no demand.
  std::vector<ClassDemand> groups;
  std::vector<std::size_t> groupOf(order.size());
  for (std::size_t i = 0; i < order.size(); ++i) {
    const ClassDemand &c = input.classes[order[i]];
    const double mean = std::max(c.mean, 0.0);
    if (groups.empty() || c.rate < groups.back().rate) {
      groups.push_back(ClassDemand{c.code, c.rate, mean, c.sd});
    } else {
      ClassDemand &g = groups.back();
      g.mean += mean;
      g.sd = std::sqrt(g.sd * g.sd + c.sd * c.sd);
    }
    groupOf[i] = groups.size() - 1;
  }
  const std::vector<double> groupLevels =
      input.method == ProtectionMethod::EmsrB ? emsrbProtection(groups) : emsraProtection(groups);

  ProtectionResult result;
  result.remaining = std::max(0, input.capacity - input.sold);
  int protectedAbove = 0; // rooms protected for the classes ranked above the current one
  for (std::size_t i = 0; i < order.size(); ++i) {
    ProtectionLine line;
    line.demand = input.classes[order[i]];
    line.rank = static_cast<int>(i) + 1;
    line.bookingLimit = std::max(0, result.remaining - protectedAbove);
    line.open = line.bookingLimit > 0;
    if (i + 1 < order.size()) {
      const std::size_t g = groupOf[i];
      // Against an equal-rate class below there is nothing to protect: the level stays the one
      // protecting the classes above this rate (0 for the top rate), so tied classes share one
      // booking limit.
      const bool tiedWithNext = groupOf[i + 1] == g;
      const double level = tiedWithNext ? (g == 0 ? 0.0 : groupLevels[g - 1]) : groupLevels[g];
      line.protectionLevel = level;
      // Nested limits never grow down the ranking: a level below the one above it (possible
      // with odd inputs) or below 0 protects what the class above already protects.
      protectedAbove = std::max(protectedAbove, roundHalfUp(level));
      line.protectedRooms = protectedAbove;
    }
    result.lines.push_back(std::move(line));
  }
  return result;
}

} // namespace cb
