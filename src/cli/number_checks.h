// Numbers on the command line, checked where they are read, with messages that name the
// bound plainly. CLI11 2.1 reads "-3" into an unsigned option as 2^64 - 3 (strtoull's
// wrap-around), which then surfaces far from the option, as a vector too large to make or a
// threshold no text reaches; and its PositiveNumber and NonNegativeNumber print the largest
// double in full (309 digits) as the upper end.
#pragma once
#include <CLI/CLI.hpp>

#include "core/whole_number.h"  // parse_digits, for the options read by hand

namespace manicule::cli {

CLI::Validator above_zero();    // a number > 0
CLI::Validator zero_or_more();  // a number >= 0
CLI::Validator at_least_one();  // a whole number >= 1 (with the sign check below)

// Adds to every unsigned option of `app` and its subcommands a check that refuses a sign,
// with a message naming the option (exit code 2, as any other bad value).
void refuse_signs_on_unsigned_options(CLI::App& app);

}  // namespace manicule::cli
