#include "attribution/candidate_ranking.h"

#include <algorithm>
#include <cmath>

namespace manicule {

namespace {

// Weights of the rows in the weighted centroid: exp(-(d / d_min - 1) / spread). When the
// nearest row coincides with q (d_min = 0) only the rows at distance 0 count.
std::vector<double> nearness_weights(const std::vector<double>& d, double spread) {
  const double d_min = *std::min_element(d.begin(), d.end());
  std::vector<double> w(d.size());
  for (std::size_t j = 0; j < d.size(); ++j) {
    if (d_min <= 0) {
      w[j] = d[j] <= 0 ? 1.0 : 0.0;
    } else {
      w[j] = std::exp(-(d[j] / d_min - 1.0) / spread);
    }
  }
  return w;
}

}  // namespace

double distance_to_candidate(const ProfileSpace& space, const double* q, const std::vector<std::size_t>& rows,
                             const std::vector<double>& row_distances, CandidateRule rule, double spread,
                             const ColumnSubset& columns) {
  if (rule == CandidateRule::nearest) return *std::min_element(row_distances.begin(), row_distances.end());
  if (rows.size() == 1) return row_distances.front();
  std::vector<double> w = rule == CandidateRule::centroid ? std::vector<double>(rows.size(), 1.0)
                                                          : nearness_weights(row_distances, spread);
  double total = 0;
  for (double x : w) total += x;
  Eigen::RowVectorXd centre = Eigen::RowVectorXd::Zero(space.features());
  for (std::size_t j = 0; j < rows.size(); ++j) {
    if (w[j] == 0) continue;
    const double share = w[j] / total;
    const double* x = space.row(rows[j]);
    if (columns.empty()) {
      centre += share * Eigen::Map<const Eigen::RowVectorXd>(x, space.features());
    } else {
      for (Eigen::Index c : columns) centre[c] += share * x[c];
    }
  }
  return profile_distance(space, q, centre.data(), columns);
}

std::vector<CandidateMeasure> rank_candidates(const ProfileSpace& space, const double* q,
                                              const std::vector<std::vector<std::size_t>>& candidate_rows,
                                              CandidateRule rule, double spread, const ColumnSubset& columns) {
  std::vector<CandidateMeasure> out;
  for (std::size_t c = 0; c < candidate_rows.size(); ++c) {
    const auto& rows = candidate_rows[c];
    if (rows.empty()) continue;
    std::vector<double> d(rows.size());
    for (std::size_t j = 0; j < rows.size(); ++j) d[j] = profile_distance(space, q, space.row(rows[j]), columns);
    const auto nearest = static_cast<std::size_t>(std::min_element(d.begin(), d.end()) - d.begin());
    CandidateMeasure m;
    m.candidate = c;
    m.nearest_distance = d[nearest];
    m.nearest_row = rows[nearest];
    m.distance = distance_to_candidate(space, q, rows, d, rule, spread, columns);
    out.push_back(m);
  }
  std::stable_sort(out.begin(), out.end(),
                   [](const CandidateMeasure& a, const CandidateMeasure& b) { return a.distance < b.distance; });
  return out;
}

std::string rule_option_name(CandidateRule rule) {
  switch (rule) {
    case CandidateRule::weighted_centroid: return "weighted-centroid";
    case CandidateRule::centroid: return "centroid";
    case CandidateRule::nearest: return "nearest";
  }
  return "weighted-centroid";
}

CandidateRule rule_from_option_name(const std::string& name) {
  for (CandidateRule rule : {CandidateRule::centroid, CandidateRule::nearest})
    if (name == rule_option_name(rule)) return rule;
  return CandidateRule::weighted_centroid;
}

std::string rule_name(CandidateRule rule) {
  switch (rule) {
    case CandidateRule::weighted_centroid: return "weighted centroid";
    case CandidateRule::centroid: return "centroid";
    case CandidateRule::nearest: return "nearest segment";
  }
  return "weighted centroid";
}

}  // namespace manicule
