#include "measure/top_eigenpairs.h"

#include <vector>

#include "core/error.h"
#include "measure/blas_library.h"

namespace manicule {

namespace {

// The last k of pairs in ascending order of their values (one vector a column), largest first.
Eigenpairs largest_first(const Eigen::Ref<const Eigen::VectorXd>& ascending,
                         const Eigen::Ref<const Eigen::MatrixXd>& vectors, Eigen::Index k) {
  const Eigen::Index last = ascending.size() - 1;
  Eigenpairs out{Eigen::VectorXd(k), Eigen::MatrixXd(vectors.rows(), k)};
  for (Eigen::Index c = 0; c < k; ++c) {
    out.values[c] = ascending[last - c];
    out.vectors.col(c) = vectors.col(last - c);
  }
  return out;
}

// The strictly lower triangle copied into the strictly upper one.
void mirror_lower(Eigen::MatrixXd& m) {
  for (Eigen::Index j = 0; j < m.cols(); ++j)
    for (Eigen::Index i = j + 1; i < m.rows(); ++i) m(j, i) = m(i, j);
}

Eigenpairs by_eigen(const Eigen::MatrixXd& lower, Eigen::Index k) {
  const Eigen::SelfAdjointEigenSolver<Eigen::MatrixXd> solver(lower);  // reads the lower triangle
  if (solver.info() != Eigen::Success) throw Error(ErrorKind::internal, "the eigen-decomposition did not converge");
  return largest_first(solver.eigenvalues(), solver.eigenvectors(), k);
}

}  // namespace

Eigenpairs top_eigenpairs(Eigen::MatrixXd lower, Eigen::Index k) {
  const DsyevrFunction dsyevr = blas_functions().dsyevr;
  const int n = static_cast<int>(lower.rows());
  if (!dsyevr || n < 2) return by_eigen(lower, k);
  // Eigenvalues n - k + 1 .. n of the ascending order (1-based), and their vectors; the
  // lower triangle of the column-major matrix is read, then overwritten.
  const int first = n - static_cast<int>(k) + 1, last = n, lda = n;
  const double unused = 0.0, tolerance = 0.0;  // 0: LAPACK's default tolerance
  int found = 0, info = 0;
  Eigen::VectorXd values(n);
  Eigen::MatrixXd vectors(n, k);
  std::vector<int> support(2 * static_cast<std::size_t>(k));
  // A first call asks how much workspace the second needs.
  double work_size = 0;
  int iwork_size = 0, query = -1;
  dsyevr("V", "I", "L", &n, lower.data(), &lda, &unused, &unused, &first, &last, &tolerance, &found, values.data(),
         vectors.data(), &lda, support.data(), &work_size, &query, &iwork_size, &query, &info, 1, 1, 1);
  if (info != 0) return by_eigen(lower, k);
  const int lwork = static_cast<int>(work_size), liwork = iwork_size;
  std::vector<double> work(static_cast<std::size_t>(lwork));
  std::vector<int> iwork(static_cast<std::size_t>(liwork));
  // dsyevr destroys the lower triangle and the diagonal, which Eigen needs should it fail;
  // the upper triangle it leaves alone, so the matrix is kept there (and the diagonal
  // aside) rather than in a copy of the whole: n x n fresh doubles cost their page faults.
  mirror_lower(lower);
  const Eigen::VectorXd diagonal = lower.diagonal();
  dsyevr("V", "I", "L", &n, lower.data(), &lda, &unused, &unused, &first, &last, &tolerance, &found, values.data(),
         vectors.data(), &lda, support.data(), work.data(), &lwork, iwork.data(), &liwork, &info, 1, 1, 1);
  if (info != 0 || found != static_cast<int>(k)) {
    lower.transposeInPlace();  // the lower triangle back from the upper
    lower.diagonal() = diagonal;
    return by_eigen(lower, k);
  }
  return largest_first(values.head(k), vectors, k);  // found in ascending order
}

}  // namespace manicule
