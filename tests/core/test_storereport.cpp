#include "core/storereport.h"

#include "testsupport.h"

TEST(StoreReport, InfoShowsCountsWithSeparatorsAndTheImportLog) {
  cbtest::TempDir dir;
  cb::Property p;
  p.name = "Report House";
  p.capacity = 1250;
  p.currency = "CHF";
  auto store = cb::Store::create(dir / "r.curvebench", p);
  cb::Reservation r;
  r.bookedOn = *cb::Date::parseIso("2026-01-02");
  r.arrival = *cb::Date::parseIso("2026-02-01");
  r.departure = *cb::Date::parseIso("2026-02-02");
  r.segment = "CORP";
  r.rate = 10;
  {
    cb::Store::Transaction tx(*store);
    for (int i = 0; i < 1500; ++i) {
      r.id = "R" + std::to_string(i);
      store->upsertReservation(r, 0);
    }
    tx.commit();
  }
  cb::ImportLogEntry failed;
  failed.file = "bad.csv";
  failed.profile = "native";
  failed.mode = "strict";
  failed.rowsRead = 3;
  failed.rejected = 3;
  store->logFailedImport(failed);

  std::string info = cb::formatStoreInfo(*store);
  EXPECT_NE(info.find("Property      Report House"), std::string::npos) << info;
  EXPECT_NE(info.find("Capacity      1,250 rooms"), std::string::npos) << info;
  EXPECT_NE(info.find("Currency      CHF"), std::string::npos) << info;
  EXPECT_NE(info.find("Reservations  1,500 (0 day-use)"), std::string::npos) << info;
  EXPECT_NE(info.find("CORP"), std::string::npos) << info;
  EXPECT_NE(info.find("100.0 %"), std::string::npos) << info;
  EXPECT_NE(info.find("FAILED (nothing written) bad.csv"), std::string::npos) << info;
  EXPECT_NE(info.find("Data as of    2026-01-02"), std::string::npos) << info;
}
