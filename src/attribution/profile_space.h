// ProfileSpace: the numbers attribution measures with, one row per measured segment (the
// rows of Analysis::table), and the distance between two profiles under the run's measure,
// on every feature or on a subset (for resampling and General Impostors).
// Values: z-scores for the Delta measures, limited to +-z_limit (0 = not limited);
// relative frequencies for the others. The formulas are those of measure/distance_measure.h,
// here for one pair of vectors at a time. Zero-variance features have z = 0 (see
// profile/feature_table.h), so they add nothing and never make a NaN; a profile of length
// 0 has no direction: cosine distances from it are 1 (0 to another such profile).
#pragma once
#include <cstddef>
#include <vector>

#include "measure/distance_measure.h"
#include "profile/feature_table.h"

namespace manicule {

using ColumnSubset = std::vector<Eigen::Index>;  // empty = every column

struct ProfileSpace {
  DistanceMeasure measure = DistanceMeasure::cosine_delta;
  RowMatrix values;

  Eigen::Index features() const { return values.cols(); }
  const double* row(std::size_t r) const { return values.data() + static_cast<Eigen::Index>(r) * values.cols(); }
};

ProfileSpace make_profile_space(const FeatureTable& table, DistanceMeasure measure, double z_limit);

// Distance between profiles a and b (each features() long) on `columns`.
double profile_distance(const ProfileSpace& space, const double* a, const double* b, const ColumnSubset& columns);

}  // namespace manicule
