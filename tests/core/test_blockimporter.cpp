// Group-block import (core/blockimporter.h), block profiles (core/blockprofile.h), the block
// rules (core/blockrecord.h) and the schema-6 block columns (core/store.h).
#include "testsupport.h"

#include "core/blockimporter.h"
#include "core/blockprofile.h"
#include "core/sqlite.h"
#include "core/store.h"

namespace {

using cb::Date;
namespace fs = std::filesystem;

Date d(const char *iso) { return *Date::parseIso(iso); }

const char *kHeader =
    "block_id,name,segment,arrival,departure,rooms_per_night,cutoff,status,contracted_on,"
    "room_type\n";

class BlockImport : public ::testing::Test {
protected:
  void SetUp() override {
    cb::Property p;
    p.name = "Blocks";
    p.capacity = 50;
    store = cb::Store::create(dir / "s.curvebench", p);
  }
  cb::ImportReport import(const std::string &text, cb::ImportOptions o = {}) {
    cbtest::writeFile(dir / "blocks.csv", text);
    return cb::importBlocks(*store, dir / "blocks.csv", o);
  }
  cbtest::TempDir dir;
  std::unique_ptr<cb::Store> store;
};

TEST_F(BlockImport, NativeFileRoundTripsWithContractDateAndRoomType) {
  auto rep = import(std::string(kHeader) +
                    "B1,\"Choir, tour\",GRP,2026-05-01,2026-05-03,20,2026-04-10,definite,"
                    "2025-12-01,STD\n"
                    "B2,,GRP,2026-06-01,2026-06-02,5,2026-05-01,tentative,,\n");
  ASSERT_TRUE(rep.written) << (rep.findings.empty() ? "" : rep.findings[0].toString());
  EXPECT_EQ(rep.log.kind, "blocks");
  EXPECT_EQ(rep.log.added, 2);
  const auto blocks = store->blockRecords();
  ASSERT_EQ(blocks.size(), 2U);
  EXPECT_EQ(blocks[0].block.name, "Choir, tour");
  EXPECT_EQ(blocks[0].block.roomsPerNight, 20);
  EXPECT_EQ(blocks[0].contractedOn, d("2025-12-01"));
  EXPECT_EQ(blocks[0].roomType, "STD");
  EXPECT_EQ(blocks[1].block.status, cb::BlockStatus::Tentative);
  EXPECT_EQ(blocks[1].contractedOn, std::nullopt);
  EXPECT_EQ(store->importLog().back().kind, "blocks");
  // The same file again: nothing changes; a newer one with a smaller block updates it.
  rep = import(std::string(kHeader) + "B2,,GRP,2026-06-01,2026-06-02,5,2026-05-01,tentative,,\n");
  EXPECT_EQ(rep.log.unchanged, 1);
  rep = import(std::string(kHeader) + "B2,,GRP,2026-06-01,2026-06-02,4,2026-05-01,definite,,\n");
  EXPECT_EQ(rep.log.updated, 1);
  EXPECT_EQ(store->groupBlocks()[1].roomsPerNight, 4);
}

TEST_F(BlockImport, StrictWritesNothingAndPointsAtTheCell) {
  auto rep =
      import(std::string(kHeader) + "B1,,GRP,2026-05-01,2026-05-03,20,2026-04-10,definite,,\n"
                                    "B2,,GRP,2026-05-01,2026-05-03,x,2026-04-10,maybe,,\n"
                                    "B3,,GRP,2026-05-01,2026-05-03,2,2026-05-02,definite,,\n"
                                    "B1,,GRP,2026-05-01,2026-05-03,20,2026-04-10,definite,,\n");
  EXPECT_FALSE(rep.written);
  EXPECT_TRUE(store->groupBlocks().empty());
  const std::string f = (dir / "blocks.csv").string();
  EXPECT_TRUE(cbtest::hasFinding(rep.findings, f + ":3:6: rooms_per_night \"x\" is not a whole"));
  EXPECT_TRUE(cbtest::hasFinding(rep.findings, f + ":3:8: status \"maybe\" is not tentative"));
  EXPECT_TRUE(
      cbtest::hasFinding(rep.findings, f + ":4:7: cutoff 2026-05-02 is after arrival 2026-05-01"));
  EXPECT_TRUE(cbtest::hasFinding(rep.findings, f + ":5:1: block_id \"B1\" was already used on "
                                                   "line 2"));
  EXPECT_EQ(store->importLog().back().outcome, "failed");
  // Lenient: the good row is written, the three bad ones reported.
  cb::ImportOptions o;
  o.mode = cb::ImportMode::Lenient;
  o.rejectsFile = dir / "rejects.csv";
  rep = cb::importBlocks(*store, dir / "blocks.csv", o);
  EXPECT_TRUE(rep.written);
  EXPECT_EQ(rep.log.added, 1);
  EXPECT_EQ(rep.log.rejected, 3);
  const std::string rejects = cbtest::readFile(dir / "rejects.csv");
  EXPECT_EQ(rejects.substr(0, rejects.find('\n')), std::string(kHeader).substr(0, 93) + ",problem");
  EXPECT_NE(rejects.find("B3,,GRP,2026-05-01,2026-05-03,2,2026-05-02,definite,,,"
                         "cutoff 2026-05-02 is after arrival 2026-05-01\n"),
            std::string::npos)
      << rejects;
}

TEST_F(BlockImport, MissingColumnAndHeaderOnlyAreFileErrors) {
  auto rep = import("block_id,arrival,departure,cutoff,status\nB1,2026-05-01,2026-05-02,"
                    "2026-04-01,definite\n");
  EXPECT_FALSE(rep.written);
  EXPECT_TRUE(cbtest::hasFinding(rep.findings, "no column \"rooms_per_night\""));
  rep = import(kHeader);
  EXPECT_FALSE(rep.written);
  EXPECT_TRUE(cbtest::hasFinding(rep.findings, "header line but no blocks"));
}

TEST_F(BlockImport, ProfileMapsAnotherLayout) {
  cbtest::writeFile(dir / "p.json", R"({"kind": "blocks", "name": "sales-office",
    "delimiter": ";", "fields": {
      "block_id": {"column": "Code"}, "name": {"column": "Group"},
      "segment": {"constant": "GRP"},
      "arrival": {"column": "From", "date_format": "%d.%m.%Y"},
      "departure": {"column": "To", "date_format": "%d.%m.%Y"},
      "rooms_per_night": {"column": "Rooms"},
      "cutoff": {"column": "Release", "date_format": "%d.%m.%Y"},
      "status": {"column": "Kind", "values": {"T": "tentative", "D": "definite"}},
      "contracted_on": {"column": "Signed", "optional": true, "date_format": "%d.%m.%Y"}}})");
  cb::ImportOptions o;
  o.profile = (dir / "p.json").string();
  auto rep = import("Code;Group;From;To;Rooms;Release;Kind\n"
                    "K9;Dentists;01.09.2026;04.09.2026;30;01.08.2026;T\n"
                    "K10;Rowers;01.09.2026;02.09.2026;3;01.08.2026;X\n",
                    o);
  EXPECT_FALSE(rep.written);
  EXPECT_TRUE(cbtest::hasFinding(rep.findings, ":3:7: Kind \"X\" is not tentative or definite"));
  rep = import("Code;Group;From;To;Rooms;Release;Kind\n"
               "K9;Dentists;01.09.2026;04.09.2026;30;01.08.2026;T\n",
               o);
  ASSERT_TRUE(rep.written);
  EXPECT_EQ(rep.log.profile, o.profile);
  const auto b = store->blockRecords().at(0);
  EXPECT_EQ(b.block.segment, "GRP");
  EXPECT_EQ(b.block.arrival, d("2026-09-01"));
  EXPECT_EQ(b.block.status, cb::BlockStatus::Tentative);
  // A reservation profile (no "kind": "blocks") or a missing field is a profile error.
  cb::Findings f;
  EXPECT_FALSE(cb::BlockProfile::parse(R"({"kind": "reservations", "fields": {}})", "x.json", f));
  EXPECT_TRUE(cbtest::hasFinding(f, "\"kind\" must be \"blocks\""));
  EXPECT_TRUE(cbtest::hasFinding(f, "does not say where \"cutoff\" comes from"));
}

TEST_F(BlockImport, DryRunWritesAndLogsNothing) {
  cb::ImportOptions o;
  o.dryRun = true;
  o.mode = cb::ImportMode::Lenient;
  auto rep =
      import(std::string(kHeader) + "B1,,GRP,2026-05-01,2026-05-03,20,2026-04-10,definite,,\n"
                                    "B2,,GRP,2026-06-01,2026-05-02,5,2026-05-01,tentative,,\n",
             o);
  EXPECT_FALSE(rep.written);
  EXPECT_EQ(rep.log.added, 1);
  EXPECT_EQ(rep.log.rejected, 1);
  EXPECT_TRUE(store->blockRecords().empty());
  EXPECT_TRUE(store->importLog().empty());
}

TEST(BlockStore, SchemaFiveStoreKeepsItsBlocksWithUnknownContractDate) {
  cbtest::TempDir dir;
  const fs::path path = dir / "old.curvebench";
  cb::Property p;
  p.name = "Old";
  p.capacity = 10;
  cb::Store::createAtVersionForTesting(path, p, 5);
  {
    cb::SqliteDb db(path, cb::SqliteDb::Mode::OpenExisting);
    db.exec("INSERT INTO group_blocks (id, name, arrival, departure, rooms_per_night, cutoff, "
            "status) VALUES ('OLD', 'Old group', '2025-03-01', '2025-03-03', 8, '2025-02-01', "
            "'definite')");
  }
  auto store = cb::Store::open(path);
  EXPECT_EQ(store->schemaVersion(), cb::Store::kSchemaVersion);
  const auto blocks = store->blockRecords();
  ASSERT_EQ(blocks.size(), 1U);
  EXPECT_EQ(blocks[0].block.roomsPerNight, 8);
  EXPECT_EQ(blocks[0].contractedOn, std::nullopt);
  EXPECT_TRUE(fs::exists(path.string() + ".v5.bak"));
}

TEST(BlockRules, RefuseImpossibleBlocks) {
  cb::BlockRecord b{{"B", "", "GRP", d("2026-05-02"), d("2026-05-02"), 3, d("2026-04-01"),
                     cb::BlockStatus::Definite},
                    std::nullopt,
                    ""};
  std::string field;
  EXPECT_EQ(cb::validateBlock(b, &field), "departure 2026-05-02 is not after arrival 2026-05-02");
  EXPECT_EQ(field, "departure");
  b.block.departure = d("2026-05-03");
  b.contractedOn = d("2026-05-05");
  EXPECT_EQ(cb::validateBlock(b, &field), "contracted_on 2026-05-05 is after arrival 2026-05-02");
  b.contractedOn = d("2026-01-05");
  EXPECT_EQ(cb::validateBlock(b), "");
}

} // namespace
