#include "cli/progress_display.h"

#include <sys/ioctl.h>
#include <unistd.h>

#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <string>

namespace manicule::cli {

namespace {

std::string clock_text(double seconds) {
  long s = static_cast<long>(seconds + 0.5);
  char buf[32];
  if (s >= 3600) std::snprintf(buf, sizeof buf, "%ld:%02ld:%02ld", s / 3600, s / 60 % 60, s % 60);
  else std::snprintf(buf, sizeof buf, "%ld:%02ld", s / 60, s % 60);
  return buf;
}

}  // namespace

namespace {

// A terminal that can take the line back: not one that declares itself without cursor
// control (TERM=dumb, as editors' shells do), where each update would stay on the screen.
bool can_redraw_a_line() {
  const char* term = std::getenv("TERM");
  return isatty(STDERR_FILENO) && !(term && std::strcmp(term, "dumb") == 0);
}

// The terminal's width in columns, 0 when it does not say.
std::size_t terminal_columns() {
  struct winsize size {};
  if (ioctl(STDERR_FILENO, TIOCGWINSZ, &size) != 0) return 0;
  return size.ws_col;
}

}  // namespace

ProgressDisplay::ProgressDisplay(bool quiet)
    : enabled_(!quiet && can_redraw_a_line()), start_(std::chrono::steady_clock::now()) {}

ProgressDisplay::~ProgressDisplay() { clear(); }

bool ProgressDisplay::due(std::chrono::steady_clock::time_point now, bool at_once) {
  if (shown_ && !at_once && now - last_draw_ < std::chrono::milliseconds(200)) return false;
  last_draw_ = now;
  return true;
}

void ProgressDisplay::draw(const std::vector<std::string>& forms) {
  // The fullest form that fits the width less one column (a line that wraps leaves its
  // first rows behind, as the clear before the next takes back the last row alone); the
  // forms shed their parts from the least needed, so that a narrow terminal keeps the share
  // done and the time left whole. Past the last, it is cut. (The lines are ASCII.)
  const std::size_t columns = terminal_columns();
  std::string shown = forms.back();
  for (const std::string& form : forms)
    if (columns <= 1 || form.size() < columns) {
      shown = form;
      break;
    }
  if (columns > 1 && shown.size() >= columns) shown.resize(columns - 1);
  std::fprintf(stderr, "\r\033[K%s", shown.c_str());
  std::fflush(stderr);
  shown_ = true;
}

void ProgressDisplay::update(const store::BatchProgress& p) {
  if (!enabled_) return;
  auto now = std::chrono::steady_clock::now();
  if (!due(now, p.files_done == p.files_total)) return;
  double elapsed = std::chrono::duration<double>(now - start_).count();
  double rate = elapsed > 0 ? static_cast<double>(p.bytes_done) / elapsed : 0;
  std::string left = "--:--";
  if (rate > 0 && p.bytes_done > 0) left = clock_text(static_cast<double>(p.bytes_total - p.bytes_done) / rate);
  char files[48], speed[24], share[8];
  std::snprintf(files, sizeof files, "%zu/%zu files", p.files_done, p.files_total);
  std::snprintf(speed, sizeof speed, "%.1f MB/s", rate / 1e6);
  // The share of the bytes, which the time left is reckoned by; of the files where the
  // files to read are empty (no byte to count).
  const double done = p.bytes_total ? static_cast<double>(p.bytes_done) / static_cast<double>(p.bytes_total)
                      : p.files_total ? static_cast<double>(p.files_done) / static_cast<double>(p.files_total)
                                      : 1.0;
  std::snprintf(share, sizeof share, "%.0f%%", 100.0 * done);
  const std::string time_left = left + " left";
  draw({std::string(files) + "  " + speed + "  " + time_left, std::string(files) + "  " + time_left,
        std::string(share) + "  " + time_left, time_left});
}

void ProgressDisplay::show_step(std::string_view name, double share_done) {
  if (!enabled_) return;
  auto now = std::chrono::steady_clock::now();
  const bool new_step = name != step_;
  if (new_step) {
    step_ = name;
    step_start_ = now;
  }
  if (!due(now, new_step || share_done >= 1)) return;
  const std::string line = "analysis: " + step_;
  if (share_done < 0) {
    draw({line, step_});
    return;
  }
  // The rate so far, once the step has run long enough to have one.
  double elapsed = std::chrono::duration<double>(now - step_start_).count();
  std::string left = "--:--";
  if (share_done >= 1) left = clock_text(0);
  else if (share_done > 0 && elapsed >= 0.5) left = clock_text(elapsed * (1 - share_done) / share_done);
  char share[8];
  std::snprintf(share, sizeof share, "%.0f%%", 100 * share_done);
  const std::string figures = std::string(share) + "  " + left + " left";
  draw({line + "  " + figures, step_ + "  " + figures, figures, share});
}

AnalysisProgress ProgressDisplay::analysis_progress() {
  return [this](std::string_view step, double share_done) { show_step(step, share_done); };
}

void ProgressDisplay::clear() {
  step_.clear();  // a step shown again after a clear is drawn at once
  if (!shown_) return;
  std::fprintf(stderr, "\r\033[K");
  std::fflush(stderr);
  shown_ = false;
}

}  // namespace manicule::cli
