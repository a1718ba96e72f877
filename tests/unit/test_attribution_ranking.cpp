// Unit tests for the numbers attribution measures with: profile distances with zero
// vectors and zero-variance features (never NaN), the candidate rules at their limits
// (worked by hand), and the seeded sampler against the published SplitMix64 sequence.
// Agreement with a numpy recomputation on real editions is in
// tests/reference/test_attribution_reference.py.
#include <catch2/catch.hpp>

#include <cmath>
#include <set>

#include "attribution/candidate_ranking.h"
#include "attribution/profile_space.h"
#include "attribution/seeded_sampler.h"

using namespace manicule;

namespace {
ProfileSpace space_of(std::initializer_list<std::initializer_list<double>> values,
                      DistanceMeasure measure = DistanceMeasure::cosine_delta) {
  ProfileSpace s;
  s.measure = measure;
  s.values.resize(static_cast<Eigen::Index>(values.size()), static_cast<Eigen::Index>(values.begin()->size()));
  Eigen::Index r = 0;
  for (const auto& row : values) {
    Eigen::Index c = 0;
    for (double v : row) s.values(r, c++) = v;
    ++r;
  }
  return s;
}
}  // namespace

TEST_CASE("a zero-variance table gives finite distances", "[attribution]") {
  // Column 2 has sd 0 across the run, so its z-scores are 0 (profile/feature_table.h);
  // row 2 is all zero (every feature at its mean): cosine has no direction for it.
  FeatureTable table;
  table.z = RowMatrix(3, 3);
  table.z << 1, -1, 0, -1, 1, 0, 0, 0, 0;
  table.relative = RowMatrix::Constant(3, 3, 0.01);
  const ProfileSpace s = make_profile_space(table, DistanceMeasure::cosine_delta, 2.0);
  CHECK(profile_distance(s, s.row(0), s.row(1), {}) == Approx(2.0));  // opposite directions
  CHECK(profile_distance(s, s.row(0), s.row(2), {}) == 1.0);         // zero vector: 1
  CHECK(profile_distance(s, s.row(2), s.row(2), {}) == 0.0);         // two zero vectors: 0
  for (DistanceMeasure m : {DistanceMeasure::burrows_delta, DistanceMeasure::minmax, DistanceMeasure::eder_delta,
                            DistanceMeasure::euclidean}) {
    const ProfileSpace t = make_profile_space(table, m, 0);
    for (std::size_t a = 0; a < 3; ++a)
      for (std::size_t b = 0; b < 3; ++b) CHECK(std::isfinite(profile_distance(t, t.row(a), t.row(b), {})));
  }
}

TEST_CASE("z-scores are limited before measuring", "[attribution]") {
  FeatureTable table;
  table.z = RowMatrix(1, 3);
  table.z << 5, -3, 1;
  table.relative = RowMatrix::Zero(1, 3);
  const ProfileSpace s = make_profile_space(table, DistanceMeasure::cosine_delta, 2.0);
  CHECK(s.values(0, 0) == 2.0);
  CHECK(s.values(0, 1) == -2.0);
  CHECK(s.values(0, 2) == 1.0);
  CHECK(make_profile_space(table, DistanceMeasure::cosine_delta, 0).values(0, 0) == 5.0);
}

TEST_CASE("candidate rules worked by hand", "[attribution]") {
  // q = (1, 0); the candidate's rows a = (1, 1) and b = (0, 1).
  // cos distance q-a = 1 - 1/sqrt(2); q-b = 1. Centroid (0.5, 1): 1 - 0.5/sqrt(1.25).
  const ProfileSpace s = space_of({{1, 0}, {1, 1}, {0, 1}});
  const std::vector<std::size_t> rows{1, 2};
  const std::vector<double> d{1 - 1 / std::sqrt(2.0), 1.0};
  const double* q = s.row(0);
  CHECK(distance_to_candidate(s, q, rows, d, CandidateRule::nearest, 0.2, {}) == Approx(1 - 1 / std::sqrt(2.0)));
  CHECK(distance_to_candidate(s, q, rows, d, CandidateRule::centroid, 0.2, {}) == Approx(1 - 0.5 / std::sqrt(1.25)));
  // The weighted centroid lies between: with a vast spread it is the centroid, with a tiny
  // one the nearest row (weights exp(-(d/d_min - 1)/spread)).
  CHECK(distance_to_candidate(s, q, rows, d, CandidateRule::weighted_centroid, 1e12, {}) ==
        Approx(1 - 0.5 / std::sqrt(1.25)));
  CHECK(distance_to_candidate(s, q, rows, d, CandidateRule::weighted_centroid, 1e-3, {}) ==
        Approx(1 - 1 / std::sqrt(2.0)));
  // spread 1: w_b = exp(-(1/d_a - 1)) = exp(-(sqrt 2 + 1 - 1)) ... worked out:
  const double w = std::exp(-(1.0 / (1 - 1 / std::sqrt(2.0)) - 1.0));
  const double x = 1 / (1 + w), y = 1;  // centre = (a + w b) / (1 + w) = (1, 1 + w)/(1 + w)
  const double expected = 1 - x / std::sqrt(x * x + y * y);
  CHECK(distance_to_candidate(s, q, rows, d, CandidateRule::weighted_centroid, 1.0, {}) == Approx(expected));
}

TEST_CASE("rank_candidates orders by distance and skips empty candidates", "[attribution]") {
  const ProfileSpace s = space_of({{1, 0}, {0.9, 0.1}, {0, 1}, {-1, 0}});
  const auto ranked = rank_candidates(s, s.row(0), {{2}, {}, {1}, {3}}, CandidateRule::weighted_centroid, 0.2, {});
  REQUIRE(ranked.size() == 3);
  CHECK(ranked[0].candidate == 2);
  CHECK(ranked[1].candidate == 0);
  CHECK(ranked[2].candidate == 3);
  CHECK(ranked[2].distance == Approx(2.0));
  // On column 1 alone q is a zero vector: 0 from candidate 3 (also zero there), 1 from the
  // others, whose tie keeps candidate order.
  const auto on_one = rank_candidates(s, s.row(0), {{2}, {}, {1}, {3}}, CandidateRule::nearest, 0.2, {1});
  CHECK(on_one[0].candidate == 3);
  CHECK(on_one[1].candidate == 0);
  CHECK(on_one[2].candidate == 2);
}

TEST_CASE("the sampler follows SplitMix64", "[attribution]") {
  // First outputs of SplitMix64 (Steele, Lea & Flood 2014) from state 0, the test vector
  // of Vigna's reference implementation splitmix64.c.
  SeededSampler s(0);
  CHECK(s.next() == 0xe220a8397b1dcdafULL);
  CHECK(s.next() == 0x6e789e6aa1b965f4ULL);
  CHECK(s.next() == 0x06c45d188009454fULL);
  CHECK(s.next() == 0xf88bb8a8724c81ecULL);
}

TEST_CASE("choose draws distinct values in range", "[attribution]") {
  SeededSampler s(7);
  for (std::size_t k : {0u, 1u, 5u, 10u}) {
    const auto drawn = s.choose(10, k);
    CHECK(drawn.size() == k);
    std::set<std::size_t> distinct(drawn.begin(), drawn.end());
    CHECK(distinct.size() == k);
    for (std::size_t v : drawn) CHECK(v < 10);
  }
  for (int i = 0; i < 1000; ++i) CHECK(s.below(3) < 3);
}
