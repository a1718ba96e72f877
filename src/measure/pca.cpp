#include "measure/pca.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numeric>

#include "core/error.h"
#include "measure/cosine_gram.h"
#include "measure/top_eigenpairs.h"

namespace manicule {

namespace {

ComponentPoles poles_of(const Eigen::VectorXd& loading, std::size_t top) {
  std::vector<std::size_t> order(static_cast<std::size_t>(loading.size()));
  std::iota(order.begin(), order.end(), 0);
  std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) {
    return loading[static_cast<Eigen::Index>(a)] > loading[static_cast<Eigen::Index>(b)];
  });
  ComponentPoles poles;
  for (std::size_t f : order) {
    const double value = loading[static_cast<Eigen::Index>(f)];
    if (poles.positive.size() == top || value <= 0) break;
    poles.positive.push_back({f, value});
  }
  for (auto it = order.rbegin(); it != order.rend(); ++it) {
    const double value = loading[static_cast<Eigen::Index>(*it)];
    if (poles.negative.size() == top || value >= 0) break;
    poles.negative.push_back({*it, value});
  }
  return poles;
}

}  // namespace

PcaResult principal_components(const RowMatrix& rows, const PcaOptions& options) {
  const Eigen::Index n = rows.rows();
  const Eigen::Index p = rows.cols();
  if (n < 2) throw Error(ErrorKind::usage, "PCA needs at least two segments");
  if (p < 1) throw Error(ErrorKind::usage, "PCA needs at least one feature");
  if (options.components < 1) throw Error(ErrorKind::usage, "PCA needs at least one component");
  if (!rows.allFinite()) throw Error(ErrorKind::usage, "the feature values hold NaN or infinity");

  const double divisor = static_cast<double>(n - 1);
  const Eigen::Index k =
      std::min<Eigen::Index>({static_cast<Eigen::Index>(options.components), n - 1, p});

  // Eigen-decompose the smaller of X X^T (n x n) and X^T X (p x p), X the centred rows;
  // eigenvalues ascend. Either is the Gram matrix of the rows of `centred`: X itself, or X^T
  // when the segments outnumber the features. Its product, the one cubic step, is the
  // BLAS's (gram_lower: dsyrk, on every core): over 10,443 segments of 1,000 features
  // Eigen's own product on one core took about a second.
  const bool by_segments = n <= p;
  const Eigen::RowVectorXd mean = rows.colwise().mean();
  const RowMatrix centred =
      by_segments ? RowMatrix(rows.rowwise() - mean) : RowMatrix((rows.rowwise() - mean).transpose());
  Eigen::MatrixXd gram;
  gram_lower(centred, gram);
  const auto size = static_cast<double>(gram.rows());
  const Eigenpairs top = top_eigenpairs(std::move(gram), k);
  const double largest = std::max(0.0, top.values[0]);
  // Components whose variance is rounding noise have no direction to speak of.
  const double negligible = size * std::numeric_limits<double>::epsilon() * largest;

  PcaResult result;
  result.coordinates = Eigen::MatrixXd::Zero(n, k);
  result.loadings = Eigen::MatrixXd::Zero(p, k);
  result.explained_variance = Eigen::VectorXd::Zero(k);
  result.explained_variance_ratio = Eigen::VectorXd::Zero(k);
  result.total_variance = centred.squaredNorm() / divisor;
  for (Eigen::Index c = 0; c < k; ++c) {
    const double eigenvalue = std::max(0.0, top.values[c]);
    if (eigenvalue > negligible) {
      const auto vector = top.vectors.col(c);
      if (by_segments) {  // vector = u; coordinates = u s, loadings = X^T u / s
        const double singular = std::sqrt(eigenvalue);
        result.coordinates.col(c) = vector * singular;
        result.loadings.col(c) = centred.transpose() * vector / singular;
      } else {  // vector = v; coordinates = X v, X being centred^T here
        result.loadings.col(c) = vector;
        result.coordinates.col(c) = centred.transpose() * vector;
      }
      Eigen::Index strongest = 0;
      result.loadings.col(c).cwiseAbs().maxCoeff(&strongest);
      if (result.loadings(strongest, c) < 0) {
        result.loadings.col(c) *= -1.0;
        result.coordinates.col(c) *= -1.0;
      }
    }
    result.explained_variance[c] = eigenvalue / divisor;
    if (result.total_variance > 0) {
      result.explained_variance_ratio[c] = result.explained_variance[c] / result.total_variance;
    }
    result.poles.push_back(poles_of(result.loadings.col(c), options.top_features));
  }
  return result;
}

PcaResult principal_components(const FeatureTable& table, const PcaOptions& options) {
  const bool on_z = options.input == PcaInput::z_scores;
  PcaResult result = principal_components(on_z ? table.z : table.relative, options);
  result.segment_ids = table.segment_ids;
  result.features = table.features;
  return result;
}

}  // namespace manicule
