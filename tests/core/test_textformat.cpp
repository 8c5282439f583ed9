#include "core/textformat.h"

#include <gtest/gtest.h>

TEST(TextFormat, GroupsThousands) {
  EXPECT_EQ(cb::formatCount(0), "0");
  EXPECT_EQ(cb::formatCount(999), "999");
  EXPECT_EQ(cb::formatCount(79330), "79,330");
  EXPECT_EQ(cb::formatCount(1000000), "1,000,000");
  EXPECT_EQ(cb::formatCount(-1234), "-1,234");
}

TEST(TextFormat, Money) {
  EXPECT_EQ(cb::formatMoney(20166.88, "EUR"), "EUR 20,166.88");
  EXPECT_EQ(cb::formatMoney(-5.5, ""), "-5.50");
  EXPECT_EQ(cb::formatMoney(0.004, "USD"), "USD 0.00");
  EXPECT_EQ(cb::formatMoney(1234567.899, "GBP"), "GBP 1,234,567.90");
}

TEST(TextFormat, Percent) {
  // 33,102 of 79,330 bookings cancelled: 41.7 % (Antonio et al. 2019, Table 1).
  EXPECT_EQ(cb::formatPercent(33102.0 / 79330.0), "41.7 %");
}
