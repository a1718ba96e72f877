// UTF-8 in and out, one code point at a time, for the byte-level XML code (the scanner's
// references, character references for legacy encodings, UTF-16 conversion). Input is
// assumed to be UTF-8 already checked by the XML parser; a stray byte reads as itself.
#pragma once
#include <cstddef>
#include <string>
#include <string_view>

namespace manicule {

inline void append_utf8(std::string& out, unsigned long cp) {
  if (cp < 0x80) {
    out += static_cast<char>(cp);
  } else if (cp < 0x800) {
    out += static_cast<char>(0xC0 | (cp >> 6));
    out += static_cast<char>(0x80 | (cp & 0x3F));
  } else if (cp < 0x10000) {
    out += static_cast<char>(0xE0 | (cp >> 12));
    out += static_cast<char>(0x80 | ((cp >> 6) & 0x3F));
    out += static_cast<char>(0x80 | (cp & 0x3F));
  } else {
    out += static_cast<char>(0xF0 | (cp >> 18));
    out += static_cast<char>(0x80 | ((cp >> 12) & 0x3F));
    out += static_cast<char>(0x80 | ((cp >> 6) & 0x3F));
    out += static_cast<char>(0x80 | (cp & 0x3F));
  }
}

// Decodes the sequence at s[i] into cp and returns its length in bytes.
inline std::size_t next_utf8(std::string_view s, std::size_t i, unsigned long& cp) {
  auto c = static_cast<unsigned char>(s[i]);
  std::size_t len = c < 0x80 ? 1 : (c >> 5) == 0x6 ? 2 : (c >> 4) == 0xE ? 3 : (c >> 3) == 0x1E ? 4 : 1;
  if (i + len > s.size()) len = 1;
  cp = len == 1 ? c : (c & (0xFF >> (len + 1)));
  for (std::size_t k = 1; k < len; ++k) cp = (cp << 6) | (static_cast<unsigned char>(s[i + k]) & 0x3F);
  return len;
}

}  // namespace manicule
