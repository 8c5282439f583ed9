// libFuzzer harness: mapping profiles (reservation and block) from arbitrary JSON text
// (scripts/fuzz.sh). Promises checked: no crash or sanitizer error; a profile that fails to load
// says why in a finding; one that loads binds to a header and maps a row without crashing, and
// reports any problem of the row as a finding-like RowProblem with a message.
#include "core/blockprofile.h"
#include "core/blockrecord.h"
#include "core/csvreader.h"
#include "core/mappingprofile.h"
#include "fuzzsupport.h"

#include <sstream>

namespace {

cb::CsvRecord record(const std::string &line) {
  std::istringstream in(line + "\n");
  cb::CsvReader reader(in, "fuzz.csv");
  cb::CsvRecord rec;
  reader.next(rec);
  return rec;
}

} // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t *data, std::size_t size) {
  const auto path = cbfuzz::writeFile("profile.json", {reinterpret_cast<const char *>(data), size});
  // A header and a row in the shapes the shipped profiles read (native and the open dataset),
  // so a loaded profile has columns to bind.
  static const cb::CsvRecord header = record(
      "reservation_id,hotel,is_canceled,lead_time,arrival_date_year,arrival_date_month,"
      "arrival_date_day_of_month,stays_in_weekend_nights,stays_in_week_nights,adults,"
      "market_segment,distribution_channel,reserved_room_type,assigned_room_type,"
      "reservation_status,reservation_status_date,adr,booked_on,arrival,departure,rooms,rate,"
      "status,segment,channel,room_type,block_id,id,name,cutoff,rooms_per_night");
  static const cb::CsvRecord row = record(
      "R1,City Hotel,0,10,2016,July,1,0,2,2,Online TA,TA/TO,A,A,Check-Out,2016-07-03,95.5,"
      "2026-01-01,2026-02-01,2026-02-03,1,120,confirmed,ADV,WEB,STD,B1,R1,Fair,2026-01-20,5");

  {
    cb::Findings findings;
    auto profile = cb::MappingProfile::load(path.string(), findings);
    if (!profile) {
      cbfuzz::require(!findings.empty());
    } else {
      cb::Findings bindFindings;
      if (profile->bind(header, "fuzz.csv", bindFindings)) {
        cb::Reservation r;
        for (const cb::RowProblem &p : profile->map(row, r))
          cbfuzz::require(!p.message.empty());
      }
    }
  }
  {
    cb::Findings findings;
    auto profile = cb::BlockProfile::load(path.string(), findings);
    if (!profile) {
      cbfuzz::require(!findings.empty());
    } else {
      cb::Findings bindFindings;
      if (profile->bind(header, "fuzz.csv", bindFindings)) {
        cb::BlockRecord b;
        for (const cb::RowProblem &p : profile->map(row, b))
          cbfuzz::require(!p.message.empty());
      }
    }
  }
  return 0;
}
