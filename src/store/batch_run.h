// A batch run: brings the store up to date with the archive under the request's inputs.
//  - Each file's size and modification time are compared with the store: when both are as
//    stored and its content was read under these settings, the file is not opened at all.
//    Otherwise it is hashed (SHA-256); a content already stored is not parsed again (a file
//    touched, moved or copied); only new contents are parsed. verify_hashes hashes every
//    file (for file systems whose times cannot be trusted). A file modified within two
//    seconds before the run is recorded without its time, so the next run hashes it (it
//    could change again within one timestamp tick).
//  - Files are read on all cores (read_files_streaming); what is read is committed in one
//    transaction per batch of files (commit_files, or commit_seconds, whichever first), so
//    memory stays bounded and a killed run loses at most one batch: run again, it goes on
//    where the last commit left it, with no duplicate row.
//  - A file that fails is recorded with its error; the run goes on.
//  - Files that no longer exist under the inputs (inside the folder filter and the shard)
//    leave the files table; what was read from them stays cached by content.
//  - A run that finds nothing to do (every file as stored, none gone, every folder listed,
//    no earlier run left unfinished) writes nothing and records no run.
#pragma once
#include <cstdint>
#include <functional>
#include <memory>
#include <optional>
#include <stdexcept>
#include <string>
#include <vector>

#include "core/request.h"
#include "store/archive_files.h"
#include "store/archive_filter.h"
#include "store/fresh_counts.h"
#include "store/run_log.h"
#include "store/sqlite_db.h"

namespace manicule::store {

struct BatchOptions {
  ArchiveFilter filter;  // only its folder applies to reading; the rest selects what is analysed
  Shard shard;
  bool verify_hashes = false;
  // Mostly the two seconds end a transaction. Each commit writes to the log every page it
  // changed, and the indexes keyed by content hash put each file's rows on a page of their
  // own, so each commit rewrites pages the last one wrote: with 64 files a transaction
  // (the earlier default), 20,000 small letter files took 1.24x as long, and their writes
  // carried 1.5 GB against 1.2 GB (bench/store_small_files.py, bench/RESULTS.md).
  std::size_t commit_files = 10000;
  double commit_seconds = 2.0;
  // Set when an analysis follows in the same process: the counts of the segments read in
  // this run with at least this many words are kept in memory for it (BatchSummary::fresh).
  std::optional<std::size_t> keep_counts_of_segments_from;
};

// What became of a file opened: `hashed` when its content is stored already, `copy` when
// another file of this run is read for it (a copy new to the store: it fares as that one).
enum class FileOutcome { unchanged, hashed, copy, read, failed };

struct BatchProgress {
  std::size_t files_done = 0;
  std::size_t files_total = 0;
  std::size_t bytes_done = 0;   // of the files that had to be opened
  std::size_t bytes_total = 0;  // ditto
};

// After each file that had to be opened (unchanged files are reported once, in bulk, with
// an empty path). Called on the thread that called run_batch.
using BatchListener = std::function<void(const BatchProgress&, const std::string& path, FileOutcome outcome)>;

struct BatchFailure {
  std::string path;
  std::string message;
};

struct BatchSummary {
  // 0 when the run found nothing to do (every file as stored, none gone): then it wrote
  // nothing, not even its row in the runs table.
  std::int64_t run_id = 0;
  bool recorded() const { return run_id != 0; }
  std::int64_t settings_id = 0;
  RunCounters counters;
  std::vector<BatchFailure> failures;  // every file failing now, in path order
  std::vector<std::string> removed;    // the files no longer found (their rows removed), in path order
  // Of those, the files whose content the store holds after the run under another path
  // (moved or renamed, most often, or copied before they went).
  std::size_t removed_content_kept = 0;
  std::size_t files_respelled = 0;     // rows of files found under another spelling of their path
  // Files new to the store whose name below their input, size and time match a stored file
  // this run did not find (an archive given as a relative path from another working folder,
  // or as an absolute one): most likely the same files, then stored twice. One example each.
  std::size_t files_maybe_twice = 0;
  std::string maybe_twice_new, maybe_twice_stored;
  // Files found under two of the inputs, or two spellings of one ("arch", "./arch"): read
  // once, under the path found first. One example.
  std::size_t files_found_twice = 0;
  std::string found_twice_kept, found_twice_passed;
  // Folders below the inputs that could not be listed: their files were not looked at, and
  // those stored from them before stay in the store.
  std::vector<UnlistedFolder> unlisted;
  LeftAside left_aside;  // files below the input folders whose names do not say TEI
  // Files read this run, without failing, that hold no segment of the unit: all of them
  // most often means another unit was meant (--unit speaker over novels).
  std::size_t files_without_segments = 0;
  std::size_t files_read_cleanly = 0;  // read this run without failing
  // Whether the store holds any segment under this run's settings (asked only when no file
  // read this run holds one: a re-run that reads a play into a letter archive is no sign
  // of a wrong unit).
  bool store_holds_segments = true;
  std::unique_ptr<FreshCounts> fresh;  // with keep_counts_of_segments_from, if any file was read
};

// Thrown by a listener to stop a run early (the command line does on Ctrl-C): run_batch
// keeps every file finished so far (each is whole when the listener hears of it), marks
// the run interrupted, and throws it on.
struct BatchInterrupted : std::runtime_error {
  BatchInterrupted() : std::runtime_error("the batch run was interrupted") {}
};

// Throws Error(usage) for a bad request, Error(write_failed) when the store cannot be
// written (what was committed stays), Error(bad_input) for a missing input.
BatchSummary run_batch(Database& db, const Request& request, const BatchOptions& options,
                       const BatchListener& listener = {});

}  // namespace manicule::store
