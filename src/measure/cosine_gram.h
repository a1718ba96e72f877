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
#include <algorithm>
#include <cstddef>
#include <limits>
#include <vector>

#include <Eigen/Dense>

#include "profile/feature_table.h"

namespace manicule {

void cosine_distances_by_gram(const RowMatrix& rows, unsigned threads, Eigen::MatrixXd& out);

// What turning dot products into cosine distances needs of the rows: 1 / length, and
// which rows have length 0.
struct RowLengths {
  std::vector<double> inverse;  // 0 for a zero row
  std::vector<char> zero;
};
RowLengths row_lengths(const RowMatrix& rows);

// 1 - cos of rows a and b from their dot product, in [0, 2]: the same bits whichever way
// round they are given, and whether the dot product comes from the full matrix or from
// blocks of it.
inline double cosine_from_dot(double dot, const RowLengths& lengths, std::size_t a, std::size_t b) {
  constexpr double kRoundingNoise = 64 * std::numeric_limits<double>::epsilon();
  // The two lengths multiplied first: the same for (a, b) and (b, a), and for any two rows
  // of equal values, so that equal profiles are at exactly one distance from a third and
  // the tie rule (row order) decides between them. (dot * 1/|a| * 1/|b| rounded each step
  // in an order that followed the rows' places, and put equal rows an ulp apart.)
  double d = 1.0 - dot * (lengths.inverse[a] * lengths.inverse[b]);
  if (lengths.zero[a] || lengths.zero[b]) d = lengths.zero[a] && lengths.zero[b] ? 0.0 : 1.0;
  // Below this, 1 - cos is rounding noise of the dot product (identical rows).
  if (d < kRoundingNoise) d = 0.0;
  return std::min(d, 2.0);
}

// The dot products of rows a_first .. a_first + a_count - 1 with rows b_first .. b_first +
// b_count - 1: out[a + a_count * b] is row (a_first + a) . row (b_first + b), for an
// a_count x b_count column-major `out` the caller provides. By the BLAS's dgemm when one is
// found, else by Eigen's own product.
void dot_products(const RowMatrix& rows, Eigen::Index a_first, Eigen::Index a_count, Eigen::Index b_first,
                  Eigen::Index b_count, double* out);

// The same in single precision, for rows already in single precision (`cols` floats a
// row, row-major): out[a + a_count * b] is row (a_first + a) . row (b_first + b). By the
// BLAS's sgemm; false, with nothing written, when the BLAS has none.
bool float_dot_products(const float* rows, Eigen::Index cols, Eigen::Index a_first, Eigen::Index a_count,
                        Eigen::Index b_first, Eigen::Index b_count, float* out);

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
