#include "cli/stop_notice.h"

#include <unistd.h>

#include <algorithm>
#include <csignal>
#include <cstring>
#include <iterator>

#include "cli/message_stream.h"
#include "store/store_schema.h"

namespace manicule::cli {

namespace {

// Written by the handler with write(2) alone, which is safe in a signal handler. Two texts:
// the one before the work is kept, and the one after; each is set before the handler can
// read it (the first before the handler is installed, the second before `kept_notice` says
// to use it) and not changed while it may be read.
char notice_text[2][1024];
volatile std::sig_atomic_t notice_length[2] = {0, 0};
volatile std::sig_atomic_t kept_notice = 0;
// The store and the files SQLite keeps beside it, as NUL-terminated paths, to unlink(2)
// (also safe in a signal handler).
constexpr std::size_t kStoreFiles = std::size(store::kStoreFileSuffixes);
char remove_paths[kStoreFiles][4096];
volatile std::sig_atomic_t remove_on_stop = 0;

extern "C" void on_stop(int signal_number) {
  if (remove_on_stop)
    for (const char* path : remove_paths) ::unlink(path);
  const int which = kept_notice ? 1 : 0;
  if (notice_length[which]) {
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

// Fills notice text `which` with `message`, after a line clear if asked.
void set_notice(int which, const std::string& message, bool clear_line) {
  // The message may hold a path a user gave: its controls shown, not sent to the terminal.
  const std::string text = (clear_line ? "\r\033[K" : "") + escape_controls(message);
  const std::size_t length = std::min(text.size(), sizeof notice_text[which]);
  std::memcpy(notice_text[which], text.data(), length);
  notice_length[which] = static_cast<std::sig_atomic_t>(length);
}

}  // namespace

StopNotice::StopNotice(const std::string& message, bool clear_line, const std::string& remove_store)
    : clear_line_(clear_line) {
  kept_notice = 0;
  set_notice(0, message, clear_line);
  // (A path too long to hold here is left; no store path comes near 4 KiB.)
  const bool removes = !remove_store.empty() && remove_store.size() + 16 < sizeof remove_paths[0];
  if (removes)
    for (std::size_t i = 0; i < kStoreFiles; ++i) {
      const std::string path = remove_store + store::kStoreFileSuffixes[i];
      std::memcpy(remove_paths[i], path.c_str(), path.size() + 1);
    }
  remove_on_stop = removes ? 1 : 0;
  saved_ = install_stop_handler(on_stop);
}

StopNotice::~StopNotice() {
  restore_stop_handlers(saved_);
  remove_on_stop = 0;
  kept_notice = 0;
}

void StopNotice::work_kept(const std::string& message) {
  remove_on_stop = 0;  // the store now holds the work
  set_notice(1, message, clear_line_);
  kept_notice = 1;
}

std::string stored_before_stop_notice(const std::string& what, const std::string& store) {
  return "manicule: interrupted after " + what + " was stored: " + store + " holds it, its last writes perhaps still in " +
         store + "-wal beside it, which the store's next opening takes in (keep the two together)\n";
}

}  // namespace manicule::cli
