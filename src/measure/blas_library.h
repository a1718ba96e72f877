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

// For a program's start, before the BLAS is opened (a host embedding the library keeps its
// own environment): the BLAS's pool of threads at most `threads` (0: one per core), as the
// program's own loops take. OpenBLAS reads it as it loads (OPENBLAS_NUM_THREADS); a value
// the user set is kept, and fewer are asked where the system refuses threads.
void limit_blas_threads(unsigned threads);

}  // namespace manicule
