#include "measure/pairwise_distances.h"

#include <algorithm>
#include <cmath>

#include "core/error.h"
#include "measure/blocked_pairs.h"
#include "measure/cosine_gram.h"
#include "profile/large_matrix.h"

namespace manicule {

void check_distance_input(const RowMatrix& rows) {
  if (rows.rows() < 2) {
    throw Error(ErrorKind::usage, "distances need at least two segments, not " +
                                      std::to_string(rows.rows()));
  }
  if (rows.cols() < 1) throw Error(ErrorKind::usage, "distances need at least one feature");
  if (!rows.allFinite()) {
    throw Error(ErrorKind::usage, "the feature values hold NaN or infinity");
  }
}

const RowMatrix& rows_to_sum(const RowMatrix& rows, const PairSumMeasure& how, RowMatrix& weighted) {
  if (!how.rank_weighted) return rows;
  const auto n = static_cast<double>(rows.cols());
  Eigen::RowVectorXd weights(rows.cols());
  for (Eigen::Index c = 0; c < rows.cols(); ++c) weights[c] = (n - static_cast<double>(c)) / n;
  weighted = rows.array().rowwise() * weights.array();
  return weighted;
}

PairSumMeasure pair_sum_measure(DistanceMeasure measure, Eigen::Index features) {
  const double per_feature = 1.0 / static_cast<double>(features);
  switch (measure) {
    case DistanceMeasure::burrows_delta:  // Burrows 2002: mean absolute z difference
      return {PairSum::absolute, per_feature, false, false};
    case DistanceMeasure::quadratic_delta:  // Argamon 2008: squared Euclidean on z
      return {PairSum::squared, 1.0, false, false};
    case DistanceMeasure::eder_delta:  // Eder et al. 2016: rank-weighted, divided by n
      return {PairSum::absolute, per_feature, false, true};
    case DistanceMeasure::manhattan:
      return {PairSum::absolute, 1.0, false, false};
    case DistanceMeasure::euclidean:
      return {PairSum::squared, 1.0, true, false};
    case DistanceMeasure::minmax:  // Ruzicka: 1 - sum min / sum max
      return {PairSum::min_max, 1.0, false, false};
    case DistanceMeasure::cosine_delta:
    case DistanceMeasure::cosine:
      break;
  }
  throw Error(ErrorKind::internal, "pair_sum_measure asked for a measure taken from a Gram matrix");
}

namespace {

// Lower triangle -> whole matrix: the distance of each sum, zero diagonal, mirror.
void finish(Eigen::MatrixXd& out, const PairSumMeasure& how) {
  const Eigen::Index n = out.rows();
  for (Eigen::Index j = 0; j < n; ++j) {
    out(j, j) = 0.0;
    for (Eigen::Index i = j + 1; i < n; ++i) {
      const double d = how.distance(out(i, j));
      out(i, j) = d;
      out(j, i) = d;
    }
  }
}

}  // namespace

Eigen::MatrixXd pairwise_distances(const RowMatrix& rows, DistanceMeasure measure,
                                   const DistanceOptions& options) {
  check_distance_input(rows);
  const Eigen::Index n = rows.rows();
  Eigen::MatrixXd out = zero_matrix<Eigen::MatrixXd>(n, n);
  if (uses_gram_matrix(measure)) {  // Smith & Aldridge 2011: cosine (on z for Cosine Delta)
    cosine_distances_by_gram(rows, options.threads, out);
    finish(out, PairSumMeasure{});
    return out;
  }
  const PairSumMeasure how = pair_sum_measure(measure, rows.cols());
  RowMatrix weighted;
  blocked_pair_sums(rows_to_sum(rows, how, weighted), how.kind, options.threads, out);
  finish(out, how);
  return out;
}

bool uses_gram_matrix(DistanceMeasure measure) {
  return measure == DistanceMeasure::cosine_delta || measure == DistanceMeasure::cosine;
}

const RowMatrix& measure_rows(const FeatureTable& table, DistanceMeasure measure) {
  return measure_info(measure).input == MeasureInput::z_scores ? table.z : table.relative;
}

DistanceMatrix distance_matrix(const FeatureTable& table, DistanceMeasure measure,
                               const DistanceOptions& options) {
  DistanceMatrix result;
  result.measure = measure;
  result.labels = table.segment_ids;
  result.values = pairwise_distances(measure_rows(table, measure), measure, options);
  return result;
}

}  // namespace manicule
