// cosine_distances_by_gram: 1 - cos(x_i, x_j) for every pair of rows, as one matrix
// product of the length-normalised rows (Eigen GEMM over row tiles on parallel_items()).
// A row of length 0 has no direction: its distance is 0 to another zero row and 1 to
// every other row, never NaN. Fills only the strict lower triangle of `out` (n x n);
// values below 64 machine epsilons (rounding noise of the dot
// product, as for identical rows) are set to 0, and values are capped at 2.
#pragma once
#include <Eigen/Dense>

#include "profile/feature_table.h"

namespace manicule {

void cosine_distances_by_gram(const RowMatrix& rows, unsigned threads, Eigen::MatrixXd& out);

}  // namespace manicule
