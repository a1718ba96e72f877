// Unit tests for top_eigenpairs (measure/top_eigenpairs.h): the k largest eigenpairs of a
// symmetric matrix, by LAPACK's dsyevr where the BLAS library carries it, against Eigen's
// SelfAdjointEigenSolver (all pairs, computed here independently) and against the
// definition A v = lambda v. The matrix is a Gram matrix of random rows plus a diagonal
// that spreads its eigenvalues apart, so that each eigenvector is defined up to its sign.
#include <catch2/catch.hpp>

#include <cmath>

#include "measure/top_eigenpairs.h"

using namespace manicule;

TEST_CASE("top eigenpairs: Eigen's solver and the definition", "[measure][pca]") {
  for (const Eigen::Index size : {2, 7, 120}) {
    const Eigen::MatrixXd rows = Eigen::MatrixXd::Random(size + 5, size);
    Eigen::MatrixXd a = rows.transpose() * rows;
    for (Eigen::Index i = 0; i < size; ++i) a(i, i) += 3.0 * static_cast<double>(i);
    const Eigen::SelfAdjointEigenSolver<Eigen::MatrixXd> reference(a);
    REQUIRE(reference.info() == Eigen::Success);
    for (const Eigen::Index k : {Eigen::Index{1}, std::min<Eigen::Index>(2, size), size}) {
      Eigen::MatrixXd lower = a.triangularView<Eigen::Lower>();  // the upper triangle is not read
      const Eigenpairs top = top_eigenpairs(lower, k);
      REQUIRE(top.values.size() == k);
      REQUIRE(top.vectors.cols() == k);
      const double scale = reference.eigenvalues().cwiseAbs().maxCoeff();
      for (Eigen::Index c = 0; c < k; ++c) {
        const Eigen::Index r = size - 1 - c;  // Eigen's values ascend
        CHECK(std::abs(top.values[c] - reference.eigenvalues()[r]) <= 1e-12 * scale);
        const Eigen::VectorXd v = top.vectors.col(c);
        CHECK(std::abs(v.norm() - 1.0) <= 1e-12);
        CHECK((a * v - top.values[c] * v).norm() <= 1e-10 * scale);
        const double agreement = std::abs(v.dot(reference.eigenvectors().col(r)));  // signs are arbitrary
        CHECK(std::abs(agreement - 1.0) <= 1e-9);
        if (c > 0) CHECK(top.values[c] <= top.values[c - 1]);
      }
    }
  }
}
