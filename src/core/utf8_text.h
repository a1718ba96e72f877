// Text that must be well-formed UTF-8 (JSON strings, XML attribute values, segment ids)
// but may come from bytes that are not: file names on Linux are bytes, and an old archive's
// may be in Latin-1 ("caf\xe9.xml"). Ill-formed sequences become U+FFFD, the replacement
// character (Unicode 15.0, section 3.9, "U+FFFD Substitution of Maximal Subparts", as ICU's
// U8_NEXT finds them); well-formed text comes back unchanged.
#pragma once
#include <string>
#include <string_view>

#include <nlohmann/json.hpp>

namespace manicule {

std::string well_formed_utf8(std::string_view bytes);

// JSON text of `value` (indented by `indent` spaces, or on one line for -1) with any string
// that is not well-formed UTF-8 written with U+FFFD where nlohmann::json would throw.
std::string json_text(const nlohmann::json& value, int indent = -1);

}  // namespace manicule
