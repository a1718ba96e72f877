// The archive store's tables (described for users in docs/store.md) and how a store is
// opened. A store is one SQLite file in WAL mode with synchronous=NORMAL: a committed
// transaction survives the process being killed at any moment. The connection holds an
// exclusive lock for as long as the store is open (locking_mode=EXCLUSIVE, taken at once),
// so a second run on the same store refuses straight away with a clear message instead of
// interleaving its writes; the sqlite3 shell can query the store when no run holds it.
#pragma once
#include <memory>
#include <string>

#include "store/sqlite_db.h"

namespace manicule::store {

// Raised whenever a table changes shape or a table, index or view is added: a store of
// an earlier format is brought up to this one where open_store knows how (from 2), any
// other is refused, and an existing store of this format is not given the schema again
// (open_store runs it on a new store only). 2: the vocabulary in blocks
// (store_vocabulary.h); 3: segments dated apart from their file (segments.date, .year).
inline constexpr int kStoreFormat = 3;

// Opens the store (creating file and tables when `create`), locks it and checks its format.
std::unique_ptr<Database> open_store(const std::string& path, bool create);

// Removes the store at `path` with the files SQLite keeps beside it (log, shared memory,
// journal); for a store just created by a command that then failed.
void remove_store_files(const std::string& path);

}  // namespace manicule::store
