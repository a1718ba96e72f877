// Distance matrices: every segment against every other under one DistanceMeasure.
// The result is n x n, symmetric, with an exact zero diagonal and no negative values
// (rounding below zero is clamped to 0). Errors: usage if fewer than two rows, or if the
// input holds NaN or infinity.
// Speed: cosine measures are one matrix product of length-normalised rows; the others are
// blocked, vectorised loops (blocked_pairs.h). Both run on `threads` threads (0 = all).
#pragma once
#include <algorithm>
#include <cmath>
#include <string>
#include <vector>

#include <Eigen/Dense>

#include "measure/blocked_pairs.h"
#include "measure/distance_measure.h"
#include "profile/feature_table.h"

namespace manicule {

struct DistanceOptions {
  unsigned threads = 0;  // 0 = every hardware thread
};

struct DistanceMatrix {
  DistanceMeasure measure = DistanceMeasure::burrows_delta;
  std::vector<std::string> labels;  // segment ids, one per row and column
  Eigen::MatrixXd values;
};

// The measure's formula applied to the rows as given: z-scores for the Delta measures,
// relative frequencies for the others (see distance_measure.h). For eder-delta the columns
// must be in rank order.
Eigen::MatrixXd pairwise_distances(const RowMatrix& rows, DistanceMeasure measure,
                                   const DistanceOptions& options = {});

// Refuses what pairwise_distances refuses: fewer than two rows, no column, NaN or infinity
// (Error usage).
void check_distance_input(const RowMatrix& rows);

// Whether pairwise_distances takes this measure from a Gram matrix (the BLAS, opened at
// the first one; open_blas() in cosine_gram.h opens it ahead).
bool uses_gram_matrix(DistanceMeasure measure);

// A measure not taken from a Gram matrix: a sum over each pair of rows (blocked_pairs.h)
// and what makes the distance of it, the same for the whole matrix and for the nearest
// rows found a band at a time (nearest_rows.h).
struct PairSumMeasure {
  PairSum kind = PairSum::absolute;
  double scale = 1.0;
  bool take_root = false;
  bool rank_weighted = false;  // Eder's Delta: the sums are over rows weighted by rank (rows_to_sum)
  double distance(double sum) const {
    const double d = std::max(0.0, sum) * scale;  // rounding below zero clamped
    return take_root ? std::sqrt(d) : d;
  }
};

// For a measure that uses_gram_matrix() does not name, over rows of `features` values.
PairSumMeasure pair_sum_measure(DistanceMeasure measure, Eigen::Index features);

// The rows whose pairs the measure sums: `rows` itself, or for Eder's Delta the rows
// weighted (n - i + 1) / n at rank position i = 1..n, made in `weighted`.
const RowMatrix& rows_to_sum(const RowMatrix& rows, const PairSumMeasure& how, RowMatrix& weighted);

// The table's rows the measure's formula takes: z-scores or relative frequencies.
const RowMatrix& measure_rows(const FeatureTable& table, DistanceMeasure measure);

// Picks table.z or table.relative as the measure requires.
DistanceMatrix distance_matrix(const FeatureTable& table, DistanceMeasure measure,
                               const DistanceOptions& options = {});

}  // namespace manicule
