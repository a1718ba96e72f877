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
  // In place, each row's z-scores overwrite its relative frequencies once every column's
  // mean and sd are known.
  if (keep_relative) {
    table.z = uninitialised_matrix<RowMatrix>(rows, cols);  // every row is written below
  } else {
    table.z = std::move(table.relative);
    table.relative = RowMatrix();  // left empty, as documented
  }
  const RowMatrix& relative = keep_relative ? table.relative : table.z;
  if (rows == 0) return;
  table.mean = relative.colwise().mean().transpose();
  // Row by row: the table is stored by rows, and a walk down one column strides through
  // all of it. Each column's sum of squares still adds its rows in order, as a walk down
  // the column did, so the figures are the same to the last bit.
  const Eigen::RowVectorXd mean = table.mean.transpose();
  Eigen::RowVectorXd lowest = relative.row(0), highest = relative.row(0);
  Eigen::RowVectorXd squares = Eigen::RowVectorXd::Zero(cols);
  for (Eigen::Index r = 0; r < rows; ++r) {
    lowest = lowest.cwiseMin(relative.row(r));
    highest = highest.cwiseMax(relative.row(r));
    squares.array() += (relative.row(r) - mean).array().square();
  }
  // Equal values have no spread; testing that exactly avoids a rounding-noise sd. Such a
  // column keeps sd 0 and gets z 0 (its divisor of 1 only keeps the division finite).
  Eigen::Array<bool, 1, Eigen::Dynamic> no_spread(cols);
  Eigen::RowVectorXd divisor(cols);
  for (Eigen::Index c = 0; c < cols; ++c) {
    no_spread[c] = rows < 2 || lowest[c] == highest[c];
    if (no_spread[c]) {
      ++table.report.zero_variance;
      divisor[c] = 1.0;
    } else {
      table.sd[c] = std::sqrt(squares[c] / static_cast<double>(rows - 1));
      divisor[c] = table.sd[c];
    }
  }
  const Eigen::RowVectorXd zero = Eigen::RowVectorXd::Zero(cols);
  Eigen::RowVectorXd z(cols);
  for (Eigen::Index r = 0; r < rows; ++r) {
    z = ((relative.row(r) - mean).array() / divisor.array()).matrix();
    table.z.row(r) = no_spread.select(zero, z);
  }
}

}  // namespace manicule
