// Errors: one exception type inside the library, carrying a kind (which maps to a process
// exit code and an ABI status) and, where known, the file, line and column at fault.
// Faces (cli/, plugin_api/) catch it; it never crosses the C ABI.
#pragma once
#include <stdexcept>
#include <string>

namespace manicule {

enum class ErrorKind {
  usage = 2,             // the request itself is wrong (unknown option value, bad range)
  bad_input = 3,         // an input file is unreadable, malformed, hostile or not TEI
  nothing_selected = 4,  // the selection found no text to work on
  write_failed = 5,      // an output could not be written; the original is untouched
  changed_on_disk = 6,   // the edition changed between reading and writing
  internal = 70,         // a bug: please report
};

class Error : public std::runtime_error {
 public:
  Error(ErrorKind kind, std::string message, std::string file = {}, long line = 0,
        long column = 0);
  ErrorKind kind() const { return kind_; }
  const std::string& file() const { return file_; }
  long line() const { return line_; }
  long column() const { return column_; }

 private:
  ErrorKind kind_;
  std::string file_;
  long line_;
  long column_;
};

// "file:line:column: message", leaving out the parts that are unknown.
std::string describe_location(const std::string& file, long line, long column);

}  // namespace manicule
