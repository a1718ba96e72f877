#include "cli/stop_notice.h"

#include <unistd.h>

#include <algorithm>
#include <atomic>
#include <csignal>
#include <cstring>
#include <iterator>

#include "cli/message_stream.h"
#include "cli/test_pause.h"
#include "store/store_schema.h"

namespace manicule::cli {

namespace {

// Written by the handler with write(2) alone, which is safe in a signal handler. Two texts:
// the one before the work is kept, and the one after; each is set before the handler can
// read it (the first before the handler is installed, the second before `kept_notice` says
// to use it) and not changed while it may be read.
char notice_text[2][1024];
std::size_t notice_length[2] = {0, 0};
// The store and the files SQLite keeps beside it, as NUL-terminated paths, to unlink(2)
// (also safe in a signal handler).
constexpr std::size_t kStoreFiles = std::size(store::kStoreFileSuffixes);
char remove_paths[kStoreFiles][4096];
bool remove_on_stop = false;
// What a stop finds, read once by the handler (which may run on any thread): 0 none, 1 the
// work not kept (text 0, and the removal if asked), 2 the work kept (text 1, nothing
// removed). Stored with release after the text and paths it points to are written.
std::atomic<int> phase{0};
static_assert(std::atomic<int>::is_always_lock_free, "the handler reads it");

extern "C" void on_stop(int signal_number) {
  const int now = phase.load(std::memory_order_acquire);
  if (now == 1 && remove_on_stop)
    for (const char* path : remove_paths) ::unlink(path);
  const int which = now == 2 ? 1 : 0;
  if (now && notice_length[which]) {
    ssize_t ignored = ::write(STDERR_FILENO, notice_text[which], static_cast<std::size_t>(notice_length[which]));
    (void)ignored;
  }
  // End as the signal would have ended the process: the shell sees 130 or 143.
  struct sigaction plain {};
  plain.sa_handler = SIG_DFL;
  sigemptyset(&plain.sa_mask);
  sigaction(signal_number, &plain, nullptr);
  raise(signal_number);
}

// Fills notice text `which` with `message`, after a line clear if asked; one too long
// for the buffer is cut, and still ends its line.
void set_notice(int which, const std::string& message, bool clear_line) {
  // The message may hold a path a user gave: its controls shown, not sent to the terminal.
  std::string text = (clear_line ? "\r\033[K" : "") + escape_controls(message);
  if (text.size() > sizeof notice_text[which]) {
    text.resize(sizeof notice_text[which]);
    text.back() = '\n';
  }
  std::memcpy(notice_text[which], text.data(), text.size());
  notice_length[which] = text.size();
}

}  // namespace

StopNotice::StopNotice(const std::string& message, bool clear_line, const std::string& remove_store)
    : clear_line_(clear_line) {
  phase.store(0, std::memory_order_release);
  set_notice(0, message, clear_line);
  // (A path too long to hold here is left; no store path comes near 4 KiB.)
  const bool removes = !remove_store.empty() && remove_store.size() + 16 < sizeof remove_paths[0];
  if (removes)
    for (std::size_t i = 0; i < kStoreFiles; ++i) {
      const std::string path = remove_store + store::kStoreFileSuffixes[i];
      std::memcpy(remove_paths[i], path.c_str(), path.size() + 1);
    }
  remove_on_stop = removes;
  phase.store(1, std::memory_order_release);
  saved_ = install_stop_handler(on_stop);
}

StopNotice::~StopNotice() {
  restore_stop_handlers(saved_);
  phase.store(0, std::memory_order_release);
}

void StopNotice::work_kept(const std::string& message) {
  set_notice(1, message, clear_line_);
  phase.store(2, std::memory_order_release);  // from here a stop removes nothing: the store holds the work
  pause_for_tests("MANICULE_TEST_PAUSE_AFTER_COMMIT", "after committing");
}

std::string stored_before_stop_notice(const std::string& what, const std::string& store) {
  return "manicule: interrupted after " + what + " was stored: " + store + " holds it, its last writes perhaps still in " +
         store + "-wal beside it, which the store's next opening takes in (keep the two together)\n";
}

}  // namespace manicule::cli
