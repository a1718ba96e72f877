// What each worker thread the library starts does first: nothing, unless the program that
// embeds the library asks for something. The command line uses it to tune the memory each
// worker thread allocates from (cli/allocator_settings.h); a host keeps its own choices.
#pragma once

namespace manicule {

using WorkerStart = void (*)();

// Set once, before any work starts; null for nothing.
void set_worker_start(WorkerStart start);

// Called by every worker thread before its first item (parallel_items, read_files_streaming).
void on_worker_start();

}  // namespace manicule
