// Safe writing of editions: read once into a snapshot (bytes, size, modification time,
// SHA-256), compute, then write through a temporary file in the same folder, flush it to
// disk (fsync) and rename it over the target, so that a reader, a crash or a kill sees
// either the old file or the new one, never a mix.
//  - Replacing a file refuses (Error(changed_on_disk)) if it is no longer as in its
//    snapshot: checked before the temporary file is written and again before the rename.
//  - The temporary file is named ".<name>.manicule-tmp-<pid>": hidden, and not ending in
//    .xml, so no folder run takes it for an edition. One left behind by a killed run
//    (its process gone) is removed by the next write of the same file.
//  - A backup, when asked for, is "<file>.bak", written the same way before the rename.
//  - Any failure removes the temporary file and leaves the target as it was
//    (Error(write_failed)).
// Test hook (used only by tests/cli/test_annotate_safety.py): the environment variable
// MANICULE_TEST_SLOW_WRITE=<milliseconds> sleeps that long after each 64 KiB written to
// the temporary file, so that a test can kill the process in the middle of a write.
#pragma once
#include <cstdint>
#include <string>
#include <string_view>

namespace manicule {

struct FileSnapshot {
  std::string path;
  std::string bytes;
  std::uintmax_t size = 0;
  std::int64_t mtime_ns = 0;
  std::string sha256;
};

// Throws Error(bad_input) when the file cannot be read.
FileSnapshot take_snapshot(const std::string& path);

// Throws Error(changed_on_disk) naming what differs, when the file is not as it was.
void require_unchanged(const FileSnapshot& snapshot);

struct WriteOptions {
  const FileSnapshot* replacing = nullptr;  // the target must still be this (in-place writes)
  bool backup = false;                      // keep the replaced file as <path>.bak
};

// A name of the process's own descriptors or of a device (/dev/stdout, /dev/fd/3,
// /proc/self/fd/1, /dev/null): written through, appending, never replaced. Followed as a
// link, /dev/stdout may lead to the very log the shell opened with >>, which a file renamed
// over it would take away.
bool names_a_descriptor_or_device(const std::string& path);

void write_file_safely(const std::string& path, std::string_view bytes, const WriteOptions& options = {});

// Throws Error(write_failed) where write_file_safely would refuse `path`: a folder, a file
// whose mode says it is read-only or that this user may not write, one with several hard
// links. Called for every edition before the first is written, so that a run refused for
// one of them writes none.
void check_replaceable(const std::string& path);

// ".<name>.manicule-tmp-<pid>" beside `path`.
std::string temporary_path_for(const std::string& path, long pid);

}  // namespace manicule
