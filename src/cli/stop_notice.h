// Ctrl-C (SIGINT) and SIGTERM where a run cannot stop half-way and keep its work (an
// analysis, a merge: each commits in one transaction): the process ends at once as it
// would anyway, but first clears a progress line left on the terminal and says what the
// stop left, so that a user or a job log is not left guessing. Outside the object's
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
  StopNotice(const StopNotice&) = delete;
  StopNotice& operator=(const StopNotice&) = delete;

 private:
  SavedStopHandlers saved_;
};

}  // namespace manicule::cli
