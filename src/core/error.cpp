#include "core/error.h"

namespace manicule {

std::string describe_location(const std::string& file, long line, long column) {
  std::string out = file;
  if (line > 0) {
    out += ":" + std::to_string(line);
    if (column > 0) out += ":" + std::to_string(column);
  }
  return out;
}

static std::string with_location(const std::string& message, const std::string& file,
                                 long line, long column) {
  if (file.empty()) return message;
  return describe_location(file, line, column) + ": " + message;
}

Error::Error(ErrorKind kind, std::string message, std::string file, long line, long column)
    : std::runtime_error(with_location(message, file, line, column)),
      kind_(kind),
      file_(std::move(file)),
      line_(line),
      column_(column) {}

}  // namespace manicule
