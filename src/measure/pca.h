// Principal component analysis of a segments x features matrix, with what each component
// is made of.
//  - The input is centred per feature (z-scores are already scaled, so PCA on them is PCA
//    of the correlation structure; on relative frequencies it is of the covariance).
//  - Computed from the eigen-decomposition of the smaller Gram matrix (X X^T or X^T X of
//    the centred X), which is cheaper than an SVD of X and as exact for the leading
//    components.
//  - coordinates: segments x components, the projections of the centred rows.
//  - explained_variance: the variance of each column of coordinates with divisor n - 1;
//    explained_variance_ratio: that over the total variance (the sum over all features);
//    both as scikit-learn's PCA defines them.
//  - loadings: features x components, unit-length component weights (the eigenvectors;
//    scikit-learn's components_ transposed).
//  - Sign: each component is turned so that its feature with the largest |loading| is
//    positive (the first such feature in column order on a tie), so runs are repeatable.
//  - poles: per component, up to top_features features with the largest positive and the
//    most negative loadings, strongest first.
// At most min(n - 1, features) components exist after centring. Errors: usage if fewer
// than two segments or non-finite input.
#pragma once
#include <cstddef>
#include <string>
#include <vector>

#include <Eigen/Dense>

#include "profile/feature_table.h"

namespace manicule {

enum class PcaInput { z_scores, relative_frequencies };

struct PcaOptions {
  std::size_t components = 2;    // capped at min(n - 1, features)
  std::size_t top_features = 10;
  PcaInput input = PcaInput::z_scores;  // used by the FeatureTable overload
};

struct FeatureWeight {
  std::size_t feature = 0;  // column in the input
  double loading = 0;
};

struct ComponentPoles {
  std::vector<FeatureWeight> positive;  // largest loading first
  std::vector<FeatureWeight> negative;  // most negative first
};

struct PcaResult {
  std::vector<std::string> segment_ids;  // filled by the FeatureTable overload
  std::vector<std::string> features;     // ditto
  Eigen::MatrixXd coordinates;
  Eigen::MatrixXd loadings;
  Eigen::VectorXd explained_variance;
  Eigen::VectorXd explained_variance_ratio;
  double total_variance = 0;
  std::vector<ComponentPoles> poles;
};

PcaResult principal_components(const RowMatrix& rows, const PcaOptions& options = {});
PcaResult principal_components(const FeatureTable& table, const PcaOptions& options = {});

}  // namespace manicule
