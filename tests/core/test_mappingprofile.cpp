#include "core/mappingprofile.h"

#include "core/blockprofile.h"

#include "testsupport.h"

#include <gtest/gtest.h>

#include <sstream>

using cb::Date;
using cb::MappingProfile;
using cb::ReservationStatus;
using cbtest::hasFinding;

namespace {

std::vector<cb::CsvRecord> records(const std::string &text, char delimiter = ',') {
  std::istringstream in(text);
  cb::CsvReader::Options opt;
  opt.delimiter = delimiter;
  cb::CsvReader reader(in, "in.csv", opt);
  std::vector<cb::CsvRecord> out;
  cb::CsvRecord rec;
  while (reader.next(rec))
    out.push_back(rec);
  EXPECT_FALSE(reader.fatal()) << reader.fatal()->toString();
  return out;
}

std::optional<MappingProfile> parse(const std::string &json, cb::Findings &f) {
  return MappingProfile::parse(json, "p.json", f);
}

/// Every required field mapped from a same-named column, plus `extra` fields JSON.
std::string profileWith(const std::string &fieldsJson, const std::string &top = "") {
  return "{" + top + R"("fields": {)" + fieldsJson + "}}";
}

const std::string kBasicFields =
    R"("reservation_id": {"column": "id"}, "status": {"column": "st"},
       "booked_on": {"column": "made"}, "cancelled_on": {"column": "cxl"},
       "arrival": {"column": "in"}, "departure": {"column": "out"},
       "rooms": {"constant": 1}, "segment": {"column": "seg"}, "rate": {"column": "price"})";

} // namespace

TEST(MappingProfile, ShippedProfilesAreCompiledIn) {
  EXPECT_EQ(MappingProfile::shippedNames(),
            (std::vector<std::string>{"hotel-bookings-open-data", "native"}));
  for (const auto &name : MappingProfile::shippedNames()) {
    cb::Findings f;
    auto p = MappingProfile::load(name, f);
    ASSERT_TRUE(p) << name;
    EXPECT_TRUE(f.empty()) << f.front().toString();
    EXPECT_EQ(p->name(), name);
    EXPECT_EQ(p->delimiter(), ',');
  }
}

// Each finding points at the key it is about (line:column in the profile, core/jsonlocate.h).
// Regression of a crash found by fuzz_profile: a number too large for a double is valid JSON
// syntax that the parser refuses with out_of_range; it used to escape as an exception.
TEST(MappingProfile, NumberTooLargeIsAFindingNotACrash) {
  const std::string text = "8612e3733707602030";
  cb::Findings f;
  EXPECT_FALSE(parse(text, f));
  ASSERT_EQ(f.size(), 1u);
  EXPECT_NE(f[0].message.find("not usable JSON"), std::string::npos) << f[0].message;
  cbtest::TempDir dir;
  cbtest::writeFile(dir / "blocks.json", text);
  cb::Findings g;
  EXPECT_FALSE(cb::BlockProfile::load((dir / "blocks.json").string(), g));
  ASSERT_FALSE(g.empty());
  EXPECT_NE(g.back().message.find("not usable JSON"), std::string::npos) << g.back().message;
}

TEST(MappingProfile, UnknownKeysAreErrorsNamingTheKey) {
  cb::Findings f;
  EXPECT_FALSE(parse(profileWith(kBasicFields, R"("delimter": ";",)"), f));
  EXPECT_TRUE(hasFinding(f,
                         "p.json:1:2: unknown key \"delimter\" in the profile (allowed: version, "
                         "name, description, delimiter, warn_unused_columns, fields)"));
  f.clear();
  EXPECT_FALSE(parse(profileWith(kBasicFields + R"(, "channel": {"colum": "ch"})"), f));
  EXPECT_TRUE(hasFinding(f, "p.json:4:105: unknown key \"colum\" in fields.channel"));
  f.clear();
  EXPECT_FALSE(parse(profileWith(kBasicFields + R"(, "guest_name": {"column": "g"})"), f));
  EXPECT_TRUE(hasFinding(f, "p.json:4:93: unknown key \"guest_name\" in fields (native fields: "));
  f.clear();
  auto parts = kBasicFields;
  parts.replace(parts.find(R"({"column": "in"})"), 16,
                R"({"date_parts": {"year": "y", "month": "m", "day": "d", "week": "w"}})");
  EXPECT_FALSE(parse(profileWith(parts), f));
  EXPECT_TRUE(hasFinding(f,
                         "p.json:3:74: unknown key \"week\" in fields.arrival.date_parts (allowed: "
                         "year, month, day)"));
}

TEST(MappingProfile, StructuralMistakesAreNamed) {
  cb::Findings f;
  EXPECT_FALSE(parse(R"({"fields": {"reservation_id": {"column": "id"}}})", f));
  EXPECT_TRUE(hasFinding(f, "p.json:1:2: fields has no entry for the required field \"status\""));
  EXPECT_TRUE(hasFinding(f, "p.json:1:2: fields has no entry for the required field \"rate\""));
  f.clear();
  EXPECT_FALSE(parse("{\"fields\": {\n  \"status\": }", f));
  ASSERT_EQ(f.size(), 1u);
  EXPECT_EQ(f[0].toString(), "p.json:2:13: the profile is not valid JSON: syntax error while "
                             "parsing value - unexpected '}'; expected '[', '{', or a literal");
  f.clear();
  EXPECT_FALSE(
      parse(profileWith(kBasicFields + R"(, "channel": {"column": "a", "constant": "b"})"), f));
  EXPECT_TRUE(hasFinding(f, "fields.channel needs exactly one source"));
  f.clear();
  EXPECT_FALSE(parse(profileWith(R"("reservation_id": {"column": "id"}, "status": {"column": "st"},
      "booked_on": {"from_field": "arrival", "minus_days": "lead"},
      "arrival": {"from_field": "departure", "minus_days": "n"},
      "departure": {"from_field": "booked_on", "plus_days": "m"},
      "cancelled_on": {"column": "c"}, "rooms": {"constant": 1}, "segment": {"constant": "S"},
      "rate": {"constant": 0})"),
                     f));
  EXPECT_TRUE(hasFinding(f, "from_field goes round in a circle"));
  f.clear();
  EXPECT_FALSE(parse(
      profileWith(kBasicFields + R"(, "channel": {"column": "c", "date_format": "%d/%m/%Y"})"), f));
  EXPECT_TRUE(hasFinding(f, "fields.channel.date_format only goes with a date field"));
  f.clear();
  auto bad = kBasicFields;
  bad.replace(bad.find(R"({"column": "st"})"), 16,
              R"({"column": "st", "values": {"OK": "confirmed"}})");
  EXPECT_FALSE(parse(profileWith(bad), f));
  EXPECT_TRUE(
      hasFinding(f, "fields.status.values maps \"OK\" to \"confirmed\", which is not a status"));
}

TEST(MappingProfile, JsonErrorPositionsCountCharactersLikeCsvFindings) {
  cb::Findings f;
  // "é" is two bytes: the stray x is character 18 of line 1 though it is byte 19.
  EXPECT_FALSE(parse("{\"name\": \"Caf\xC3\xA9\", x}", f));
  ASSERT_EQ(f.size(), 1u);
  EXPECT_EQ(f[0].line, 1);
  EXPECT_EQ(f[0].column, 18);
  f.clear();
  // the input ends inside the object: one past the last character of line 3
  EXPECT_FALSE(parse("{\n\"fields\": {\n\"rate\":", f));
  ASSERT_EQ(f.size(), 1u);
  EXPECT_EQ(f[0].toString(), "p.json:3:8: the profile is not valid JSON: syntax error while "
                             "parsing value - unexpected end of input; expected '[', '{', or a "
                             "literal");
  f.clear();
  EXPECT_FALSE(parse("", f));
  ASSERT_EQ(f.size(), 1u);
  EXPECT_EQ(f[0].line, 1);
  EXPECT_EQ(f[0].column, 1);
}

TEST(MappingProfile, ShippedNameOrPath) {
  cbtest::TempDir tmp;
  cbtest::writeFile(tmp / "mine.json", profileWith(kBasicFields, R"("name": "my-layout",)"));
  cb::Findings f;
  auto p = MappingProfile::load((tmp / "mine.json").string(), f);
  ASSERT_TRUE(p);
  EXPECT_EQ(p->name(), "my-layout");
  EXPECT_EQ(p->label(), (tmp / "mine.json").string());
  EXPECT_FALSE(MappingProfile::load("nope", f));
  EXPECT_TRUE(hasFinding(f, "nope: no shipped mapping profile has this name "
                            "(hotel-bookings-open-data, native) and no such file can be read"));
}

TEST(MappingProfile, ColumnsWithDateFormatValueMapAndCondition) {
  cb::Findings f;
  auto fields = kBasicFields;
  fields.replace(fields.find(R"({"column": "st"})"), 16,
                 R"({"column": "st", "values": {"OK": "booked", "X": "cancelled"}})");
  fields.replace(
      fields.find(R"({"column": "cxl"})"), 17,
      R"({"column": "cxl", "date_format": "%d/%m/%Y", "only_when_status": "cancelled"})");
  fields.replace(fields.find(R"({"column": "made"})"), 18,
                 R"({"column": "made", "date_format": "%d/%m/%Y"})");
  fields +=
      R"(, "channel": {"column": "ch", "values": {"WEB": "Web"}}, "currency": {"constant": "EUR"})";
  auto p = parse(profileWith(fields, R"("delimiter": ";",)"), f);
  ASSERT_TRUE(p) << f.front().toString();
  EXPECT_EQ(p->delimiter(), ';');
  auto rows = records("id;st;made;cxl;in;out;seg;price;ch\n"
                      "K1;X;03/02/2026;05/02/2026;2026-03-01;2026-03-04;Leisure;99.5;WEB\n"
                      "K2;OK;03/02/2026;05/02/2026;2026-03-01;2026-03-04;Leisure;80;Phone\n"
                      "K3;Maybe;2026-02-03;;2026-03-01;2026-03-04;Leisure;80;Phone\n",
                      ';');
  ASSERT_TRUE(p->bind(rows[0], "in.csv", f));
  EXPECT_TRUE(f.empty());
  cb::Reservation r;
  ASSERT_TRUE(p->map(rows[1], r).empty());
  EXPECT_EQ(r.id, "K1");
  EXPECT_EQ(r.status, ReservationStatus::Cancelled);
  EXPECT_EQ(r.bookedOn, Date::fromYmd(2026, 2, 3));
  EXPECT_EQ(r.cancelledOn, Date::fromYmd(2026, 2, 5));
  EXPECT_EQ(r.departure, Date::fromYmd(2026, 3, 4));
  EXPECT_EQ(r.rooms, 1);
  EXPECT_EQ(r.rate, 99.5);
  EXPECT_EQ(r.channel, "Web");
  EXPECT_EQ(r.currency, "EUR");
  // not cancelled: cancelled_on is left empty though the column has a date
  ASSERT_TRUE(p->map(rows[2], r).empty());
  EXPECT_EQ(r.status, ReservationStatus::Booked);
  EXPECT_FALSE(r.cancelledOn);
  EXPECT_EQ(r.channel, "Phone"); // values not in the map pass through
  auto problems = p->map(rows[3], r);
  ASSERT_EQ(problems.size(), 2u);
  EXPECT_EQ(problems[0].column, 2);
  EXPECT_EQ(problems[0].message, "st \"Maybe\" is not a known status (expected booked, cancelled, "
                                 "no-show or checked-out, or as the profile maps: OK, X)");
  EXPECT_EQ(problems[1].column, 3);
  EXPECT_EQ(problems[1].message, "made \"2026-02-03\" is not a date (expected DD/MM/YYYY)");
}

TEST(MappingProfile, DatePartsAndDerivedDates) {
  cb::Findings f;
  auto p = parse(profileWith(R"(
      "reservation_id": {"line_number": true, "prefix": "H-"},
      "status": {"constant": "checked-out"},
      "arrival": {"date_parts": {"year": "y", "month": "m", "day": "d"}},
      "departure": {"from_field": "arrival", "plus_days": ["we", "wk"]},
      "booked_on": {"from_field": "arrival", "minus_days": "lead"},
      "cancelled_on": {"constant": ""},
      "rooms": {"constant": 1}, "segment": {"constant": "All"}, "rate": {"constant": 0})"),
                 f);
  ASSERT_TRUE(p) << f.front().toString();
  auto rows = records("y,m,d,we,wk,lead\n"
                      "2016,February,29,1,2,30\n"
                      "2016,3,1,0,0,0\n"
                      "2015,Feb,29,1,x,3\n"
                      "2015,Febr,1,0,0,0\n");
  ASSERT_TRUE(p->bind(rows[0], "in.csv", f));
  cb::Reservation r;
  ASSERT_TRUE(p->map(rows[1], r).empty());
  EXPECT_EQ(r.id, "H-2");
  EXPECT_EQ(r.arrival, Date::fromYmd(2016, 2, 29));
  EXPECT_EQ(r.departure, Date::fromYmd(2016, 3, 3));
  EXPECT_EQ(r.bookedOn, Date::fromYmd(2016, 1, 30));
  ASSERT_TRUE(p->map(rows[2], r).empty());
  EXPECT_EQ(r.id, "H-3");
  EXPECT_TRUE(r.isDayUse());
  EXPECT_EQ(r.arrival, Date::fromYmd(2016, 3, 1));
  auto problems = p->map(rows[3], r);
  ASSERT_EQ(problems.size(), 2u);
  EXPECT_EQ(problems[0].column, 3);
  EXPECT_EQ(problems[0].message, "y 2015, m Feb, d 29: there is no such date");
  EXPECT_EQ(problems[1].column, 5);
  EXPECT_EQ(problems[1].message, "wk \"x\" is not a whole number of days");
  problems = p->map(rows[4], r);
  ASSERT_EQ(problems.size(), 1u);
  EXPECT_EQ(problems[0].column, 2);
  EXPECT_EQ(problems[0].message,
            "m \"Febr\" is not a month (expected 1-12 or an English month name)");
  EXPECT_EQ(p->sourceColumn("departure"), 4);
  EXPECT_EQ(p->sourceName("booked_on"), "lead");
  EXPECT_EQ(p->sourceColumn("rate"), 0);
  EXPECT_EQ(p->sourceName("rate"), "rate");
}

TEST(MappingProfile, BindReportsMissingAndRepeatedColumns) {
  cb::Findings f;
  auto p = parse(profileWith(kBasicFields), f);
  ASSERT_TRUE(p);
  auto rows = records("id,st,made,cxl,in,out,seg,seg\nA,booked,,,,,,\n");
  EXPECT_FALSE(p->bind(rows[0], "in.csv", f));
  EXPECT_TRUE(hasFinding(f, "in.csv:1: mapping profile p.json reads rate from column \"price\", "
                            "which is not in the file's header"));
  EXPECT_TRUE(hasFinding(f, "in.csv:1:8: column \"seg\" appears more than once in the header "
                            "(columns 7 and 8)"));
}

TEST(MappingProfile, RepeatedNativeColumnIsReportedOnceAndOnlyAsRepeated) {
  cb::Findings f;
  auto p = MappingProfile::load("native", f);
  ASSERT_TRUE(p);
  // The second "segment" is not read, but it is a native column: calling it "not a native
  // column" as well would send the user looking for a typo that is not there.
  auto rows = records("reservation_id,status,booked_on,cancelled_on,arrival,departure,rooms,"
                      "segment,rate,segment,notes\n");
  EXPECT_FALSE(p->bind(rows[0], "in.csv", f));
  ASSERT_EQ(f.size(), 2u);
  EXPECT_EQ(f[0].toString(),
            "in.csv:1:10: column \"segment\" appears more than once in the header (columns 8 and "
            "10); rename one so the import knows which to use");
  EXPECT_EQ(f[1].toString(),
            "in.csv:1:11: warning: column \"notes\" is not a native column; it is ignored");
}

TEST(MappingProfile, ColumnReadTwiceIsReportedRepeatedOnce) {
  cb::Findings f;
  auto p = parse(profileWith(R"(
      "reservation_id": {"column": "id"}, "status": {"constant": "booked"},
      "arrival": {"column": "in"},
      "departure": {"from_field": "arrival", "plus_days": "n"},
      "booked_on": {"from_field": "arrival", "minus_days": "n"},
      "cancelled_on": {"constant": ""}, "rooms": {"constant": 1}, "segment": {"constant": "S"},
      "rate": {"constant": 0})"),
                 f);
  ASSERT_TRUE(p) << f.front().toString();
  auto rows = records("id,in,n,n\n");
  EXPECT_FALSE(p->bind(rows[0], "in.csv", f));
  ASSERT_EQ(f.size(), 1u);
  EXPECT_EQ(f[0].column, 4);
}

TEST(MappingProfile, ColumnNameIsTheHeaderOnlyForAPlainColumn) {
  cb::Findings f;
  auto p = parse(profileWith(R"(
      "reservation_id": {"line_number": true}, "status": {"column": "st"},
      "arrival": {"column": "in"},
      "departure": {"from_field": "arrival", "plus_days": "n"},
      "booked_on": {"from_field": "arrival", "minus_days": "lead"},
      "cancelled_on": {"constant": ""}, "rooms": {"constant": 1}, "segment": {"constant": "S"},
      "rate": {"column": "price"})"),
                 f);
  ASSERT_TRUE(p) << f.front().toString();
  auto rows = records("st,in,n,lead,price\n");
  ASSERT_TRUE(p->bind(rows[0], "in.csv", f));
  EXPECT_EQ(p->columnName("status"), "st");
  EXPECT_EQ(p->columnName("rate"), "price");
  EXPECT_EQ(p->columnName("booked_on"), "booked_on"); // derived: lead is not the date itself
  EXPECT_EQ(p->columnName("reservation_id"), "reservation_id");
  EXPECT_EQ(p->columnName("rooms"), "rooms");
  EXPECT_EQ(p->columnName("no_such_field"), "no_such_field");
}

TEST(MappingProfile, NativeProfileAcceptsAnyOrderAndOptionalColumns) {
  cb::Findings f;
  auto p = MappingProfile::load("native", f);
  ASSERT_TRUE(p);
  auto rows = records("rate,segment,rooms,departure,arrival,cancelled_on,booked_on,status,"
                      "reservation_id,guest\n"
                      "45.25,Crew,3,2026-01-03,2026-01-01,,2025-12-01,booked,Z9,Ms X\n");
  ASSERT_TRUE(p->bind(rows[0], "in.csv", f));
  ASSERT_EQ(f.size(), 1u);
  EXPECT_EQ(f[0].toString(),
            "in.csv:1:10: warning: column \"guest\" is not a native column; it is ignored");
  cb::Reservation r;
  ASSERT_TRUE(p->map(rows[1], r).empty());
  EXPECT_EQ(r.id, "Z9");
  EXPECT_EQ(r.rooms, 3);
  EXPECT_EQ(r.rate, 45.25);
  EXPECT_EQ(r.roomType, "");
  EXPECT_EQ(r.blockId, "");
  EXPECT_EQ(p->sourceColumn("reservation_id"), 9);
}

TEST(MappingProfile, NumbersAreStrict) {
  cb::Findings f;
  auto p = MappingProfile::load("native", f);
  ASSERT_TRUE(p);
  auto rows =
      records("reservation_id,status,booked_on,cancelled_on,arrival,departure,rooms,segment,rate\n"
              "A,booked,2026-01-01,,2026-02-01,2026-02-02,two,S,1e3\n"
              "B,booked,2026-01-01,,2026-02-01,2026-02-02,1,S,\n"
              "C,booked,2026-01-01,,2026-02-01,2026-02-02,1.0,,1.\n");
  ASSERT_TRUE(p->bind(rows[0], "in.csv", f));
  cb::Reservation r;
  auto a = p->map(rows[1], r);
  ASSERT_EQ(a.size(), 2u);
  EXPECT_EQ(a[0].message, "rooms \"two\" is not a whole number of rooms");
  EXPECT_EQ(a[1].message, "rate \"1e3\" is not a number (expected a decimal with '.', e.g. 89.50, "
                          "without thousands separators)");
  auto b = p->map(rows[2], r);
  ASSERT_EQ(b.size(), 1u);
  EXPECT_EQ(b[0].message, "rate is empty (expected a rate per room-night, e.g. 89.50)");
  auto c = p->map(rows[3], r);
  ASSERT_EQ(c.size(), 3u);
  EXPECT_EQ(c[1].message, "segment is empty; every reservation needs a segment");
}
