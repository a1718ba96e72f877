// Options given once per value and repeated for more ("--keep note --keep stage"). A vector
// option left to CLI11's default takes every word after it, so that "--keep note a.xml
// b.xml" read the file names as elements and no file at all.
#pragma once
#include <CLI/CLI.hpp>

namespace manicule::cli {

inline CLI::Option* one_value_each_time(CLI::Option* option) {
  return option->expected(1)->allow_extra_args(false)->multi_option_policy(CLI::MultiOptionPolicy::TakeAll);
}

}  // namespace manicule::cli
