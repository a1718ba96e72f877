#include "standoff/edition_encoding.h"

#include <algorithm>
#include <cctype>

#include "core/error.h"
#include "standoff/utf8_codec.h"

namespace manicule {

namespace {

unsigned unit_at(std::string_view s, std::size_t i, bool little) {
  auto b0 = static_cast<unsigned char>(s[i]);
  auto b1 = static_cast<unsigned char>(s[i + 1]);
  return little ? (b0 | (b1 << 8)) : ((b0 << 8) | b1);
}

void put_unit(std::string& out, unsigned u, bool little) {
  char lo = static_cast<char>(u & 0xFF), hi = static_cast<char>((u >> 8) & 0xFF);
  if (little) {
    out += lo;
    out += hi;
  } else {
    out += hi;
    out += lo;
  }
}

std::string utf16_to_utf8(std::string_view s, bool little, const std::string& name) {
  if (s.size() % 2) throw Error(ErrorKind::bad_input, "UTF-16 file with an odd number of bytes", name);
  std::string out;
  out.reserve(s.size());
  for (std::size_t i = 0; i < s.size(); i += 2) {
    unsigned u = unit_at(s, i, little);
    unsigned long cp = u;
    if (u >= 0xD800 && u <= 0xDBFF && i + 3 < s.size()) {
      unsigned low = unit_at(s, i + 2, little);
      if (low >= 0xDC00 && low <= 0xDFFF) {
        cp = 0x10000 + ((static_cast<unsigned long>(u) - 0xD800) << 10) + (low - 0xDC00);
        i += 2;
      }
    }
    if (cp >= 0xD800 && cp <= 0xDFFF)
      throw Error(ErrorKind::bad_input, "UTF-16 file with an unpaired surrogate; nothing was written", name);
    append_utf8(out, cp);
  }
  return out;
}

std::string utf8_to_utf16(std::string_view s, bool little) {
  std::string out;
  out.reserve(s.size() * 2);
  for (std::size_t i = 0; i < s.size();) {
    unsigned long cp = 0;
    i += next_utf8(s, i, cp);
    if (cp >= 0x10000) {
      cp -= 0x10000;
      put_unit(out, static_cast<unsigned>(0xD800 + (cp >> 10)), little);
      put_unit(out, static_cast<unsigned>(0xDC00 + (cp & 0x3FF)), little);
    } else {
      put_unit(out, static_cast<unsigned>(cp), little);
    }
  }
  return out;
}

std::string lower(std::string s) {
  std::transform(s.begin(), s.end(), s.begin(), [](unsigned char c) { return static_cast<char>(std::tolower(c)); });
  return s;
}

}  // namespace

EditionText decode_edition(std::string_view raw, const std::string& name) {
  EditionText e;
  std::string_view body = raw;
  if (raw.size() >= 2 && static_cast<unsigned char>(raw[0]) == 0xFF && static_cast<unsigned char>(raw[1]) == 0xFE) {
    e.form = ByteForm::utf16le;
    e.bom = std::string(raw.substr(0, 2));
    body = raw.substr(2);
  } else if (raw.size() >= 2 && static_cast<unsigned char>(raw[0]) == 0xFE &&
             static_cast<unsigned char>(raw[1]) == 0xFF) {
    e.form = ByteForm::utf16be;
    e.bom = std::string(raw.substr(0, 2));
    body = raw.substr(2);
  } else if (raw.size() >= 4 && raw[0] == '<' && raw[1] == '\0' && raw[2] != '\0' && raw[3] == '\0') {
    e.form = ByteForm::utf16le;  // "<?" without a byte-order mark (XML 1.0, appendix F.1)
  } else if (raw.size() >= 4 && raw[0] == '\0' && raw[1] == '<' && raw[2] == '\0' && raw[3] != '\0') {
    e.form = ByteForm::utf16be;
  }
  if (e.form == ByteForm::utf8) {
    e.text = std::string(raw);
    return e;
  }
  bool little = e.form == ByteForm::utf16le;
  e.text = utf16_to_utf8(body, little, name);
  if (utf8_to_utf16(e.text, little) != body)
    throw Error(ErrorKind::bad_input, "this UTF-16 file cannot be converted and back without a change; nothing "
                                      "was written (use --standoff-file)", name);
  return e;
}

std::string encode_edition(const EditionText& how, std::string_view text) {
  if (how.form == ByteForm::utf8) return std::string(text);
  return how.bom + utf8_to_utf16(text, how.form == ByteForm::utf16le);
}

bool needs_ascii_insertions(const std::string& declared_encoding, ByteForm form, const std::string& name) {
  std::string enc = lower(declared_encoding);
  if (form != ByteForm::utf8) {
    if (enc.empty() || enc.rfind("utf-16", 0) == 0 || enc == "utf16" || enc == "ucs-2") return false;
    throw Error(ErrorKind::bad_input, "the file is UTF-16 but declares encoding \"" + declared_encoding +
                                          "\"; nothing was written", name);
  }
  if (enc.empty() || enc == "utf-8" || enc == "utf8") return false;
  bool legacy = enc.rfind("iso-8859-", 0) == 0 || enc.rfind("iso8859-", 0) == 0 || enc.rfind("windows-125", 0) == 0 ||
                enc.rfind("cp125", 0) == 0 || enc == "latin1" || enc == "latin-1" || enc == "us-ascii" ||
                enc == "ascii";
  if (legacy) return true;
  throw Error(ErrorKind::bad_input, "results cannot be written into a file in the encoding \"" + declared_encoding +
                                        "\"; manicule writes into UTF-8, UTF-16 and single-byte ASCII-compatible "
                                        "encodings only (use --standoff-file); nothing was written", name);
}

}  // namespace manicule
