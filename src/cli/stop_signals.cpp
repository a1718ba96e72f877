#include "cli/stop_signals.h"

namespace manicule::cli {

SavedStopHandlers install_stop_handler(void (*handler)(int)) {
  SavedStopHandlers saved;
  struct sigaction action {};
  action.sa_handler = handler;
  sigemptyset(&action.sa_mask);
  sigaction(SIGINT, nullptr, &saved.interrupt);
  sigaction(SIGTERM, nullptr, &saved.terminate);
  if (saved.interrupt.sa_handler != SIG_IGN) sigaction(SIGINT, &action, nullptr);
  if (saved.terminate.sa_handler != SIG_IGN) sigaction(SIGTERM, &action, nullptr);
  return saved;
}

void restore_stop_handlers(const SavedStopHandlers& saved) {
  sigaction(SIGINT, &saved.interrupt, nullptr);
  sigaction(SIGTERM, &saved.terminate, nullptr);
}

}  // namespace manicule::cli
