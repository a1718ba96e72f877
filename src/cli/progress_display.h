// Progress on the terminal: of a batch run, files done of all, MB/s and the time left; of
// an analysis, its step and, where the step can tell, the share done and the time left.
// Redrawn in place on stderr at most a few times a second (a new step at once). Silent
// when stderr is not a terminal (logs and job outputs stay clean) or when the user asked
// for --quiet.
#pragma once
#include <chrono>
#include <cstddef>
#include <string>
#include <string_view>
#include <vector>

#include "core/analysis_progress.h"
#include "store/batch_run.h"

namespace manicule::cli {

class ProgressDisplay {
 public:
  explicit ProgressDisplay(bool quiet);
  ~ProgressDisplay();
  void update(const store::BatchProgress& progress);
  // An analysis' step (core/analysis_progress.h).
  void show_step(std::string_view name, double share_done);
  // show_step as an analysis' progress function; the display must outlive its use.
  AnalysisProgress analysis_progress();
  // Clears the line (before other output, and at the end).
  void clear();
  // Whether it draws at all (a terminal, not --quiet).
  bool enabled() const { return enabled_; }

 private:
  // Whether to draw now: at once, or 200 ms after the last drawing.
  bool due(std::chrono::steady_clock::time_point now, bool at_once);
  // Over the line drawn before: the first of `forms` (fullest first) that fits the terminal.
  void draw(const std::vector<std::string>& forms);

  bool enabled_;
  bool shown_ = false;
  std::chrono::steady_clock::time_point start_;
  std::chrono::steady_clock::time_point last_draw_;
  std::string step_;
  std::chrono::steady_clock::time_point step_start_;
};

}  // namespace manicule::cli
