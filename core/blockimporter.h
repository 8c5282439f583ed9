// Group-block import: file → rows → blocks profile → validation → store, as one transaction.
#pragma once

#include "core/reservationimporter.h"

#include <filesystem>

namespace cb {

/// Imports a group-blocks file (native columns of kBlockColumns, or a JSON blocks profile given
/// in options.profile) with the reservation import's rules: strict = nothing written on any
/// error; lenient = valid rows written and every reject reported; findings at file:line:column;
/// one transaction; an import-log row of kind "blocks". A block id seen again in a later file
/// updates the stored block; within one file ids must be unique. Lenient with
/// options.rejectsFile: the rejected rows are copied there with a "problem" column.
/// options.progress is not used (block files are small: the file is read whole).
ImportReport importBlocks(Store &store, const std::filesystem::path &file,
                          const ImportOptions &options = {});

} // namespace cb
