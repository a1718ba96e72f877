#include "measure/cosine_gram.h"

#include <algorithm>
#include <cstdlib>
#include <limits>
#include <vector>

#include "core/parallel_items.h"
#include "measure/blas_library.h"

namespace manicule {

void open_blas() { blas_functions(); }

void let_blas_threads_sleep_when_idle() {
  // OpenBLAS reads it when it is loaded (at the first Gram matrix); a value the user set
  // is kept.
  setenv("OPENBLAS_THREAD_TIMEOUT", "4", 0);
}

void gram_lower(const RowMatrix& rows, Eigen::MatrixXd& out, bool allow_blas) {
  const Eigen::Index n = rows.rows();
  const Eigen::Index k = rows.cols();
  out.resize(n, n);
  const auto dsyrk = allow_blas ? blas_functions().dsyrk : nullptr;
  if (k > 0 && dsyrk) {
    // The row-major n x k `rows` is, read column-major, the k x n matrix A = rows^T; so
    // A^T A is the Gram matrix, written into the lower triangle of the column-major `out`.
    dsyrk(CblasColMajor, CblasLower, CblasTrans, static_cast<int>(n), static_cast<int>(k), 1.0, rows.data(),
          static_cast<int>(k), 0.0, out.data(), static_cast<int>(n));
  } else {
    out.setZero();  // no BLAS: Eigen's own product, on one core
    if (k > 0) out.selfadjointView<Eigen::Lower>().rankUpdate(rows);
  }
}

RowLengths row_lengths(const RowMatrix& rows) {
  const auto n = static_cast<std::size_t>(rows.rows());
  RowLengths lengths{std::vector<double>(n, 0.0), std::vector<char>(n, 0)};
  for (std::size_t i = 0; i < n; ++i) {
    const double length = rows.row(static_cast<Eigen::Index>(i)).norm();
    if (length > 0) {
      lengths.inverse[i] = 1.0 / length;
    } else {
      lengths.zero[i] = 1;
    }
  }
  return lengths;
}

void dot_products(const RowMatrix& rows, Eigen::Index a_first, Eigen::Index a_count, Eigen::Index b_first,
                  Eigen::Index b_count, double* out) {
  const Eigen::Index k = rows.cols();
  Eigen::Map<Eigen::MatrixXd> result(out, a_count, b_count);
  if (k == 0) {
    result.setZero();
    return;
  }
  if (const auto dgemm = blas_functions().dgemm) {
    // Read column-major, the row-major n x k `rows` is the k x n matrix A = rows^T; the two
    // ranges are blocks of its columns, and out = A_a^T * A_b.
    dgemm(CblasColMajor, CblasTrans, CblasNoTrans, static_cast<int>(a_count), static_cast<int>(b_count),
          static_cast<int>(k), 1.0, rows.data() + a_first * k, static_cast<int>(k), rows.data() + b_first * k,
          static_cast<int>(k), 0.0, out, static_cast<int>(a_count));
  } else {
    result.noalias() = rows.middleRows(a_first, a_count) * rows.middleRows(b_first, b_count).transpose();
  }
}

bool float_dot_products(const float* rows, Eigen::Index cols, Eigen::Index a_first, Eigen::Index a_count,
                        Eigen::Index b_first, Eigen::Index b_count, float* out) {
  const auto sgemm = blas_functions().sgemm;
  if (!sgemm || cols == 0) return false;
  // As in dot_products: the row-major rows are, read column-major, the columns of a cols x n matrix.
  sgemm(CblasColMajor, CblasTrans, CblasNoTrans, static_cast<int>(a_count), static_cast<int>(b_count),
        static_cast<int>(cols), 1.0f, rows + a_first * cols, static_cast<int>(cols), rows + b_first * cols,
        static_cast<int>(cols), 0.0f, out, static_cast<int>(a_count));
  return true;
}

void cosine_distances_by_gram(const RowMatrix& rows, unsigned threads, Eigen::MatrixXd& out) {
  // The Gram matrix of the rows as they are, each dot product then divided by the two
  // lengths: a length-normalised copy of the rows would be as large as the table (16 MiB
  // of fresh memory for the plays, 13-43 ms of copying and page faults).
  const Eigen::Index n = rows.rows();
  const RowLengths lengths = row_lengths(rows);
  gram_lower(rows, out);
  parallel_items(static_cast<std::size_t>(n), threads, [&](std::size_t item) {
    const Eigen::Index j = static_cast<Eigen::Index>(item);  // one column of the lower triangle
    for (Eigen::Index i = j + 1; i < n; ++i)
      out(i, j) = cosine_from_dot(out(i, j), lengths, static_cast<std::size_t>(i), item);
  });
}

}  // namespace manicule
