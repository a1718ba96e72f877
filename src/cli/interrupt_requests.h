// Ctrl-C (SIGINT) and SIGTERM while a batch run reads files: the first asks the run to stop
// after the file it is storing, so that everything stored so far is kept and the run is
// recorded as interrupted; a second one ends the process at once, as it would without this. Outside
// the object's lifetime the signals keep their usual effect.
#pragma once
#include "cli/stop_signals.h"

namespace manicule::cli {

class InterruptRequests {
 public:
  InterruptRequests();   // installs the handlers
  ~InterruptRequests();  // puts back what was there before
  InterruptRequests(const InterruptRequests&) = delete;
  InterruptRequests& operator=(const InterruptRequests&) = delete;

  bool requested() const;
  // What a shell reports for a process ended by that signal: 130 for SIGINT, 143 for SIGTERM.
  int exit_code() const;

 private:
  SavedStopHandlers saved_;
};

}  // namespace manicule::cli
