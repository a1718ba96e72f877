#include "cli/message_stream.h"

#include <cstdio>
#include <iostream>

namespace manicule::cli {

namespace {

bool passes(unsigned char c) { return c >= 0x20 || c == '\n' || c == '\t'; }

}  // namespace

ControlCharacterEscaper::int_type ControlCharacterEscaper::overflow(int_type c) {
  if (traits_type::eq_int_type(c, traits_type::eof())) return traits_type::not_eof(c);
  const char ch = traits_type::to_char_type(c);
  return xsputn(&ch, 1) == 1 ? c : traits_type::eof();
}

std::streamsize ControlCharacterEscaper::xsputn(const char* s, std::streamsize n) {
  std::streamsize start = 0;
  for (std::streamsize i = 0; i < n; ++i) {
    const auto c = static_cast<unsigned char>(s[i]);
    if (passes(c)) continue;
    if (out_->sputn(s + start, i - start) != i - start) return start;
    char escaped[5];
    std::snprintf(escaped, sizeof escaped, "\\x%02x", c);
    if (out_->sputn(escaped, 4) != 4) return i;
    start = i + 1;
  }
  if (out_->sputn(s + start, n - start) != n - start) return start;
  return n;
}

EscapedStderr::EscapedStderr() : original_(std::cerr.rdbuf()), escaper_(original_) { std::cerr.rdbuf(&escaper_); }

EscapedStderr::~EscapedStderr() {
  std::cerr.flush();
  std::cerr.rdbuf(original_);
}

}  // namespace manicule::cli
