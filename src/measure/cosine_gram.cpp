#include "measure/cosine_gram.h"

#include <algorithm>
#include <limits>
#include <vector>

#include "measure/parallel_items.h"

namespace manicule {

void cosine_distances_by_gram(const RowMatrix& rows, unsigned threads, Eigen::MatrixXd& out) {
  const Eigen::Index n = rows.rows();
  RowMatrix unit = rows;
  std::vector<char> zero(static_cast<std::size_t>(n), 0);
  for (Eigen::Index i = 0; i < n; ++i) {
    const double norm = unit.row(i).norm();
    if (norm > 0) {
      unit.row(i) /= norm;
    } else {
      zero[static_cast<std::size_t>(i)] = 1;
    }
  }
  constexpr Eigen::Index kTile = 128;
  constexpr double kRoundingNoise = 64 * std::numeric_limits<double>::epsilon();
  const Eigen::Index tiles = (n + kTile - 1) / kTile;
  parallel_items(static_cast<std::size_t>(tiles), threads, [&](std::size_t item) {
    const Eigen::Index i0 = (tiles - 1 - static_cast<Eigen::Index>(item)) * kTile;
    const Eigen::Index height = std::min(kTile, n - i0);
    // Rows i0.. against rows 0..i0+height: the lower triangle of this band and a bit more.
    const Eigen::Index width = i0 + height;
    Eigen::MatrixXd similarity = unit.middleRows(i0, height) * unit.topRows(width).transpose();
    for (Eigen::Index r = 0; r < height; ++r) {
      const Eigen::Index i = i0 + r;
      for (Eigen::Index j = 0; j < i; ++j) {
        double d = 1.0 - similarity(r, j);
        if (zero[static_cast<std::size_t>(i)] || zero[static_cast<std::size_t>(j)]) {
          d = zero[static_cast<std::size_t>(i)] && zero[static_cast<std::size_t>(j)] ? 0.0 : 1.0;
        }
        // Below this, 1 - cos is rounding noise of the dot product (identical rows).
        if (d < kRoundingNoise) d = 0.0;
        out(i, j) = std::min(d, 2.0);
      }
    }
  });
}

}  // namespace manicule
