#include "tei/xml_error_text.h"

namespace manicule {

std::string one_line_message(const char* libxml2_message) {
  std::string msg = libxml2_message ? libxml2_message : "malformed XML";
  while (!msg.empty() && (msg.back() == '\n' || msg.back() == ' ')) msg.pop_back();
  for (std::size_t at = msg.find('\n'); at != std::string::npos; at = msg.find('\n', at)) msg.replace(at, 1, "; ");
  return msg;
}

}  // namespace manicule
