// How the program's allocator hands memory back to the system: a process-wide choice, made
// by the command line program alone (a host embedding the library keeps its own).
#pragma once

namespace manicule::cli {

// Keeps blocks of up to 32 MiB in the heap, and freed memory there, instead of mapping each
// large block afresh and unmapping it when freed. A batch run allocates a file's text,
// tokens and counts, a few MiB, for each of thousands of files; mapped afresh each time,
// every page is zeroed and faulted in again. Call before any thread starts.
void keep_freed_memory_for_reuse();

// Grows the main thread's heap by some 60 MiB at once, untouched, and advises the kernel to
// back that range with huge pages (2 MiB), so that memory first written there costs one
// fault a huge page instead of one a 4 KiB page (8-16 us each on the virtual machines we
// measure on). What a batch keeps for its analysis (every long segment's counts: 16 MiB
// for the plays, 35 MiB for the novels) lives there; its page faults went from 16,751 to
// 8,425 (plays) and 17,013 to 8,637 (novels). Call after keep_freed_memory_for_reuse,
// which keeps the range in the heap once it is freed.
void back_main_heap_with_huge_pages();

}  // namespace manicule::cli
