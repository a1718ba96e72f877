// Streaming corpus reading for archive-scale runs. Worker threads (one per core, or
// Request::threads) take the files in order and read each on its own (read_file); every
// finished file is handed to `sink` in the order the files finish, while the other workers
// go on. The sink is called by the workers themselves, one call at a time (so it needs no
// locking of its own), on whichever worker finds it free; the calling thread waits for
// them. At most `max_waiting` finished files wait for the sink (a worker that finishes one
// more waits for the sink and hands them over), so memory is bounded by a few files
// whatever the archive's size. With one thread (one file, or Request::threads 1) there are
// no workers: each file is read on the calling thread, then handed to the sink, in file
// order.
//
// Files with `hash_first[i]` set are hashed before parsing, and `known(i, sha256)` is asked
// (on a worker thread, or with one thread on the caller's: it must be safe to call
// concurrently with other calls and with the sink); when it says true the file is not
// parsed and the sink gets a FileReading with parsed == false, bytes and sha256 set.
// If the sink throws, the workers stop after their current file and the exception is
// rethrown once they have. A bad file never throws: it arrives with `failed` set (and its
// SHA-256 when its bytes could be read, so that a store can remember the failure).
#pragma once
#include <cstddef>
#include <functional>
#include <string>
#include <vector>

#include "core/file_reading.h"
#include "core/request.h"

namespace manicule {

using KnownContent = std::function<bool(std::size_t index, const std::string& sha256)>;
using FileSink = std::function<void(std::size_t index, FileReading&& reading)>;

struct StreamOptions {
  std::vector<char> hash_first;  // per file; empty = parse every file straight away
  KnownContent known;
  std::size_t max_waiting = 0;   // 0 = four per worker
  bool hash_failures = true;     // hash a failed file whose parse stopped before its end
};

// Throws Error(usage) for a bad request (before any reading), or what the sink throws.
void read_files_streaming(const Request& request, const std::vector<std::string>& files,
                          const StreamOptions& options, const FileSink& sink);

}  // namespace manicule
