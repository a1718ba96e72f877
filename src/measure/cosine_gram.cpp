#include "measure/cosine_gram.h"

#include <cblas.h>  // the CBLAS enumerations; cblas_dsyrk itself is found at run time
#include <dlfcn.h>

#include <algorithm>
#include <cstdlib>
#include <limits>
#include <vector>

#include "measure/parallel_items.h"

namespace manicule {

namespace {

using DsyrkFunction = decltype(&cblas_dsyrk);

// The BLAS is opened at the first Gram matrix rather than linked: loading OpenBLAS costs
// every command about 5 ms (a re-run over an unchanged archive takes 30 ms in all) and
// starts its thread pool, whose idle threads spin about 0.1 s of a core before sleeping.
// Debian's alternatives make libblas.so.3 the chosen BLAS; OpenBLAS's own name comes first.
DsyrkFunction find_dsyrk() {
  static const DsyrkFunction found = []() -> DsyrkFunction {
    for (const char* name : {"libopenblas.so.0", "libblas.so.3", "libcblas.so.3"}) {
      void* library = dlopen(name, RTLD_NOW | RTLD_LOCAL);
      if (!library) continue;
      if (void* symbol = dlsym(library, "cblas_dsyrk")) return reinterpret_cast<DsyrkFunction>(symbol);
      dlclose(library);
    }
    return nullptr;
  }();
  return found;
}

}  // namespace

void open_blas() { find_dsyrk(); }

void let_blas_threads_sleep_when_idle() {
  // OpenBLAS reads it when it is loaded (at the first Gram matrix); a value the user set
  // is kept.
  setenv("OPENBLAS_THREAD_TIMEOUT", "4", 0);
}

void gram_lower(const RowMatrix& rows, Eigen::MatrixXd& out, bool allow_blas) {
  const Eigen::Index n = rows.rows();
  const Eigen::Index k = rows.cols();
  out.resize(n, n);
  const DsyrkFunction dsyrk = allow_blas ? find_dsyrk() : nullptr;
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

void cosine_distances_by_gram(const RowMatrix& rows, unsigned threads, Eigen::MatrixXd& out) {
  // The Gram matrix of the rows as they are, each dot product then divided by the two
  // lengths: a length-normalised copy of the rows would be as large as the table (16 MiB
  // of fresh memory for the plays, 13-43 ms of copying and page faults).
  const Eigen::Index n = rows.rows();
  std::vector<double> inverse_length(static_cast<std::size_t>(n), 0.0);
  std::vector<char> zero(static_cast<std::size_t>(n), 0);
  for (Eigen::Index i = 0; i < n; ++i) {
    const double length = rows.row(i).norm();
    if (length > 0) {
      inverse_length[static_cast<std::size_t>(i)] = 1.0 / length;
    } else {
      zero[static_cast<std::size_t>(i)] = 1;
    }
  }
  gram_lower(rows, out);
  constexpr double kRoundingNoise = 64 * std::numeric_limits<double>::epsilon();
  parallel_items(static_cast<std::size_t>(n), threads, [&](std::size_t item) {
    const Eigen::Index j = static_cast<Eigen::Index>(item);  // one column of the lower triangle
    const bool zero_j = zero[item];
    const double inverse_j = inverse_length[item];
    for (Eigen::Index i = j + 1; i < n; ++i) {
      double d = 1.0 - out(i, j) * inverse_length[static_cast<std::size_t>(i)] * inverse_j;
      const bool zero_i = zero[static_cast<std::size_t>(i)];
      if (zero_i || zero_j) d = zero_i && zero_j ? 0.0 : 1.0;
      // Below this, 1 - cos is rounding noise of the dot product (identical rows).
      if (d < kRoundingNoise) d = 0.0;
      out(i, j) = std::min(d, 2.0);
    }
  });
}

}  // namespace manicule
