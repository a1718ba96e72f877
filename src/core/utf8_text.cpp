#include "core/utf8_text.h"

#include <unicode/utf8.h>

#include <cstdint>

namespace manicule {

std::string well_formed_utf8(std::string_view bytes) {
  const auto length = static_cast<int32_t>(bytes.size());
  std::string out;
  out.reserve(bytes.size());
  for (int32_t i = 0; i < length;) {
    const int32_t start = i;
    UChar32 c = 0;
    U8_NEXT(bytes.data(), i, length, c);
    if (c < 0) {
      out += "\xEF\xBF\xBD";  // U+FFFD for the maximal subpart U8_NEXT skipped
    } else {
      out.append(bytes.data() + start, static_cast<std::size_t>(i - start));
    }
  }
  return out;
}

std::string json_text(const nlohmann::json& value, int indent) {
  return value.dump(indent, ' ', false, nlohmann::json::error_handler_t::replace);
}

}  // namespace manicule
