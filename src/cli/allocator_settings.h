// How the program's allocator hands memory back to the system: a process-wide choice, made
// by the command line program alone (a host embedding the library keeps its own).
#pragma once

namespace manicule::cli {

// Keeps blocks of up to 32 MiB in the heap, and freed memory there, instead of mapping each
// large block afresh and unmapping it when freed. A batch run allocates a file's text,
// tokens and counts, a few MiB, for each of thousands of files; mapped afresh each time,
// every page is zeroed and faulted in again. Call before any thread starts.
void keep_freed_memory_for_reuse();

}  // namespace manicule::cli
