// Merging stores (e.g. the shard stores of a cluster array job) into one. Settings are
// matched by key, features by form (the output's ids are kept and new forms get new ids),
// readings and their segments by (settings key, SHA-256): a content held by several stores
// is kept once. Files are matched by path; where two stores disagree about a path, the row
// with the later modification time wins. Analysis runs are not copied: analyse the merged
// store. Each input is merged in one transaction, so a merge that was interrupted can
// simply be run again.
#pragma once
#include <cstddef>
#include <set>
#include <string>

#include "store/sqlite_db.h"

namespace manicule::store {

struct MergeSummary {
  std::size_t settings_added = 0;
  std::size_t readings_added = 0;
  std::size_t segments_added = 0;
  std::size_t files_added = 0;
  std::size_t files_updated = 0;
  std::set<std::string> input_files;  // every path the input holds (read once, while merging)
};

// Merges the store at `input_path` into `out` (both opened with open_store).
MergeSummary merge_store(Database& out, Database& input);

// The paths of the files a store holds: merge never removes one, so the command line
// names those of OUT that no input holds (left from an earlier merge of other shares).
std::set<std::string> stored_file_paths(Database& db);

}  // namespace manicule::store
