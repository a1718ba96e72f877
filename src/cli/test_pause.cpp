#include "cli/test_pause.h"

#include <chrono>
#include <cstdlib>
#include <iostream>
#include <thread>

namespace manicule::cli {

void pause_for_tests(const char* variable, const char* moment) {
  const char* seconds = std::getenv(variable);
  if (!seconds) return;
  const double s = std::strtod(seconds, nullptr);
  if (s <= 0) return;
  std::cerr << "manicule: pausing " << moment << " (" << variable << ")" << std::endl;
  std::this_thread::sleep_for(std::chrono::duration<double>(s));
}

}  // namespace manicule::cli
