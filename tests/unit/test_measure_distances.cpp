// Unit tests for distance matrices: shape guarantees (symmetry, zero diagonal, no NaN),
// the documented edge cases, and small values worked by hand from the formulas in
// distance_measure.h. Agreement with SciPy on real data is in
// tests/reference/test_measures_*.py.
#include <catch2/catch.hpp>

#include <algorithm>
#include <cmath>
#include <utility>
#include <vector>

#include "core/error.h"
#include "measure/blocked_pairs.h"
#include "measure/cosine_gram.h"
#include "measure/pairwise_distances.h"
#include "profile/feature_space.h"
#include "profile/profile_builder.h"

using namespace manicule;

namespace {
RowMatrix rows_of(std::initializer_list<std::initializer_list<double>> values) {
  RowMatrix m(static_cast<Eigen::Index>(values.size()), static_cast<Eigen::Index>(values.begin()->size()));
  Eigen::Index r = 0;
  for (const auto& row : values) {
    Eigen::Index c = 0;
    for (double v : row) m(r, c++) = v;
    ++r;
  }
  return m;
}

const DistanceMeasure kAll[] = {DistanceMeasure::burrows_delta, DistanceMeasure::quadratic_delta,
                                DistanceMeasure::eder_delta,    DistanceMeasure::cosine_delta,
                                DistanceMeasure::manhattan,     DistanceMeasure::euclidean,
                                DistanceMeasure::cosine,        DistanceMeasure::minmax};
}  // namespace

TEST_CASE("hand-worked distances between two rows", "[measure]") {
  const RowMatrix x = rows_of({{1, 2, 0}, {3, 0, 0}});
  auto d = [&](DistanceMeasure m) { return pairwise_distances(x, m)(1, 0); };
  CHECK(d(DistanceMeasure::burrows_delta) == Approx(4.0 / 3.0));  // (2 + 2 + 0) / 3
  CHECK(d(DistanceMeasure::manhattan) == Approx(4.0));
  CHECK(d(DistanceMeasure::quadratic_delta) == Approx(8.0));
  CHECK(d(DistanceMeasure::euclidean) == Approx(std::sqrt(8.0)));
  // weights 3/3, 2/3, 1/3: (2 + 4/3 + 0) / 3
  CHECK(d(DistanceMeasure::eder_delta) == Approx((2.0 + 4.0 / 3.0) / 3.0));
  CHECK(d(DistanceMeasure::cosine) == Approx(1.0 - 3.0 / (std::sqrt(5.0) * 3.0)));
  // min: 1 + 0 + 0, max: 3 + 2 + 0
  CHECK(d(DistanceMeasure::minmax) == Approx(1.0 - 1.0 / 5.0));
}

TEST_CASE("every measure is symmetric with a zero diagonal and no negative values", "[measure]") {
  RowMatrix x = RowMatrix::Random(37, 23).cwiseAbs();  // odd sizes exercise the block edges
  for (DistanceMeasure m : kAll) {
    for (unsigned threads : {1u, 2u, 3u}) {
      const Eigen::MatrixXd d = pairwise_distances(x, m, {threads});
      REQUIRE(d.allFinite());
      REQUIRE(d.isApprox(d.transpose(), 0.0));
      REQUIRE(d.diagonal().isZero(0.0));
      REQUIRE(d.minCoeff() >= 0.0);
    }
  }
}

TEST_CASE("the blocked loops agree with a plain pair loop", "[measure]") {
  const RowMatrix x = RowMatrix::Random(41, 13);
  const Eigen::MatrixXd d = pairwise_distances(x, DistanceMeasure::manhattan, {2});
  for (Eigen::Index i = 0; i < x.rows(); ++i) {
    for (Eigen::Index j = 0; j < x.rows(); ++j) {
      REQUIRE(d(i, j) == Approx((x.row(i) - x.row(j)).cwiseAbs().sum()).margin(1e-12));
    }
  }
}

TEST_CASE("identical segments are at distance 0 under every measure", "[measure][edge]") {
  ProfileBuilder builder;
  const std::vector<std::string> text = {"one", "two", "two", "three", "three", "three"};
  builder.add_segment("a", text);
  builder.add_segment("b", text);
  builder.add_segment("c", {"one", "one", "two", "three", "four", "four"});
  FeatureSpaceOptions options;
  options.min_segment_tokens = 1;
  const FeatureTable table = build_feature_table(builder.finish(), options);
  for (DistanceMeasure m : kAll) {
    const DistanceMatrix d = distance_matrix(table, m);
    CHECK(d.values(0, 1) == 0.0);
    CHECK(d.values(0, 2) > 0.0);
  }
}

TEST_CASE("distances need two segments and finite values", "[measure][edge]") {
  try {
    pairwise_distances(rows_of({{1, 2}}), DistanceMeasure::burrows_delta);
    FAIL("expected an error");
  } catch (const Error& e) {
    CHECK(e.kind() == ErrorKind::usage);
  }
  CHECK_THROWS_AS(pairwise_distances(rows_of({{1, NAN}, {0, 1}}), DistanceMeasure::cosine), Error);
}

TEST_CASE("zero vectors give cosine 0 or 1, minmax 0, never NaN", "[measure][edge]") {
  const RowMatrix x = rows_of({{0, 0}, {0, 0}, {1, 1}});
  const Eigen::MatrixXd cosine = pairwise_distances(x, DistanceMeasure::cosine);
  CHECK(cosine(1, 0) == 0.0);
  CHECK(cosine(2, 0) == 1.0);
  CHECK(pairwise_distances(x, DistanceMeasure::minmax)(1, 0) == 0.0);
}

TEST_CASE("measure names round-trip", "[measure]") {
  for (const MeasureInfo& info : all_distance_measures()) {
    CHECK(parse_distance_measure(info.name) == info.measure);
    CHECK_FALSE(info.citation.empty());
  }
  CHECK_THROWS_AS(parse_distance_measure("delta"), Error);
}

TEST_CASE("baseline and AVX2 loops both agree with plain Eigen sums", "[measure]") {
  // The processor running the tests decides which path `best` takes; `baseline` is the
  // path of processors without AVX2. Both are checked against Eigen's own reductions.
  const RowMatrix x = RowMatrix::Random(19, 31).cwiseAbs();
  for (SimdLevel simd : {SimdLevel::best, SimdLevel::baseline}) {
    for (PairSum kind : {PairSum::absolute, PairSum::squared, PairSum::min_max}) {
      Eigen::MatrixXd out = Eigen::MatrixXd::Zero(19, 19);
      blocked_pair_sums(x, kind, 2, out, simd);
      for (Eigen::Index i = 1; i < 19; ++i) {
        for (Eigen::Index j = 0; j < i; ++j) {
          const auto a = x.row(i).array();
          const auto b = x.row(j).array();
          const double expected = kind == PairSum::absolute  ? (a - b).abs().sum()
                                  : kind == PairSum::squared ? (a - b).square().sum()
                                                             : 1.0 - a.min(b).sum() / a.max(b).sum();
          REQUIRE(out(i, j) == Approx(expected).epsilon(1e-13));
        }
      }
    }
  }
}

TEST_CASE("a band's pair sums: the definition, and the whole matrix's to the last bit", "[measure]") {
  // blocked_pairs.h promises each band pair the same sum as blocked_pair_sums gives it (so
  // that nearest segments found a band at a time have the full matrix's distances), and
  // both sides of a pair inside the band. Bands of many shapes: one row, an odd count,
  // the last rows, one band holding all; 23 rows of 37 columns, so that neither the tiles
  // of 16 rows nor the 4-wide vectors divide them.
  const RowMatrix x = RowMatrix::Random(23, 37).cwiseAbs();
  const Eigen::Index n = x.rows();
  for (SimdLevel simd : {SimdLevel::best, SimdLevel::baseline}) {
    for (PairSum kind : {PairSum::absolute, PairSum::squared, PairSum::min_max}) {
      Eigen::MatrixXd whole = Eigen::MatrixXd::Zero(n, n);
      blocked_pair_sums(x, kind, 2, whole, simd);
      for (const auto& [first, count] : std::vector<std::pair<Eigen::Index, Eigen::Index>>{
               {0, 1}, {0, 5}, {3, 7}, {16, 7}, {22, 1}, {0, 23}, {5, 18}}) {
        const Eigen::Index rest = n - first;
        std::vector<double> band(static_cast<std::size_t>(count * rest), -1.0);
        blocked_pair_sums_band(x, kind, first, count, band.data(), 2, simd);
        for (Eigen::Index c = 0; c < count; ++c) {
          for (Eigen::Index r = 0; r < rest; ++r) {
            const double got = band[static_cast<std::size_t>(c + count * r)];
            if (r == c) {
              REQUIRE(got == -1.0);  // a row with itself is not written
              continue;
            }
            const Eigen::Index i = first + c, j = first + r;
            REQUIRE(got == whole(std::max(i, j), std::min(i, j)));
            const auto a = x.row(i).array();
            const auto b = x.row(j).array();
            const double expected = kind == PairSum::absolute  ? (a - b).abs().sum()
                                    : kind == PairSum::squared ? (a - b).square().sum()
                                                               : 1.0 - a.min(b).sum() / a.max(b).sum();
            REQUIRE(got == Approx(expected).epsilon(1e-13));
          }
        }
      }
    }
  }
}

TEST_CASE("the Gram matrix by the BLAS and by Eigen's own product agree with plain dot products", "[measure]") {
  // gram_lower uses the BLAS (opened at run time) when there is one and Eigen otherwise;
  // both must give the dot products computed here one by one (the definition). Values are
  // a fixed pseudo-random pattern with both signs, 37 rows of 53 columns.
  RowMatrix rows(37, 53);
  for (Eigen::Index r = 0; r < rows.rows(); ++r)
    for (Eigen::Index c = 0; c < rows.cols(); ++c) rows(r, c) = std::sin(0.7 * static_cast<double>(r * 53 + c)) * (1 + r % 5);
  for (bool allow_blas : {true, false}) {
    Eigen::MatrixXd gram;
    gram_lower(rows, gram, allow_blas);
    REQUIRE(gram.rows() == rows.rows());
    for (Eigen::Index i = 0; i < rows.rows(); ++i)
      for (Eigen::Index j = 0; j <= i; ++j) {
        double dot = 0;
        for (Eigen::Index c = 0; c < rows.cols(); ++c) dot += rows(i, c) * rows(j, c);
        REQUIRE(gram(i, j) == Approx(dot).epsilon(1e-12).margin(1e-12));
      }
  }
}
