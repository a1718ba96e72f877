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

CLI::Validator at_least_one() {
  return CLI::Validator(
      [](std::string& text) -> std::string {  // all zeros ("0", "00") is 0; signs are refused apart
        return !text.empty() && text.find_first_not_of('0') == std::string::npos ? "must be 1 or more" : "";
      },
      "");
}

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
