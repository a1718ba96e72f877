// Text values on the command line. An empty value ("--author ''", as a script's unset
// variable gives) was taken for no option at all: a filter then filtered nothing, and the
// whole store was analysed under the sub-corpus' name.
#pragma once
#include <CLI/CLI.hpp>

namespace manicule::cli {

CLI::Validator not_blank();  // refuses a value that is empty or white space alone

}  // namespace manicule::cli
