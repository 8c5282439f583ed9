// Season classes: demand over capacity against the property's bands (brief section 6). The
// default bands (70 % and 90 %) are common practice, no source; the tests check the edges.
#include "core/seasons.h"

#include <gtest/gtest.h>

#include <stdexcept>

TEST(Seasons, EdgesBelongToTheHigherClass) {
  const cb::SeasonBands bands;                                                 // 0.70 / 0.90
  EXPECT_EQ(cb::classifySeason(104.9, 150, bands), cb::SeasonClass::Low);      // 69.9 %
  EXPECT_EQ(cb::classifySeason(105, 150, bands), cb::SeasonClass::Shoulder);   // 70 %
  EXPECT_EQ(cb::classifySeason(134.9, 150, bands), cb::SeasonClass::Shoulder); // 89.9 %
  EXPECT_EQ(cb::classifySeason(135, 150, bands), cb::SeasonClass::Peak);       // 90 %
  EXPECT_EQ(cb::classifySeason(180, 150, bands), cb::SeasonClass::Peak); // demand above capacity
}

TEST(Seasons, UserBandsNamesAndGuards) {
  const cb::SeasonBands bands{0.5, 0.8};
  EXPECT_EQ(cb::classifySeason(60, 100, bands), cb::SeasonClass::Shoulder);
  EXPECT_EQ(cb::classifySeason(80, 100, bands), cb::SeasonClass::Peak);
  EXPECT_EQ(cb::classifySeason(50, 0, bands), cb::SeasonClass::Low); // no rooms: never NaN
  EXPECT_EQ(cb::seasonName(cb::SeasonClass::Shoulder), "shoulder");
  EXPECT_EQ(cb::parseSeason("peak"), cb::SeasonClass::Peak);
  EXPECT_FALSE(cb::parseSeason("high"));
  EXPECT_THROW(cb::classifySeason(1, 1, cb::SeasonBands{0.9, 0.7}), std::invalid_argument);
}
