#include "cli/text_checks.h"

#include <string>

namespace manicule::cli {

CLI::Validator not_blank() {
  return CLI::Validator(
      [](std::string& value) -> std::string {
        if (value.find_first_not_of(" \t\r\n") == std::string::npos) return "an empty value is not allowed";
        return {};
      },
      // No description of its own: CLI11 would show it after the type, as "TEXT:TEXT".
      "");
}

}  // namespace manicule::cli
