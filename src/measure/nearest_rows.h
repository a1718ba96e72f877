// nearest_rows: the k nearest other rows of every row under a distance measure, without
// the n x n distance matrix: for a cosine measure the dot products are taken a block of
// rows at a time (a BLAS matrix product of the block against itself and the rows after
// it, so each pair once), for the others the pair sums (see the end), and each row keeps
// its k best as they go by. An archive's analysis needs only the nearest segments, and
// the matrix grows with the square of the segments: 51 MiB for the 2,538 long chapters of
// the English novels, 3.2 GiB for 20,000 segments; on the virtual machines we measure on,
// every fresh page of it costs a page fault and the host's zeroing as well.
// The cosine measures' products are screened in single precision, which halves the one
// cubic step (the novels' 2,538 x 2,538 x 1,000: 97 ms in double, 50 ms in single on two
// cores here): each row keeps every row whose single-precision similarity is within a
// proven rounding bound (and 1e-9) of its k-th largest, and only those candidates are
// measured in double precision, each pair as one dot product of the rows as they are.
// The result is the double-precision k nearest, whatever the single-precision rounding;
// ties (equal distances, in row order) included, since rows that tie are all candidates.
// Distances are those pairwise_distances gives, from the same formula on dot products
// that may be rounded differently (summed in another order: within a few units in the
// last place). The other measures sum each pair of a band of rows against the rows after
// it (blocked_pairs.h), a band at a time as well, with the distances of their full matrix
// to the last bit.
#pragma once
#include <cstddef>
#include <functional>
#include <vector>

#include "measure/distance_measure.h"
#include "measure/pairwise_distances.h"
#include "profile/feature_table.h"

namespace manicule {

struct NearRow {
  std::size_t row = 0;
  double distance = 0;
};

struct NearestOptions {
  DistanceOptions distance;
  std::size_t block_rows = 0;  // rows a block; 0 = some 4 MiB of dot products a block, 256 rows at least
  // Screen in single precision first (see above); off: every pair in double precision.
  bool screen = true;
  // Told, on the calling thread, after each block of rows but the last the share of the
  // search done so far, by the block products computed (a block's count x the rows from
  // its first on), and 1 when the search is done; may be empty.
  std::function<void(double)> progress;
};

// For each row, min(k, n - 1) other rows, nearest first; equal distances in row order.
// The same errors as pairwise_distances (fewer than two rows, NaN or infinity).
std::vector<std::vector<NearRow>> nearest_rows(const RowMatrix& rows, DistanceMeasure measure, std::size_t k,
                                               const NearestOptions& options = {});

// The k nearest of each row of a full distance matrix (symmetric), the same way.
std::vector<std::vector<NearRow>> nearest_in_matrix(const Eigen::MatrixXd& distances, std::size_t k,
                                                    unsigned threads);

}  // namespace manicule
