#include "profile/feature_table.h"
#include "profile/large_matrix.h"

#include <cmath>

namespace manicule {

void standardise(FeatureTable& table, bool keep_relative) {
  const Eigen::Index rows = table.relative.rows();
  const Eigen::Index cols = table.relative.cols();
  table.mean = Eigen::VectorXd::Zero(cols);
  table.sd = Eigen::VectorXd::Zero(cols);
  table.report.zero_variance = 0;
  // In place, each column's z-scores overwrite its relative frequencies once its mean and
  // sd are known; no other column depends on them.
  if (keep_relative) {
    table.z = zero_matrix<RowMatrix>(rows, cols);
  } else {
    table.z = std::move(table.relative);
    table.relative = RowMatrix();  // left empty, as documented
  }
  const RowMatrix& relative = keep_relative ? table.relative : table.z;
  if (rows == 0) return;
  table.mean = relative.colwise().mean().transpose();
  for (Eigen::Index c = 0; c < cols; ++c) {
    const auto column = relative.col(c);
    // Equal values have no spread; testing that exactly avoids a rounding-noise sd.
    if (rows < 2 || column.minCoeff() == column.maxCoeff()) {
      ++table.report.zero_variance;
      if (!keep_relative) table.z.col(c).setZero();
      continue;  // sd and z stay 0
    }
    const double squares = (column.array() - table.mean[c]).square().sum();
    table.sd[c] = std::sqrt(squares / static_cast<double>(rows - 1));
    table.z.col(c) = (column.array() - table.mean[c]) / table.sd[c];
  }
}

}  // namespace manicule
