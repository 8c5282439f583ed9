// The README's examples must stay true: its mapping-profile example parses and maps a row.
#include "core/mappingprofile.h"

#include "testsupport.h"

#include <sstream>

namespace {

std::string readmeJsonBlock() {
  std::string readme = cbtest::readFile(cbtest::sourceDir() / "README.md");
  auto start = readme.find("```json\n");
  if (start == std::string::npos)
    return {};
  start += 8;
  auto end = readme.find("```", start);
  return readme.substr(start, end - start);
}

} // namespace

TEST(ReadmeExamples, MappingProfileExampleWorks) {
  std::string json = readmeJsonBlock();
  ASSERT_FALSE(json.empty()) << "README.md has no ```json block";
  cb::Findings findings;
  auto profile = cb::MappingProfile::parse(json, "README.md", findings);
  ASSERT_TRUE(profile) << (findings.empty() ? "" : findings.front().toString());
  EXPECT_TRUE(findings.empty());
  EXPECT_EQ(profile->delimiter(), ';');

  std::istringstream in("ResNo;State;Created;Changed;Arr;Nights;Market;Source;AvgRate\n"
                        "9001;X;03/01/2026;20/01/2026;14/02/2026;2;CORP;WEB;129.5\n");
  cb::CsvReader::Options opt;
  opt.delimiter = ';';
  cb::CsvReader reader(in, "pms.csv", opt);
  cb::CsvRecord header, row;
  ASSERT_TRUE(reader.next(header));
  ASSERT_TRUE(profile->bind(header, "pms.csv", findings));
  ASSERT_TRUE(reader.next(row));
  cb::Reservation r;
  auto problems = profile->map(row, r);
  ASSERT_TRUE(problems.empty()) << problems.front().message;
  EXPECT_EQ(r.id, "9001");
  EXPECT_EQ(r.status, cb::ReservationStatus::Cancelled);
  EXPECT_EQ(r.bookedOn.toIso(), "2026-01-03");
  ASSERT_TRUE(r.cancelledOn);
  EXPECT_EQ(r.cancelledOn->toIso(), "2026-01-20");
  EXPECT_EQ(r.arrival.toIso(), "2026-02-14");
  EXPECT_EQ(r.departure.toIso(), "2026-02-16");
  EXPECT_EQ(r.rooms, 1);
  EXPECT_EQ(r.segment, "CORP");
  EXPECT_EQ(r.channel, "WEB");
  EXPECT_DOUBLE_EQ(r.rate, 129.5);
  EXPECT_EQ(cb::validateReservation(r), "");
}
