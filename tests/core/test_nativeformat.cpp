#include "core/nativeformat.h"

#include "core/csvreader.h"
#include "core/mappingprofile.h"

#include <gtest/gtest.h>

#include <limits>
#include <locale>
#include <sstream>
#include <stdexcept>

using cb::Date;
using cb::Reservation;
using cb::ReservationStatus;

namespace {

std::vector<Reservation> sample() {
  Reservation a;
  a.id = "R-1";
  a.status = ReservationStatus::Cancelled;
  a.bookedOn = Date::fromYmd(2026, 1, 2);
  a.cancelledOn = Date::fromYmd(2026, 1, 9);
  a.arrival = Date::fromYmd(2026, 3, 1);
  a.departure = Date::fromYmd(2026, 3, 4);
  a.rooms = 1500;
  a.roomType = "DBL";
  a.segment = "Group, \"Blue\" tour";
  a.channel = "Agency\nnorth";
  a.rate = 76.5;
  a.currency = "EUR";
  a.blockId = "G7";
  Reservation b;
  b.id = "R-2";
  b.status = ReservationStatus::CheckedOut;
  b.bookedOn = Date::fromYmd(2025, 12, 31);
  b.arrival = Date::fromYmd(2026, 1, 1);
  b.departure = Date::fromYmd(2026, 1, 1);
  b.segment = "Leisure";
  b.rate = 1.0 / 3.0;
  return {a, b};
}

/// A locale that groups thousands, to prove the writer does not depend on the stream's locale.
struct Grouping : std::numpunct<char> {
  char do_thousands_sep() const override { return ','; }
  std::string do_grouping() const override { return "\3"; }
  char do_decimal_point() const override { return ','; }
};

} // namespace

TEST(NativeFormat, ColumnsAndRequiredOnes) {
  EXPECT_EQ(cb::kNativeColumns.front(), "reservation_id");
  EXPECT_EQ(cb::kNativeColumns.back(), "block_id");
  int required = 0;
  for (auto c : cb::kNativeColumns)
    required += cb::isRequiredNativeColumn(c) ? 1 : 0;
  EXPECT_EQ(required, 9);
  EXPECT_FALSE(cb::isRequiredNativeColumn("channel"));
  EXPECT_TRUE(cb::isRequiredNativeColumn("cancelled_on"));
  EXPECT_FALSE(cb::isRequiredNativeColumn("guest"));
  EXPECT_TRUE(cb::isNativeColumn("currency"));
}

TEST(NativeFormat, RatesAreShortestRoundTripDecimals) {
  EXPECT_EQ(cb::formatRate(76.5), "76.5");
  EXPECT_EQ(cb::formatRate(100.0), "100");
  EXPECT_EQ(cb::formatRate(0.1), "0.1");
  EXPECT_EQ(cb::formatRate(-0.0), "0");
  EXPECT_EQ(cb::formatRate(1e-7), "0.0000001");
  EXPECT_EQ(cb::formatRate(123456789.125), "123456789.125");
  EXPECT_EQ(cb::formatRate(1.0 / 3.0), "0.3333333333333333");
  EXPECT_EQ(std::stod(cb::formatRate(1.0 / 3.0)), 1.0 / 3.0);
  EXPECT_THROW(cb::formatRate(std::numeric_limits<double>::quiet_NaN()), std::invalid_argument);
  EXPECT_THROW(cb::formatRate(std::numeric_limits<double>::infinity()), std::invalid_argument);
}

TEST(NativeFormat, QuotesOnlyWhereNeeded) {
  EXPECT_EQ(cb::quoteCsvField("plain text"), "plain text");
  EXPECT_EQ(cb::quoteCsvField("a,b"), "\"a,b\"");
  EXPECT_EQ(cb::quoteCsvField("say \"hi\""), "\"say \"\"hi\"\"\"");
  EXPECT_EQ(cb::quoteCsvField("two\nlines"), "\"two\nlines\"");
  EXPECT_EQ(cb::quoteCsvField("cr\r"), "\"cr\r\"");
  EXPECT_EQ(cb::quoteCsvField(""), "");
}

TEST(NativeFormat, WriterOutputIsExactAndLocaleIndependent) {
  std::ostringstream out;
  out.imbue(std::locale(std::locale::classic(), new Grouping));
  cb::writeNativeCsv(out, sample());
  EXPECT_EQ(out.str(),
            "reservation_id,status,booked_on,cancelled_on,arrival,departure,rooms,room_type,"
            "segment,channel,rate,currency,block_id\n"
            "R-1,cancelled,2026-01-02,2026-01-09,2026-03-01,2026-03-04,1500,DBL,\"Group, "
            "\"\"Blue\"\" tour\",\"Agency\nnorth\",76.5,EUR,G7\n"
            "R-2,checked-out,2025-12-31,,2026-01-01,2026-01-01,1,,Leisure,,0.3333333333333333,,\n");
}

TEST(NativeFormat, WrittenFileReadsBackToTheSameReservations) {
  std::ostringstream out;
  cb::writeNativeCsv(out, sample());
  std::istringstream in(out.str());
  cb::CsvReader reader(in, "round.csv");
  cb::Findings findings;
  auto profile = cb::MappingProfile::load("native", findings);
  ASSERT_TRUE(profile);
  cb::CsvRecord rec;
  ASSERT_TRUE(reader.next(rec));
  ASSERT_TRUE(profile->bind(rec, "round.csv", findings));
  EXPECT_TRUE(findings.empty());
  std::vector<Reservation> back;
  std::int64_t lastLine = 0;
  while (reader.next(rec)) {
    lastLine = rec.line;
    Reservation r;
    EXPECT_TRUE(profile->map(rec, r).empty());
    back.push_back(r);
  }
  EXPECT_FALSE(reader.fatal());
  EXPECT_EQ(back, sample());
  // the channel's embedded newline moved the second record to line 4
  EXPECT_EQ(lastLine, 4);
}
