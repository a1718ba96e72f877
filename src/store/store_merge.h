// Merging stores (e.g. the shard stores of a cluster array job) into one. Settings are
// matched by key, features by form (the output's ids are kept and new forms get new ids),
// readings and their segments by (settings key, SHA-256): a content held by several stores
// is kept once. Files are matched by path; where two stores disagree about a path, the row
// with the later modification time wins. Analysis runs are not copied: analyse the merged
// store. The caller holds one transaction around the whole merge (every input, and the
// removal of files no input has), so an interrupted merge leaves OUT as it was.
#pragma once
#include <cstddef>
#include <set>
#include <string>
#include <vector>

#include "store/sqlite_db.h"

namespace manicule::store {

struct MergeSummary {
  std::size_t settings_added = 0;
  std::size_t readings_added = 0;
  std::size_t segments_added = 0;
  std::size_t files_added = 0;
  std::size_t files_updated = 0;
  std::set<std::string> input_files;  // every path the input holds (read once, while merging)
  std::vector<std::string> input_unfinished;  // the input's unfinished work (unfinished_work.h)
};

// Merges `input` into `out` (both opened with open_store), in the caller's transaction on
// `out`; records a merge run for it.
MergeSummary merge_store(Database& out, Database& input);

// Removes from `out` every file whose path is not in `kept`, as a batch removes vanished
// files (the contents stay, keyed by hash, for a file that comes back); returns how many.
std::size_t remove_files_except(Database& out, const std::set<std::string>& kept);

// The paths of the files a store holds: merge never removes one, so the command line
// names those of OUT that no input holds (left from an earlier merge of other shares).
std::set<std::string> stored_file_paths(Database& db);

}  // namespace manicule::store
