// Whole numbers as a user or a record spells them: digits only, all of them.
#pragma once
#include <charconv>
#include <string_view>
#include <system_error>

namespace manicule {

// `digits` as a whole number in `out`: digits only, all of them (std::stoul would take
// "1000x" as 1000, " 5" as 5 and "-1" as 2^64 - 1). False if they are not, or overflow.
template <typename Unsigned>
bool parse_digits(std::string_view digits, Unsigned& out) {
  const char* end = digits.data() + digits.size();
  const auto [stop, ec] = std::from_chars(digits.data(), end, out);
  return !digits.empty() && ec == std::errc() && stop == end;
}

}  // namespace manicule
