// blas_library: the BLAS (and the LAPACK it carries) found at run time. It is opened at the
// first call rather than linked: loading OpenBLAS costs every command about 5 ms (a
// re-run over an unchanged archive takes 12-20 ms in all) and starts its thread pool, whose
// idle threads spin about 0.1 s of a core before sleeping. Debian's alternatives make
// libblas.so.3 the chosen BLAS; OpenBLAS's own name comes first. Any function may be
// missing (null): callers then do the work with Eigen.
#pragma once
#include <cblas.h>  // the CBLAS enumerations and prototypes; the functions are found at run time

namespace manicule {

// LAPACK's dsyevr (Fortran calling convention, with the lengths of the three one-letter
// arguments last): selected eigenvalues and eigenvectors of a symmetric matrix.
using DsyevrFunction = void (*)(const char* jobz, const char* range, const char* uplo, const int* n, double* a,
                                const int* lda, const double* vl, const double* vu, const int* il, const int* iu,
                                const double* abstol, int* m, double* w, double* z, const int* ldz, int* isuppz,
                                double* work, const int* lwork, int* iwork, const int* liwork, int* info,
                                unsigned long jobz_length, unsigned long range_length, unsigned long uplo_length);

struct BlasFunctions {
  decltype(&cblas_dsyrk) dsyrk = nullptr;
  decltype(&cblas_dgemm) dgemm = nullptr;
  decltype(&cblas_sgemm) sgemm = nullptr;  // may be missing where the two above are found
  DsyevrFunction dsyevr = nullptr;         // a BLAS without LAPACK has none
};

// Opened once, thread-safe.
const BlasFunctions& blas_functions();

}  // namespace manicule
