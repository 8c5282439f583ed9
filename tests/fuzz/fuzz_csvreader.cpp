// libFuzzer harness: the CSV reader over arbitrary bytes (scripts/fuzz.sh). Promises checked: no
// crash or sanitizer error, records come with increasing line numbers, a fatal finding is located
// and ends the reading.
#include "core/csvreader.h"
#include "fuzzsupport.h"

#include <sstream>

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t *data, std::size_t size) {
  // The first byte picks the delimiter and a chunk size, so records straddle chunk ends.
  if (size == 0)
    return 0;
  cb::CsvReader::Options options;
  options.delimiter = (data[0] & 1) ? ';' : ',';
  options.chunkBytes = 1 + (data[0] >> 1);
  options.maxRecordBytes = 4096;
  ++data;
  --size;
  std::istringstream in(std::string(reinterpret_cast<const char *>(data), size));
  cb::CsvReader reader(in, "fuzz.csv", options);
  cb::CsvRecord rec;
  std::int64_t lastLine = 0;
  while (reader.next(rec)) {
    cbfuzz::require(rec.line > lastLine);
    lastLine = rec.line;
  }
  if (reader.fatal()) {
    cbfuzz::require(reader.fatal()->line >= 0 && reader.fatal()->column >= 0);
    cbfuzz::require(!reader.fatal()->message.empty());
    cbfuzz::require(!reader.next(rec)); // nothing after a fatal finding
  }
  cbfuzz::require(reader.bytesConsumed() <= static_cast<std::int64_t>(size));
  return 0;
}
