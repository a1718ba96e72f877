#include "cli/number_checks.h"

#include <cmath>
#include <cstdlib>
#include <string>

namespace manicule::cli {

namespace {

// The value read as CLI11 reads a double; false if it is not one (CLI11 then says so).
bool as_number(const std::string& text, double& value) {
  char* end = nullptr;
  value = std::strtod(text.c_str(), &end);
  return !text.empty() && end == text.c_str() + text.size() && std::isfinite(value);
}

}  // namespace

CLI::Validator above_zero() {
  return CLI::Validator(
      [](std::string& text) -> std::string {
        double v = 0;
        if (!as_number(text, v)) return "a number is wanted; got '" + text + "'";
        return v > 0 ? std::string() : "must be greater than 0; got " + text;
      },
      "POSITIVE");
}

CLI::Validator zero_or_more() {
  return CLI::Validator(
      [](std::string& text) -> std::string {
        double v = 0;
        if (!as_number(text, v)) return "a number is wanted; got '" + text + "'";
        return v >= 0 ? std::string() : "must be 0 or more; got " + text;
      },
      "NONNEGATIVE");
}

}  // namespace manicule::cli
