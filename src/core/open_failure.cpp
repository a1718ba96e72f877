#include "core/open_failure.h"

#include <cerrno>
#include <cstring>
#include <filesystem>

namespace manicule {

std::string open_failure_reason(const std::string& path, int error_number) {
  std::string reason = std::strerror(error_number);
  if (error_number != ENOENT) return reason;
  std::error_code ec;
  if (!std::filesystem::is_symlink(std::filesystem::symlink_status(path, ec)) || ec) return reason;
  const std::filesystem::path target = std::filesystem::read_symlink(path, ec);
  if (ec) return reason;
  return "a symbolic link to " + target.string() + ", which does not exist";
}

}  // namespace manicule
