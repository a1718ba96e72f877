// How the program's allocator hands memory back to the system: a process-wide choice, made
// by the command line program alone (a host embedding the library keeps its own).
#pragma once

namespace manicule::cli {

// Keeps blocks of up to 32 MiB in the heap, and freed memory there, instead of mapping each
// large block afresh and unmapping it when freed. A batch run allocates a file's text,
// tokens and counts, a few MiB, for each of thousands of files; mapped afresh each time,
// every page is zeroed and faulted in again. Call before any thread starts.
void keep_freed_memory_for_reuse();

// Grows the main thread's heap by some 90 MiB at once, untouched, and advises the kernel to
// back that range with huge pages (2 MiB), so that memory first written there costs one
// fault a huge page instead of one a 4 KiB page (8-16 us each on the virtual machines we
// measure on). What a batch keeps for its analysis (every long segment's counts: 16 MiB
// for the plays, 35 MiB for the novels) and the analysis' matrices live there. Call after
// keep_freed_memory_for_reuse, which keeps the range in the heap once it is freed.
void back_main_heap_with_huge_pages();

// The same for the heap of each worker thread the library starts (the reading threads'
// texts, tokens and counts; the analysis' threads). With both, a first batch run over the
// novels takes some 1,700 page faults instead of 9,200, as many as glibc's own
// glibc.malloc.hugetlb=1 tunable gives, which only the environment can set. Call before
// any thread starts.
void back_thread_heaps_with_huge_pages();

}  // namespace manicule::cli
