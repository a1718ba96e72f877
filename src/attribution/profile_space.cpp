#include "attribution/profile_space.h"

#include <algorithm>
#include <cmath>

namespace manicule {

ProfileSpace make_profile_space(const FeatureTable& table, DistanceMeasure measure, double z_limit) {
  ProfileSpace space;
  space.measure = measure;
  if (measure_info(measure).input == MeasureInput::z_scores) {
    space.values = table.z;
    if (z_limit > 0) space.values = space.values.cwiseMax(-z_limit).cwiseMin(z_limit);
  } else {
    space.values = table.relative;
  }
  return space;
}

namespace {

// Sums over the chosen columns: |a-b|, (a-b)^2, a.b, a.a, b.b, min, max, rank-weighted |a-b|.
struct PairSums {
  double absolute = 0, squared = 0, dot = 0, aa = 0, bb = 0, min = 0, max = 0, weighted = 0;
  double count = 0;
};

template <typename Each>
void for_columns(Eigen::Index n, const ColumnSubset& columns, Each each) {
  if (columns.empty()) {
    for (Eigen::Index c = 0; c < n; ++c) each(c);
  } else {
    for (Eigen::Index c : columns) each(c);
  }
}

}  // namespace

double profile_distance(const ProfileSpace& space, const double* a, const double* b, const ColumnSubset& columns) {
  const Eigen::Index n = space.features();
  PairSums s;
  const DistanceMeasure m = space.measure;
  for_columns(n, columns, [&](Eigen::Index c) {
    const double x = a[c], y = b[c], d = x - y;
    s.count += 1;
    switch (m) {
      case DistanceMeasure::burrows_delta:
      case DistanceMeasure::manhattan: s.absolute += std::abs(d); break;
      case DistanceMeasure::quadratic_delta:
      case DistanceMeasure::euclidean: s.squared += d * d; break;
      case DistanceMeasure::eder_delta:  // Eder's weight of the feature at rank position c
        s.weighted += std::abs(d) * static_cast<double>(n - c) / static_cast<double>(n);
        break;
      case DistanceMeasure::cosine_delta:
      case DistanceMeasure::cosine:
        s.dot += x * y;
        s.aa += x * x;
        s.bb += y * y;
        break;
      case DistanceMeasure::minmax:
        s.min += std::min(x, y);
        s.max += std::max(x, y);
        break;
    }
  });
  double d = 0;
  switch (m) {
    case DistanceMeasure::burrows_delta: d = s.count > 0 ? s.absolute / s.count : 0; break;
    case DistanceMeasure::manhattan: d = s.absolute; break;
    case DistanceMeasure::quadratic_delta: d = s.squared; break;
    case DistanceMeasure::euclidean: d = std::sqrt(s.squared); break;
    case DistanceMeasure::eder_delta: d = s.count > 0 ? s.weighted / s.count : 0; break;
    case DistanceMeasure::cosine_delta:
    case DistanceMeasure::cosine:
      if (s.aa == 0 || s.bb == 0) {
        d = (s.aa == 0 && s.bb == 0) ? 0 : 1;
      } else {
        d = 1 - s.dot / std::sqrt(s.aa * s.bb);
      }
      break;
    case DistanceMeasure::minmax: d = s.max > 0 ? 1 - s.min / s.max : 0; break;
  }
  return std::isfinite(d) ? std::max(0.0, d) : 0.0;
}

}  // namespace manicule
