// What a long analysis is doing, for whoever shows progress (the command line draws it on
// a terminal): the step's name, and the share of it done, from 0 to 1, where the step
// can tell, else kShareUnknown. Called on the thread that runs the analysis, at each step's
// start and then as it goes; an empty function is not called.
#pragma once
#include <functional>
#include <string_view>

namespace manicule {

using AnalysisProgress = std::function<void(std::string_view step, double share_done)>;

constexpr double kShareUnknown = -1.0;

// Calls progress when there is one.
inline void report_step(const AnalysisProgress& progress, std::string_view step, double share_done = kShareUnknown) {
  if (progress) progress(step, share_done);
}

}  // namespace manicule
