// Progress of a batch run on the terminal: files done of all, MB/s and the time left,
// redrawn in place on stderr at most a few times a second. Silent when stderr is not a
// terminal (logs and job outputs stay clean) or when the user asked for --quiet.
#pragma once
#include <chrono>
#include <cstddef>

#include "store/batch_run.h"

namespace manicule::cli {

class ProgressDisplay {
 public:
  explicit ProgressDisplay(bool quiet);
  ~ProgressDisplay();
  void update(const store::BatchProgress& progress);
  // Clears the line (before other output, and at the end).
  void clear();

 private:
  bool enabled_;
  bool shown_ = false;
  std::chrono::steady_clock::time_point start_;
  std::chrono::steady_clock::time_point last_draw_;
};

}  // namespace manicule::cli
