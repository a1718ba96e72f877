// OpenBLAS, Debian's optimised BLAS, starts its worker threads as soon as the library is
// loaded, and each idle worker spins (sched_yield) for about 2^28 cycles before it sleeps:
// some 0.1 s of a core in every process, whether or not it ever multiplies a matrix (a
// tenth of reading the whole play corpus without a match). stop_idle_blas_threads() ends
// them; OpenBLAS starts them again by itself the first time a BLAS call wants them. With
// a BLAS library that has no such pool it does nothing.
#pragma once

namespace manicule {

void stop_idle_blas_threads();

}  // namespace manicule
