// Handlers for the two signals that ask a run to stop, SIGINT (Ctrl-C) and SIGTERM (a
// cluster's time limit), installed together and put back together. A signal that was
// ignored when the program started (a background job of a shell without job control
// ignores SIGINT) stays ignored.
#pragma once
#include <csignal>

namespace manicule::cli {

struct SavedStopHandlers {
  struct sigaction interrupt {};
  struct sigaction terminate {};
};

SavedStopHandlers install_stop_handler(void (*handler)(int));
void restore_stop_handlers(const SavedStopHandlers& saved);

}  // namespace manicule::cli
