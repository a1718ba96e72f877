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

namespace {

// Eder's weights (n - i + 1) / n for the feature at rank position i = 1..n.
RowMatrix weighted_by_rank(const RowMatrix& rows) {
  const auto n = static_cast<double>(rows.cols());
  Eigen::RowVectorXd weights(rows.cols());
  for (Eigen::Index c = 0; c < rows.cols(); ++c) weights[c] = (n - static_cast<double>(c)) / n;
  return rows.array().rowwise() * weights.array();
}

// Lower triangle -> whole matrix: clamp, scale, zero diagonal, mirror.
void finish(Eigen::MatrixXd& out, double scale, bool take_root) {
  const Eigen::Index n = out.rows();
  for (Eigen::Index j = 0; j < n; ++j) {
    out(j, j) = 0.0;
    for (Eigen::Index i = j + 1; i < n; ++i) {
      double d = std::max(0.0, out(i, j)) * scale;
      if (take_root) d = std::sqrt(d);
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
  const double features = static_cast<double>(rows.cols());
  Eigen::MatrixXd out = zero_matrix<Eigen::MatrixXd>(n, n);
  switch (measure) {
    case DistanceMeasure::burrows_delta:  // Burrows 2002: mean absolute z difference
      blocked_pair_sums(rows, PairSum::absolute, options.threads, out);
      finish(out, 1.0 / features, false);
      break;
    case DistanceMeasure::quadratic_delta:  // Argamon 2008: squared Euclidean on z
      blocked_pair_sums(rows, PairSum::squared, options.threads, out);
      finish(out, 1.0, false);
      break;
    case DistanceMeasure::eder_delta:  // Eder et al. 2016: rank-weighted, divided by n
      blocked_pair_sums(weighted_by_rank(rows), PairSum::absolute, options.threads, out);
      finish(out, 1.0 / features, false);
      break;
    case DistanceMeasure::manhattan:
      blocked_pair_sums(rows, PairSum::absolute, options.threads, out);
      finish(out, 1.0, false);
      break;
    case DistanceMeasure::euclidean:
      blocked_pair_sums(rows, PairSum::squared, options.threads, out);
      finish(out, 1.0, true);
      break;
    case DistanceMeasure::cosine_delta:  // Smith & Aldridge 2011: cosine on z
    case DistanceMeasure::cosine:       // (uses_gram_matrix names these two)
      cosine_distances_by_gram(rows, options.threads, out);
      finish(out, 1.0, false);
      break;
    case DistanceMeasure::minmax:  // Ruzicka: 1 - sum min / sum max
      blocked_pair_sums(rows, PairSum::min_max, options.threads, out);
      finish(out, 1.0, false);
      break;
  }
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
