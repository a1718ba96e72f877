// Checks of number options whose messages state the bound plainly: CLI11's PositiveNumber
// and NonNegativeNumber print the largest double in full (309 digits) as the upper end.
#pragma once
#include <CLI/CLI.hpp>

namespace manicule::cli {

CLI::Validator above_zero();    // a number > 0
CLI::Validator zero_or_more();  // a number >= 0

}  // namespace manicule::cli
