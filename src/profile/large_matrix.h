// Zero-filled matrices of many megabytes (feature tables, z-scores, distance and Gram
// matrices), backed by transparent huge pages where the kernel offers them on request
// (the "madvise" setting, Debian's default). Every fresh 4 KiB page costs a page fault
// when first written, and on virtual machines a fault is dear: a 2,500 x 2,500 distance
// matrix is 12,500 of them, a fifth of an analysis's time in our measurements
// (bench/RESULTS.md). The advice changes nothing but speed; where it is refused, pages
// are ordinary.
#pragma once
#include <cstddef>

#include <Eigen/Dense>

namespace manicule {

// The size (and alignment) of a transparent huge page on x86-64.
constexpr std::size_t kHugePageBytes = std::size_t{2} << 20;

// Asks for huge pages on the whole 2 MiB blocks inside [data, data + bytes); small
// ranges are left alone.
void advise_huge_pages(void* data, std::size_t bytes);

// For a caller that writes every element itself (and so chooses which thread first
// touches which pages).
template <typename Matrix>
Matrix uninitialised_matrix(Eigen::Index rows, Eigen::Index cols) {
  Matrix m(rows, cols);
  advise_huge_pages(m.data(), sizeof(typename Matrix::Scalar) * static_cast<std::size_t>(rows * cols));
  return m;
}

template <typename Matrix>
Matrix zero_matrix(Eigen::Index rows, Eigen::Index cols) {
  Matrix m = uninitialised_matrix<Matrix>(rows, cols);
  m.setZero();
  return m;
}

}  // namespace manicule
