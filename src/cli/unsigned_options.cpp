#include "cli/unsigned_options.h"

#include <string>

namespace manicule::cli {

void refuse_signs_on_unsigned_options(CLI::App& app) {
  // CLI11 names the value of every unsigned integer option "UINT" in --help (followed by
  // its range, where it has one).
  const CLI::Validator no_sign(
      [](std::string& value) -> std::string {
        const auto first = value.find_first_not_of(" \t");
        if (first != std::string::npos && (value[first] == '-' || value[first] == '+'))
          return "a whole number of 0 or more is wanted, without a sign; got '" + value + "'";
        return {};
      },
      "", "unsigned");
  for (CLI::Option* option : app.get_options())
    if (option->get_type_name().rfind("UINT", 0) == 0) option->check(no_sign);
  for (CLI::App* command : app.get_subcommands(nullptr)) refuse_signs_on_unsigned_options(*command);
}

}  // namespace manicule::cli
