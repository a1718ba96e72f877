#include "cli/interrupt_requests.h"

#include <atomic>

namespace manicule::cli {

namespace {

// A lock-free atomic: safe to set in a signal handler, which may run on any of the run's
// threads, and to read on another (a volatile sig_atomic_t is safe within one thread only).
std::atomic<int> stop_signal{0};  // the signal that asked, 0 if none
static_assert(std::atomic<int>::is_always_lock_free);

extern "C" void on_stop_signal(int signal_number) {
  stop_signal.store(signal_number);
  // The next one ends the process: sigaction is async-signal-safe.
  struct sigaction plain {};
  plain.sa_handler = SIG_DFL;
  sigemptyset(&plain.sa_mask);
  sigaction(SIGINT, &plain, nullptr);
  sigaction(SIGTERM, &plain, nullptr);
}

}  // namespace

InterruptRequests::InterruptRequests() {
  stop_signal.store(0);
  saved_ = install_stop_handler(on_stop_signal);
}

InterruptRequests::~InterruptRequests() { restore_stop_handlers(saved_); }

bool InterruptRequests::requested() const { return stop_signal.load() != 0; }

int InterruptRequests::exit_code() const { return 128 + stop_signal.load(); }

}  // namespace manicule::cli
