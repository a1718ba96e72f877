// Merging stores (e.g. the shard stores of a cluster array job) into one. Settings are
// matched by key, features by form (the output's ids are kept and new forms get new ids),
// readings and their segments by (settings key, SHA-256): a content held by several stores
// is kept once. Files are matched by path; where two stores disagree about a path, the row
// with the later modification time wins. Analysis runs are not copied: analyse the merged
// store. The whole merge (every input, and with --exact the removal of files no input has)
// is one transaction, so an interrupted merge leaves OUT as it was.
#pragma once
#include <cstdint>
#include <cstddef>
#include <set>
#include <string>
#include <utility>
#include <vector>

#include "store/sqlite_db.h"

namespace manicule::store {

struct MergeSummary {
  std::size_t settings_added = 0;
  std::size_t readings_added = 0;
  std::size_t segments_added = 0;
  std::size_t files_added = 0;
  std::size_t files_updated = 0;
  std::set<std::string> input_files;          // every path the input holds (read once, while merging)
  std::set<std::string> settings_keys;        // the reading settings the input holds
  std::vector<std::string> input_unfinished;  // the input's unfinished work (unfinished_work.h)
  std::set<std::string> shares;               // the --shard K/N of the input's batch runs ("1/1": none)
  // Its files that OUT did not hold by their path, each with what tells a file found under
  // another path: its path below its input folder, size and time.
  struct AddedFile {
    std::string path, relative_path;
    std::int64_t size = 0, mtime_ns = 0;
  };
  std::vector<AddedFile> files_added_here;
};

struct MergeOutcome {
  std::vector<std::pair<std::string, MergeSummary>> inputs;  // in the order given
  std::set<std::string> settings_keys;     // of every input: several mean analyses take part of them
  std::set<std::string> held_by_no_input;  // OUT's files that no input holds, kept (without exact)
  std::size_t files_removed = 0;           // those removed (with exact)
  // Where each input is one share of N by its batch runs (--shard K/N, the same N), the
  // shares none of them is: "3/8" for a task that never saved its store.
  std::vector<std::string> missing_shares;
  // Without exact: files added that match, by name below their input folder, size and time,
  // a file of OUT under another path that no input holds (the archive given as an absolute
  // path in one task, a relative one in another): most likely one file, now held twice.
  std::size_t files_maybe_twice = 0;
  std::string maybe_twice_added, maybe_twice_held;  // the first such pair
};

// Merges the stores at `inputs` into `out` (opened with open_store) in one transaction on
// `out`, a merge run recorded for each input. With `exact`, OUT's files that no input holds
// are removed; an input holding unfinished work is then refused (Error nothing_selected),
// for its share's unread files would go, and so are inputs that are shares of N with some
// share missing. Any error leaves `out` as it was.
MergeOutcome merge_stores(Database& out, const std::vector<std::string>& inputs, bool exact);

// "3/8, 5/8": shares as said in messages.
std::string join_shares(const std::vector<std::string>& shares);

}  // namespace manicule::store
