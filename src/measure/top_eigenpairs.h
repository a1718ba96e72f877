// top_eigenpairs: the k largest eigenvalues of a symmetric matrix and their eigenvectors,
// as PCA needs them. By LAPACK's dsyevr (Relatively Robust Representations) where the BLAS
// library carries LAPACK (OpenBLAS does), which reduces the matrix to tridiagonal form on
// every core and then computes the k pairs alone; else by Eigen's SelfAdjointEigenSolver,
// which computes all of them on one core (for the plays' 1,000 features: about 0.5 s of a
// PCA that the LAPACK path does in a fraction of it).
#pragma once
#include <Eigen/Dense>

namespace manicule {

struct Eigenpairs {
  Eigen::VectorXd values;   // the k largest, largest first
  Eigen::MatrixXd vectors;  // one unit column per value, in the same order; signs arbitrary
};

// `lower` holds the matrix in its lower triangle (diagonal included); the upper triangle
// is not read. 1 <= k <= lower.rows(). Error(internal) if the solver does not converge.
Eigenpairs top_eigenpairs(Eigen::MatrixXd lower, Eigen::Index k);

}  // namespace manicule
