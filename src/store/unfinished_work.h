// Work a store records as begun and not finished: a batch run that was interrupted or failed
// and that no complete run covering it has followed (the same reading settings, the same
// inputs or folders around them, no narrower --folder or --shard), and a merge that took in a store holding such work. An analysis of the store
// then measures part of the archive; the commands say so rather than analyse it in silence.
#pragma once
#include <cstdint>
#include <string>
#include <vector>

#include "store/sqlite_db.h"

namespace manicule::store {

// One sentence each, e.g. "batch run 3 (2026-12-05T10:00:00Z) was interrupted after 41 of
// 150 file(s)"; empty when the store's work is complete. With `settings_id`, only batch runs
// of those reading settings count (merges always do).
std::vector<std::string> unfinished_work(Database& db, std::int64_t settings_id = 0);

}  // namespace manicule::store
