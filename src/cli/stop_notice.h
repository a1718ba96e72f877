// Ctrl-C (SIGINT) and SIGTERM where a run cannot stop half-way and keep its work (an
// analysis, a merge: each commits in one transaction): the process ends at once as it
// would anyway, but first clears a progress line left on the terminal and says what the
// stop left, so that a user or a job log is not left guessing (what it left changes when
// the work is committed: work_kept). Outside the object's
// lifetime the signals keep their usual effect.
#pragma once
#include <string>

#include "cli/stop_signals.h"

namespace manicule::cli {

class StopNotice {
 public:
  // `message` is written to stderr as it stands (one line, with its newline); with
  // `clear_line`, a progress line is cleared first. With `remove_store`, the store at that
  // path and the files SQLite keeps beside it are removed first (one this run created,
  // holding nothing yet).
  StopNotice(const std::string& message, bool clear_line, const std::string& remove_store = "");
  ~StopNotice();  // puts back what was there before
  // From here on the work is kept (its transaction committed, the store still closing): a
  // stop then writes `message` instead (one line, with its newline) and removes nothing.
  // (The test hook MANICULE_TEST_PAUSE_AFTER_COMMIT pauses here: test_pause.h.)
  void work_kept(const std::string& message);
  StopNotice(const StopNotice&) = delete;
  StopNotice& operator=(const StopNotice&) = delete;

 private:
  bool clear_line_;
  SavedStopHandlers saved_;
};

// The notice for a stop after `what` ("the merge", "analysis run 4") was committed to
// `store` but before the store was closed: the store holds it, its last writes perhaps still
// in the log beside it (`store`-wal), which the store's next opening takes in.
std::string stored_before_stop_notice(const std::string& what, const std::string& store);

}  // namespace manicule::cli
