// Test hooks: pauses at a named moment of a run, so that a test can act then (change a
// file, send a stop) and see what the program does. Each is off unless its environment
// variable holds a number of seconds; only tests/cli set them.
#pragma once

namespace manicule::cli {

// Waits the seconds `variable` holds (if any, and above 0), saying so on stderr with
// `moment` ("before writing"), so that a test reading stderr knows the pause has begun.
void pause_for_tests(const char* variable, const char* moment);

}  // namespace manicule::cli
