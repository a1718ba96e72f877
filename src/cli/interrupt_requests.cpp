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
  struct sigaction handler {};
  handler.sa_handler = on_stop_signal;
  sigemptyset(&handler.sa_mask);
  sigaction(SIGINT, nullptr, &previous_interrupt_);
  sigaction(SIGTERM, nullptr, &previous_terminate_);
  // A signal ignored when the program started (a background job of a shell without job
  // control ignores SIGINT) stays ignored.
  if (previous_interrupt_.sa_handler != SIG_IGN) sigaction(SIGINT, &handler, nullptr);
  if (previous_terminate_.sa_handler != SIG_IGN) sigaction(SIGTERM, &handler, nullptr);
}

InterruptRequests::~InterruptRequests() {
  sigaction(SIGINT, &previous_interrupt_, nullptr);
  sigaction(SIGTERM, &previous_terminate_, nullptr);
}

bool InterruptRequests::requested() const { return stop_signal.load() != 0; }

int InterruptRequests::exit_code() const { return 128 + stop_signal.load(); }

}  // namespace manicule::cli
