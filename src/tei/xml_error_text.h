// libxml2's error messages as one line: it ends them with a newline and puts some details
// on a line of their own ("...indicate encoding !\nBytes: 0xE9 0x20"), which would split a
// log line and a stored error.
#pragma once
#include <string>

namespace manicule {

std::string one_line_message(const char* libxml2_message);  // "malformed XML" for none

}  // namespace manicule
