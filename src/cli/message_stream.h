// What the program says on stderr (std::cerr) shows a control character written in a file
// name or an edition's text as "\x1b" rather than sending it to the terminal: a name
// holding ESC [ 2 K and a carriage return wiped the "failed:" before it. The controls are
// C0 (below 0x20) but line ends and tabs, DEL (0x7f), and C1 (U+0080-U+009F, in UTF-8
// C2 80-C2 9F; U+009B is CSI to many terminals), shown by their bytes. (The progress line
// draws its own controls with stdio, not through std::cerr.)
#pragma once
#include <streambuf>
#include <string>
#include <string_view>

namespace manicule::cli {

// `text` with its controls shown as above.
std::string escape_controls(std::string_view text);

class ControlCharacterEscaper : public std::streambuf {
 public:
  explicit ControlCharacterEscaper(std::streambuf* out) : out_(out) {}

 protected:
  int_type overflow(int_type c) override;
  std::streamsize xsputn(const char* s, std::streamsize n) override;
  int sync() override;

 private:
  std::streambuf* out_;
  bool pending_c2_ = false;  // a C2 byte written last, whose follower decides
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
