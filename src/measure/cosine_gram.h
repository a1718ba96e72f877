// cosine_distances_by_gram: 1 - cos(x_i, x_j) for every pair of rows, from one symmetric
// rank-k product (BLAS dsyrk) of the rows, each dot product then divided by the two rows'
// lengths: the Gram matrix of n rows is the one cubic step, and an optimised BLAS
// (OpenBLAS on Debian, which picks the CPU's widest vector unit at run time and uses every
// core) does it several times faster than generic compiled code. A row of length 0 has no
// direction: its distance is 0 to another zero row and 1 to every other row, never NaN.
// Fills only the strict lower triangle of `out` (n x n); values below 64 machine epsilons
// (rounding noise of the dot product, as for identical rows) are set to 0, and values are
// capped at 2. `threads` bounds the post-processing; BLAS threads follow the BLAS
// library's own setting. The BLAS is opened at the first call (dlopen); without one,
// Eigen's own product does the work, slower.
#pragma once

#include <Eigen/Dense>

#include "profile/feature_table.h"

namespace manicule {

void cosine_distances_by_gram(const RowMatrix& rows, unsigned threads, Eigen::MatrixXd& out);

// Opens the BLAS now (it is otherwise opened at the first Gram matrix): some 5.5 ms of
// loading that a caller can do on another thread while other work goes on. Thread-safe.
void open_blas();

// Process-wide, for a program's start before other threads (the command line calls it; a
// host embedding the library keeps its own environment): OpenBLAS's idle threads spin on
// sched_yield for some 2^28 cycles after each call, taking a core from the distance loops
// that follow; this lets them sleep at once.
void let_blas_threads_sleep_when_idle();

// The lower triangle (diagonal included) of rows * rows^T into `out`, resized to n x n:
// by the BLAS's dsyrk when one is found and `allow_blas`, else by Eigen's own product.
// The upper triangle is left unspecified.
void gram_lower(const RowMatrix& rows, Eigen::MatrixXd& out, bool allow_blas = true);

}  // namespace manicule
