#include "core/regular_file.h"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>

#include "core/error.h"
#include "core/open_failure.h"

namespace manicule {

namespace {

std::string kind_of(mode_t mode) {
  if (S_ISDIR(mode)) return "a folder";
  if (S_ISFIFO(mode)) return "a named pipe";
  if (S_ISCHR(mode) || S_ISBLK(mode)) return "a device";
  if (S_ISSOCK(mode)) return "a socket";
  return "not a regular file";
}

}  // namespace

std::FILE* open_regular_file(const std::string& path, const std::string& what) {
  const int fd = ::open(path.c_str(), O_RDONLY | O_NONBLOCK | O_CLOEXEC);
  if (fd < 0) {
    const int error_number = errno;
    throw Error(ErrorKind::bad_input, "cannot read " + what + ": " + open_failure_reason(path, error_number), path);
  }
  struct stat info {};
  if (::fstat(fd, &info) != 0 || !S_ISREG(info.st_mode)) {
    const std::string kind = kind_of(info.st_mode);
    ::close(fd);
    throw Error(ErrorKind::bad_input, "cannot read " + what + ": it is " + kind + ", not a file", path);
  }
  const int flags = ::fcntl(fd, F_GETFL);
  if (flags >= 0) ::fcntl(fd, F_SETFL, flags & ~O_NONBLOCK);
  std::FILE* stream = ::fdopen(fd, "rb");
  if (!stream) {
    const int error_number = errno;
    ::close(fd);
    throw Error(ErrorKind::bad_input, "cannot read " + what + ": " + open_failure_reason(path, error_number), path);
  }
  return stream;
}

std::string read_regular_file(const std::string& path, const std::string& what) {
  std::FILE* stream = open_regular_file(path, what);
  std::string text;
  char buffer[1 << 16];
  std::size_t n;
  while ((n = std::fread(buffer, 1, sizeof buffer, stream)) > 0) text.append(buffer, n);
  const bool failed = std::ferror(stream) != 0;
  std::fclose(stream);
  if (failed) throw Error(ErrorKind::bad_input, "cannot read " + what, path);
  return text;
}

}  // namespace manicule
