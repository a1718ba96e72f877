// The files of a batch: every TEI file named by the inputs (folders searched as
// expand_inputs does), each with its path relative to the input folder it was found under,
// its size and modification time. --shard K/N keeps a deterministic share: a file belongs
// to share 1 + (first 8 bytes of SHA-256 of its relative path) mod N, so the shares do not
// depend on where the archive is mounted, on file order or on the machine.
#pragma once
#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "core/corpus.h"
#include "store/archive_filter.h"

namespace manicule::store {

struct Shard {
  unsigned index = 1;  // K, 1..count
  unsigned count = 1;  // N
  std::string describe() const { return std::to_string(index) + "/" + std::to_string(count); }
};

// "K/N" as --shard spells it and a batch run records it (Shard::describe): digits only, all
// of them, on either side of one '/'. Nothing for any other text; K and N are not checked
// against each other.
std::optional<Shard> shard_from_text(std::string_view text);

struct ArchiveFile {
  std::string path;           // as found (input + path below it)
  std::string relative_path;  // below the input folder; the file name for a file input
  std::uint64_t size = 0;
  std::int64_t mtime_ns = 0;  // modification time, nanoseconds since 1970
};

bool in_shard(const std::string& relative_path, const Shard& shard);

// The files under `inputs` inside `filter`'s folder and in `shard`, sorted by path within
// each input. Throws Error(bad_input) for an input that does not exist; a folder below an
// input that cannot be listed goes to `unlisted`, and other files below the input folders
// are counted in `left_aside` (see expand_inputs). `empty_inputs` gets the inputs under
// which no TEI file was found at all, whatever the folder and the share (an archive not
// mounted, rather than a share or a folder that happens to hold none).
std::vector<ArchiveFile> list_archive_files(const std::vector<std::string>& inputs, const ArchiveFilter& filter,
                                            const Shard& shard, std::vector<UnlistedFolder>& unlisted,
                                            LeftAside& left_aside, std::vector<std::string>& empty_inputs);

// Size and modification time now; false when the file cannot be examined.
bool stat_file(const std::string& path, std::uint64_t& size, std::int64_t& mtime_ns);

}  // namespace manicule::store
