// The rows of the files table as a set of paths: read, and removed (a file gone from the
// archive, or held by no input of an exact merge). A removed file's contents stay, keyed by
// hash, for a file that comes back.
#pragma once
#include <set>
#include <string>

#include "store/sqlite_db.h"

namespace manicule::store {

std::set<std::string> stored_file_paths(Database& db);
void remove_files(Database& db, const std::set<std::string>& paths);

}  // namespace manicule::store
