#include "cli/message_stream.h"

#include <cstdio>
#include <iostream>

namespace manicule::cli {

namespace {

bool is_c0_or_del(unsigned char c) { return (c < 0x20 && c != '\n' && c != '\t') || c == 0x7f; }
bool is_c1_follower(unsigned char c) { return c >= 0x80 && c <= 0x9f; }  // after C2: U+0080-U+009F

std::string shown(std::string_view bytes) {
  std::string out;
  char escaped[5];
  for (unsigned char c : bytes) {
    std::snprintf(escaped, sizeof escaped, "\\x%02x", c);
    out += escaped;
  }
  return out;
}

}  // namespace

std::string escape_controls(std::string_view text) {
  std::string out;
  for (std::size_t i = 0; i < text.size(); ++i) {
    const auto c = static_cast<unsigned char>(text[i]);
    if (is_c0_or_del(c)) {
      out += shown(text.substr(i, 1));
    } else if (c == 0xc2 && i + 1 < text.size() && is_c1_follower(static_cast<unsigned char>(text[i + 1]))) {
      out += shown(text.substr(i, 2));
      ++i;
    } else {
      out += text[i];
    }
  }
  return out;
}

ControlCharacterEscaper::int_type ControlCharacterEscaper::overflow(int_type c) {
  if (traits_type::eq_int_type(c, traits_type::eof())) return traits_type::not_eof(c);
  const char ch = traits_type::to_char_type(c);
  return xsputn(&ch, 1) == 1 ? c : traits_type::eof();
}

// A C2 that ends one write is held back, as the first byte of the next decides whether it
// begins a C1 control.
std::streamsize ControlCharacterEscaper::xsputn(const char* s, std::streamsize n) {
  std::string text = pending_c2_ ? "\xc2" : "";
  text.append(s, static_cast<std::size_t>(n));
  pending_c2_ = !text.empty() && text.back() == '\xc2';
  if (pending_c2_) text.pop_back();
  const std::string out = escape_controls(text);
  const auto size = static_cast<std::streamsize>(out.size());
  return out_->sputn(out.data(), size) == size ? n : 0;
}

int ControlCharacterEscaper::sync() {
  if (pending_c2_) {
    pending_c2_ = false;
    out_->sputc('\xc2');
  }
  return out_->pubsync();
}

EscapedStderr::EscapedStderr() : original_(std::cerr.rdbuf()), escaper_(original_) { std::cerr.rdbuf(&escaper_); }

EscapedStderr::~EscapedStderr() {
  std::cerr.flush();
  std::cerr.rdbuf(original_);
}

}  // namespace manicule::cli
