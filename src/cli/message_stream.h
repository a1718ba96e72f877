// What the program says on stderr (std::cerr) shows a control character written in a file
// name or an edition's text as "\x1b" rather than sending it to the terminal: a name
// holding ESC [ 2 K and a carriage return wiped the "failed:" before it. Line ends and tabs
// pass. (The progress line draws its own controls with stdio, not through std::cerr.)
#pragma once
#include <streambuf>

namespace manicule::cli {

class ControlCharacterEscaper : public std::streambuf {
 public:
  explicit ControlCharacterEscaper(std::streambuf* out) : out_(out) {}

 protected:
  int_type overflow(int_type c) override;
  std::streamsize xsputn(const char* s, std::streamsize n) override;
  int sync() override { return out_->pubsync(); }

 private:
  std::streambuf* out_;
};

// Puts the escaper in front of std::cerr for its lifetime.
class EscapedStderr {
 public:
  EscapedStderr();
  ~EscapedStderr();
  EscapedStderr(const EscapedStderr&) = delete;
  EscapedStderr& operator=(const EscapedStderr&) = delete;

 private:
  std::streambuf* original_;
  ControlCharacterEscaper escaper_;
};

}  // namespace manicule::cli
