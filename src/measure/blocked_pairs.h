// blocked_pair_sums: element-wise sums over every pair of rows of a matrix, the core of the
// L1 / L2 / MinMax distances. Rows are processed in tiles so that the rows being compared
// stay in cache, several rows against several so that each value loaded serves several pairs, in 4-wide SIMD
// vectors (SSE2 everywhere on x86-64, AVX2 where the processor has it, chosen at run time)
// and with parallel_items() over row tiles for the cores.
// Fills only the strict lower triangle of `out` (out(i, j), i > j), which must be n x n.
#pragma once
#include <Eigen/Dense>

#include "profile/feature_table.h"

namespace manicule {

enum class PairSum {
  absolute,  // sum |a - b|
  squared,   // sum (a - b)^2
  min_max,   // 1 - sum min(a, b) / sum max(a, b); 0 when sum max is 0 (two zero rows)
};

// Which instruction set the loops may use: `best` picks AVX2 at run time where the processor
// has it; `baseline` keeps to what every x86-64 (or other) processor has (for tests).
enum class SimdLevel { best, baseline };

void blocked_pair_sums(const RowMatrix& rows, PairSum kind, unsigned threads,
                       Eigen::MatrixXd& out, SimdLevel simd = SimdLevel::best);

// The sums of a band of rows, first .. first + count - 1, against every row from `first`
// on (the band's own included): out[c + count * r] is the sum of rows first + c and
// first + r, for c < count and r < n - first; out[c + count * c] is not written. What
// nearest_rows.h needs to keep each row's nearest without the n x n matrix. Each pair's
// sum is the same to the last bit as blocked_pair_sums gives it.
void blocked_pair_sums_band(const RowMatrix& rows, PairSum kind, Eigen::Index first, Eigen::Index count,
                            double* out, unsigned threads, SimdLevel simd = SimdLevel::best);

}  // namespace manicule
