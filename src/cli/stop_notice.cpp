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

// Written by the handler with write(2) alone, which is safe in a signal handler; set before
// the handler is installed and not changed while it is.
char notice_text[1024];
volatile std::sig_atomic_t notice_length = 0;
// The store and the files SQLite keeps beside it, as NUL-terminated paths, to unlink(2)
// (also safe in a signal handler).
constexpr std::size_t kStoreFiles = std::size(store::kStoreFileSuffixes);
char remove_paths[kStoreFiles][4096];
volatile std::sig_atomic_t remove_on_stop = 0;

extern "C" void on_stop(int signal_number) {
  if (remove_on_stop)
    for (const char* path : remove_paths) ::unlink(path);
  if (notice_length) {
    ssize_t ignored = ::write(STDERR_FILENO, notice_text, static_cast<std::size_t>(notice_length));
    (void)ignored;
  }
  // End as the signal would have ended the process: the shell sees 130 or 143.
  struct sigaction plain {};
  plain.sa_handler = SIG_DFL;
  sigemptyset(&plain.sa_mask);
  sigaction(signal_number, &plain, nullptr);
  raise(signal_number);
}

}  // namespace

StopNotice::StopNotice(const std::string& message, bool clear_line, const std::string& remove_store) {
  // The message may hold a path a user gave: its controls shown, not sent to the terminal.
  const std::string text = (clear_line ? "\r\033[K" : "") + escape_controls(message);
  const std::size_t length = std::min(text.size(), sizeof notice_text);
  std::memcpy(notice_text, text.data(), length);
  notice_length = static_cast<std::sig_atomic_t>(length);
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
}

}  // namespace manicule::cli
