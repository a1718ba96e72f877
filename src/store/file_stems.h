// files.stem, the start of each stored segment's id in the segment_list view: the file's
// name without its extension, or, where files of one name lie in several folders of the
// store, the shortest end of its path that tells them apart (core/segment_id_prefixes.h,
// the rule every command's segment ids follow). It depends on every file stored, so it
// is worked out again whenever a run changes the files table.
#pragma once
#include "store/sqlite_db.h"

namespace manicule::store {

// Sets each file's stem by the rule above; writes only the rows that change.
void refresh_file_stems(Database& db);

}  // namespace manicule::store
