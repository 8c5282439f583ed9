// Plain-text reports of a store, for the command line and scheduled runs.
#pragma once

#include "core/reservationimporter.h"
#include "core/store.h"

#include <string>

namespace cb {

/// Property, counts by status / segment / channel, date ranges and the import log.
std::string formatStoreInfo(Store &store);
/// One import's outcome: counts, then every finding on its own line.
std::string formatImportReport(const ImportReport &report);

} // namespace cb
