#include "standoff/safe_file.h"

#include <fcntl.h>
#include <signal.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <filesystem>
#include <thread>

#include "core/error.h"
#include "core/open_failure.h"
#include "core/sha256.h"

namespace manicule {

namespace fs = std::filesystem;

namespace {

std::string octal_mode(mode_t mode) {
  char text[8];
  std::snprintf(text, sizeof text, "%04o", static_cast<unsigned>(mode & 07777));
  return text;
}

std::int64_t mtime_of(const struct stat& st) {
  return static_cast<std::int64_t>(st.st_mtim.tv_sec) * 1000000000 + st.st_mtim.tv_nsec;
}

[[noreturn]] void write_error(const std::string& what, const std::string& path) {
  throw Error(ErrorKind::write_failed, what + ": " + std::strerror(errno) + "; the original is unchanged", path);
}

long slow_write_ms() {
  const char* v = std::getenv("MANICULE_TEST_SLOW_WRITE");
  return v ? std::strtol(v, nullptr, 10) : 0;
}

// Removes temporary files of this target left by runs that no longer exist.
void remove_stale_temporaries(const std::string& path) {
  fs::path p(path);
  std::string stem = "." + p.filename().string() + ".manicule-tmp-";
  std::error_code ec;
  fs::path dir = p.has_parent_path() ? p.parent_path() : fs::path(".");
  for (const auto& entry : fs::directory_iterator(dir, ec)) {
    std::string name = entry.path().filename().string();
    if (name.rfind(stem, 0) != 0) continue;
    std::string digits = name.substr(stem.size());
    if (digits.empty() || digits.find_first_not_of("0123456789") != std::string::npos) continue;
    long pid = std::strtol(digits.c_str(), nullptr, 10);
    if (pid > 0 && ::kill(static_cast<pid_t>(pid), 0) != 0 && errno == ESRCH) fs::remove(entry.path(), ec);
  }
}

class TemporaryFile {
 public:
  TemporaryFile(const std::string& target, mode_t mode) : path_(temporary_path_for(target, ::getpid())) {
    ::unlink(path_.c_str());  // a leftover of a process that had our pid
    fd_ = ::open(path_.c_str(), O_WRONLY | O_CREAT | O_EXCL | O_CLOEXEC, mode);
    if (fd_ < 0) write_error("cannot create the temporary file " + path_, target);
    ::fchmod(fd_, mode);  // the umask must not narrow the edition's permissions
  }
  // Gives the file the owner and group of the one it replaces, where the system lets us
  // (root may; another user may give it a group of their own): a shared archive's edition
  // annotated by root must stay its owner's.
  void take_owner_of(const struct stat& replaced) {
    if (::fchown(fd_, replaced.st_uid, replaced.st_gid) != 0) {
      const int ignored = ::fchown(fd_, static_cast<uid_t>(-1), replaced.st_gid);
      (void)ignored;
    }
  }
  ~TemporaryFile() {
    if (fd_ >= 0) ::close(fd_);
    if (!committed_) ::unlink(path_.c_str());
  }
  void write_all(std::string_view bytes, const std::string& target) {
    const std::size_t chunk = 64 * 1024;
    long pause = slow_write_ms();
    for (std::size_t at = 0; at < bytes.size();) {
      std::size_t n = std::min(chunk, bytes.size() - at);
      ssize_t w = ::write(fd_, bytes.data() + at, n);
      if (w < 0) {
        if (errno == EINTR) continue;
        write_error("cannot write " + path_, target);
      }
      at += static_cast<std::size_t>(w);
      if (pause > 0) std::this_thread::sleep_for(std::chrono::milliseconds(pause));
    }
    if (::fsync(fd_) != 0) write_error("cannot flush " + path_ + " to disk", target);
    if (::close(fd_) != 0) {
      fd_ = -1;
      write_error("cannot close " + path_, target);
    }
    fd_ = -1;
  }
  void rename_to(const std::string& target) {
    if (::rename(path_.c_str(), target.c_str()) != 0) write_error("cannot rename " + path_ + " to " + target, target);
    committed_ = true;
  }

 private:
  std::string path_;
  int fd_ = -1;
  bool committed_ = false;
};

void sync_folder(const std::string& path) {
  fs::path p(path);
  std::string dir = p.has_parent_path() ? p.parent_path().string() : ".";
  int fd = ::open(dir.c_str(), O_RDONLY | O_DIRECTORY | O_CLOEXEC);
  if (fd >= 0) {
    ::fsync(fd);
    ::close(fd);
  }
}

void write_through(const std::string& path, std::string_view bytes, bool append) {
  const int fd = ::open(path.c_str(), O_WRONLY | O_CLOEXEC | (append ? O_APPEND : 0));
  if (fd < 0) throw Error(ErrorKind::write_failed, std::string("cannot open the output: ") + std::strerror(errno), path);
  std::size_t at = 0;
  while (at < bytes.size()) {
    const ssize_t n = ::write(fd, bytes.data() + at, bytes.size() - at);
    if (n < 0 && errno == EINTR) continue;
    if (n <= 0) {
      const int error_number = errno;
      ::close(fd);
      throw Error(ErrorKind::write_failed, std::string("cannot write the output: ") + std::strerror(error_number), path);
    }
    at += static_cast<std::size_t>(n);
  }
  ::close(fd);
}

void write_one(const std::string& path, std::string_view bytes, mode_t mode, const FileSnapshot* replacing,
               const struct stat* replaced = nullptr) {
  TemporaryFile temp(path, mode);
  if (replaced) temp.take_owner_of(*replaced);
  temp.write_all(bytes, path);
  if (replacing) require_unchanged(*replacing);
  temp.rename_to(path);
  sync_folder(path);
}

}  // namespace

std::string temporary_path_for(const std::string& path, long pid) {
  fs::path p(path);
  std::string name = "." + p.filename().string() + ".manicule-tmp-" + std::to_string(pid);
  return (p.has_parent_path() ? p.parent_path() / name : fs::path(name)).string();
}

FileSnapshot take_snapshot(const std::string& path) {
  FileSnapshot s;
  s.path = path;
  int fd = ::open(path.c_str(), O_RDONLY | O_CLOEXEC);
  if (fd < 0) {
    const int error_number = errno;
    throw Error(ErrorKind::bad_input, "cannot read the file: " + open_failure_reason(path, error_number), path);
  }
  struct stat st {};
  if (::fstat(fd, &st) != 0) {
    ::close(fd);
    throw Error(ErrorKind::bad_input, std::string("cannot read the file: ") + std::strerror(errno), path);
  }
  s.size = static_cast<std::uintmax_t>(st.st_size);
  s.mtime_ns = mtime_of(st);
  s.bytes.resize(static_cast<std::size_t>(st.st_size));
  std::size_t at = 0;
  while (at < s.bytes.size()) {
    ssize_t n = ::read(fd, s.bytes.data() + at, s.bytes.size() - at);
    if (n < 0 && errno == EINTR) continue;
    if (n <= 0) break;
    at += static_cast<std::size_t>(n);
  }
  ::close(fd);
  if (at != s.bytes.size()) throw Error(ErrorKind::bad_input, "the file changed size while it was read", path);
  s.sha256 = sha256_hex(s.bytes);
  return s;
}

void require_unchanged(const FileSnapshot& snapshot) {
  const std::string advice = " since manicule read it; nothing was written. Run again to use the new version.";
  struct stat st {};
  if (::stat(snapshot.path.c_str(), &st) != 0)
    throw Error(ErrorKind::changed_on_disk, "the file was removed or renamed" + advice, snapshot.path);
  if (static_cast<std::uintmax_t>(st.st_size) != snapshot.size)
    throw Error(ErrorKind::changed_on_disk, "the file changed size" + advice, snapshot.path);
  if (mtime_of(st) != snapshot.mtime_ns)
    throw Error(ErrorKind::changed_on_disk, "the file was modified" + advice, snapshot.path);
  if (sha256_file(snapshot.path) != snapshot.sha256)
    throw Error(ErrorKind::changed_on_disk, "the file's content changed" + advice, snapshot.path);
}

bool names_a_descriptor_or_device(const std::string& path) {
  return path.rfind("/dev/", 0) == 0 || path.rfind("/proc/", 0) == 0;
}

namespace {

// `path`, or the file a symbolic link at it leads to: the new file is written beside the
// real one, and the link kept.
std::string real_target(const std::string& path) {
  std::error_code ec;
  std::string target = fs::is_symlink(path, ec) ? fs::canonical(path, ec).string() : path;
  return target.empty() ? path : target;
}

}  // namespace

namespace {

// What check_replaceable says of the file `path` names, `target` being the real file and
// `st` what stat(2) gave for it.
void refuse_unreplaceable(const std::string& path, const std::string& target, const struct stat& st) {
  if (S_ISDIR(st.st_mode)) throw Error(ErrorKind::write_failed, "cannot write the output: it is a folder", path);
  if (!S_ISREG(st.st_mode)) return;  // a pipe or a device: written through
  // A file put in place of this one would not honour what its mode or its links say.
  if ((st.st_mode & 0222) == 0)
    throw Error(ErrorKind::write_failed,
                "the file is read-only (mode " + octal_mode(st.st_mode) +
                    "): it is left as it is; make it writable to write it",
                path);
  if (::access(target.c_str(), W_OK) != 0)
    throw Error(ErrorKind::write_failed,
                "the file is not writable by this user (mode " + octal_mode(st.st_mode) + ", owner " +
                    std::to_string(st.st_uid) + "): it is left as it is",
                path);
  if (st.st_nlink > 1)
    throw Error(ErrorKind::write_failed,
                "the file has " + std::to_string(st.st_nlink) +
                    " hard links: a new file put in its place would part them, the other names keeping the old "
                    "text; it is left as it is (write to another file with --output, or make it a file of its own)",
                path);
}

}  // namespace

void check_replaceable(const std::string& path) {
  if (names_a_descriptor_or_device(path)) return;
  const std::string target = real_target(path);
  struct stat st {};
  if (::stat(target.c_str(), &st) == 0) refuse_unreplaceable(path, target, st);  // else a new file
}

void write_file_safely(const std::string& path, std::string_view bytes, const WriteOptions& options) {
  if (names_a_descriptor_or_device(path) && !options.replacing) return write_through(path, bytes, true);
  const std::string target = real_target(path);
  struct stat st {};
  const bool exists = ::stat(target.c_str(), &st) == 0;
  if (exists && !S_ISREG(st.st_mode) && !S_ISDIR(st.st_mode) && !options.replacing) {
    // A pipe or a socket (a FIFO a program reads): written through. A file renamed over it
    // would take its place.
    return write_through(path, bytes, false);
  }
  if (exists) refuse_unreplaceable(path, target, st);
  remove_stale_temporaries(target);
  mode_t mode = 0666 & ~[] {
    mode_t m = ::umask(0);
    ::umask(m);
    return m;
  }();
  if (exists) mode = st.st_mode & 07777;
  if (options.replacing) require_unchanged(*options.replacing);
  if (options.backup && options.replacing) {
    std::string backup = target + ".bak";
    remove_stale_temporaries(backup);
    write_one(backup, options.replacing->bytes, mode, nullptr, exists ? &st : nullptr);
  }
  write_one(target, bytes, mode, options.replacing, exists ? &st : nullptr);
}

}  // namespace manicule
