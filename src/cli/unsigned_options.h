// Whole non-negative numbers on the command line: CLI11 2.1 reads "-3" into an unsigned
// option as 2^64 - 3 (strtoull's wrap-around), which then surfaces far from the option, as a
// vector too large to make or a threshold no text reaches.
#pragma once
#include <CLI/CLI.hpp>

namespace manicule::cli {

// Adds to every unsigned option of `app` and its subcommands a check that refuses a sign,
// with a message naming the option (exit code 2, as any other bad value).
void refuse_signs_on_unsigned_options(CLI::App& app);

}  // namespace manicule::cli
