// Unit tests for PCA, clustering, Newick and consensus: edge cases and small examples
// worked by hand. Agreement with scikit-learn and SciPy is checked in
// tests/reference/test_measures_*.py.
#include <catch2/catch.hpp>

#include "core/error.h"
#include "measure/consensus_tree.h"
#include "measure/newick.h"
#include "measure/pca.h"

using namespace manicule;

TEST_CASE("PCA of points on a line has one component carrying all variance", "[measure]") {
  RowMatrix x(4, 2);
  x << 0, 0, 1, 2, 2, 4, 3, 6;  // direction (1, 2) / sqrt(5)
  const PcaResult p = principal_components(x, {3, 1, PcaInput::z_scores});
  REQUIRE(p.coordinates.cols() == 2);  // min(n - 1, features)
  CHECK(p.explained_variance_ratio[0] == Approx(1.0));
  CHECK(p.explained_variance_ratio[1] == Approx(0.0).margin(1e-12));
  CHECK(p.loadings(1, 0) == Approx(2.0 / std::sqrt(5.0)));  // largest loading made positive
  CHECK(p.loadings(0, 0) == Approx(1.0 / std::sqrt(5.0)));
  // Coordinates are the centred points projected: (t - 1.5) * sqrt(5).
  CHECK(p.coordinates(0, 0) == Approx(-1.5 * std::sqrt(5.0)));
  // var of the projections (divisor n - 1) = 5 * var(0,1,2,3) = 5 * 5/3
  CHECK(p.explained_variance[0] == Approx(25.0 / 3.0));
  REQUIRE(p.poles[0].positive.size() == 1);
  CHECK(p.poles[0].positive[0].feature == 1);
  CHECK(p.poles[0].negative.empty());
  CHECK(p.coordinates.col(1).isZero(1e-12));  // rounding-noise component set to 0
  CHECK_THROWS_AS(principal_components(x.topRows(1)), Error);
}

TEST_CASE("linkage on a hand-worked distance matrix", "[measure]") {
  // a-b 1, c-d 2, {a,b}-{c,d}: complete 6, average 4.5
  Eigen::MatrixXd d(4, 4);
  d << 0, 1, 4, 5,
       1, 0, 4, 6,
       4, 4, 0, 2,
       5, 6, 2, 0;
  const Dendrogram complete = hierarchical_clustering(d, {"a", "b", "c", "d"}, LinkageMethod::complete);
  REQUIRE(complete.merges.size() == 3);
  CHECK(complete.merges[0].a == 0);
  CHECK(complete.merges[0].b == 1);
  CHECK(complete.merges[0].height == 1.0);
  CHECK(complete.merges[1].a == 2);
  CHECK(complete.merges[1].b == 3);
  CHECK(complete.merges[2].a == 4);
  CHECK(complete.merges[2].b == 5);
  CHECK(complete.merges[2].height == 6.0);
  CHECK(complete.merges[2].size == 4);
  const Dendrogram average = hierarchical_clustering(d, {"a", "b", "c", "d"}, LinkageMethod::average);
  CHECK(average.merges[2].height == Approx((4 + 5 + 4 + 6) / 4.0));
  CHECK(to_newick(complete) == "((a:1,b:1):5,(c:2,d:2):4);");
}

TEST_CASE("linkage refuses what is not a distance matrix", "[measure][edge]") {
  Eigen::MatrixXd one = Eigen::MatrixXd::Zero(1, 1);
  CHECK_THROWS_AS(hierarchical_clustering(one, {"a"}, LinkageMethod::ward), Error);
  Eigen::MatrixXd skew(2, 2);
  skew << 0, 1, 2, 0;
  CHECK_THROWS_AS(hierarchical_clustering(skew, {"a", "b"}, LinkageMethod::ward), Error);
  Eigen::MatrixXd fine(2, 2);
  fine << 0, 1, 1, 0;
  CHECK_THROWS_AS(hierarchical_clustering(fine, {"a"}, LinkageMethod::ward), Error);
}

TEST_CASE("Newick labels are quoted where the format needs it", "[measure]") {
  CHECK(newick_label("Anna") == "Anna");
  CHECK(newick_label("Anna Maria") == "'Anna Maria'");
  CHECK(newick_label("O'Hara") == "'O''Hara'");
  CHECK(newick_label("file#sp:1") == "'file#sp:1'");
  CHECK(newick_label("a_b") == "'a_b'");
  CHECK(newick_label("") == "''");
  CHECK(newick_number(0.1) == "0.1");
}

TEST_CASE("majority-rule consensus keeps clades found in more than half the trees", "[measure]") {
  auto tree = [](std::vector<Merge> merges) {
    Dendrogram d;
    d.labels = {"a", "b", "c", "d"};
    d.merges = std::move(merges);
    return d;
  };
  // ((a,b),(c,d)) twice and ((a,c),b),d) once: {a,b} and {c,d} in 2 of 3 trees.
  const Dendrogram ab_cd = tree({{0, 1, 1, 2}, {2, 3, 2, 2}, {4, 5, 3, 4}});
  const Dendrogram ac = tree({{0, 2, 1, 2}, {1, 4, 2, 3}, {3, 5, 3, 4}});
  const ConsensusTree c = majority_consensus({ab_cd, ac, ab_cd});
  REQUIRE(c.clades.size() == 2);
  CHECK(c.clades[0].members == std::vector<std::size_t>{0, 1});
  CHECK(c.clades[0].appearances == 2);
  CHECK(c.clades[0].support == Approx(2.0 / 3.0));
  CHECK(to_newick(c) == "((a,b)67,(c,d)67);");
  // With one tree against one, nothing has a majority: a star tree.
  CHECK(to_newick(majority_consensus({ab_cd, ac})) == "(a,b,c,d);");
  CHECK_THROWS_AS(majority_consensus({}), Error);
}
