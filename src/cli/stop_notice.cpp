#include "cli/stop_notice.h"

#include <unistd.h>

#include <algorithm>
#include <cstring>

namespace manicule::cli {

namespace {

// Written by the handler with write(2) alone, which is safe in a signal handler; set before
// the handler is installed and not changed while it is.
char notice_text[1024];
std::size_t notice_length = 0;
// The store and its log, shared memory and journal, as NUL-terminated paths, to unlink(2)
// (also safe in a signal handler); empty when nothing is to go.
constexpr const char* kStoreSuffixes[] = {"", "-wal", "-shm", "-journal"};
char remove_paths[4][4096];
bool remove_on_stop = false;

extern "C" void on_stop(int signal_number) {
  if (remove_on_stop)
    for (const char* path : remove_paths) ::unlink(path);
  if (notice_length) {
    ssize_t ignored = ::write(STDERR_FILENO, notice_text, notice_length);
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
  const std::string text = (clear_line ? "\r\033[K" : "") + message;
  notice_length = std::min(text.size(), sizeof notice_text);
  std::memcpy(notice_text, text.data(), notice_length);
  remove_on_stop = !remove_store.empty() && remove_store.size() + 9 < sizeof remove_paths[0];
  if (remove_on_stop)
    for (std::size_t i = 0; i < 4; ++i) {
      const std::string path = remove_store + kStoreSuffixes[i];
      std::memcpy(remove_paths[i], path.c_str(), path.size() + 1);
    }
  saved_ = install_stop_handler(on_stop);
}

StopNotice::~StopNotice() {
  restore_stop_handlers(saved_);
  remove_on_stop = false;
}

}  // namespace manicule::cli
