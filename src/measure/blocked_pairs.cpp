#include "measure/blocked_pairs.h"

#include <algorithm>
#include <cmath>
#include <cstring>

#include "core/parallel_items.h"

// 32-byte vectors passed between always-inlined helpers are not an ABI concern here.
#pragma GCC diagnostic ignored "-Wpsabi"

namespace manicule {

namespace {

// Four doubles: GCC and Clang lower this to two SSE2 registers by default and to one AVX
// register in the functions marked target("avx2") below, from the same source.
using Vec = double __attribute__((vector_size(32)));
using VecBits = long long __attribute__((vector_size(32)));
constexpr Eigen::Index kLanes = 4;
constexpr Eigen::Index kTileRows = 16;  // 16 rows of 2,000 doubles = 256 KiB per tile

#define MANICULE_INLINE inline __attribute__((always_inline))

MANICULE_INLINE Vec load(const double* p) {
  Vec v;
  std::memcpy(&v, p, sizeof v);
  return v;
}
MANICULE_INLINE double lanes_sum(const Vec& v) { return (v[0] + v[1]) + (v[2] + v[3]); }

// Each operation accumulates vectors, then scalar tail elements, then yields the result.
// kRows x kColumns is how many pairs one pass computes: as many as the 16 vector registers
// of x86-64 hold without spilling (2 x 4 measured fastest for the L1 loop; MinMax needs two
// sums per pair, so 2 x 2).
struct AbsoluteSum {
  static constexpr int kRows = 2, kColumns = 4;
  struct Acc {
    Vec v = {0, 0, 0, 0};
    double tail = 0;
  };
  static MANICULE_INLINE void add(Acc& acc, const Vec& a, const Vec& b) {
    const VecBits magnitude = {~(1LL << 63), ~(1LL << 63), ~(1LL << 63), ~(1LL << 63)};
    acc.v += reinterpret_cast<Vec>(reinterpret_cast<VecBits>(a - b) & magnitude);
  }
  static MANICULE_INLINE void add(Acc& acc, double a, double b) { acc.tail += std::abs(a - b); }
  static MANICULE_INLINE double value(const Acc& acc) { return lanes_sum(acc.v) + acc.tail; }
};

struct SquaredSum {
  static constexpr int kRows = 2, kColumns = 4;
  struct Acc {
    Vec v = {0, 0, 0, 0};
    double tail = 0;
  };
  static MANICULE_INLINE void add(Acc& acc, const Vec& a, const Vec& b) {
    const Vec d = a - b;
    acc.v += d * d;
  }
  static MANICULE_INLINE void add(Acc& acc, double a, double b) { acc.tail += (a - b) * (a - b); }
  static MANICULE_INLINE double value(const Acc& acc) { return lanes_sum(acc.v) + acc.tail; }
};

struct MinMaxRatio {
  static constexpr int kRows = 2, kColumns = 2;
  struct Acc {
    Vec low = {0, 0, 0, 0};
    Vec high = {0, 0, 0, 0};
    double low_tail = 0;
    double high_tail = 0;
  };
  static MANICULE_INLINE void add(Acc& acc, const Vec& a, const Vec& b) {
    acc.low += a < b ? a : b;
    acc.high += a < b ? b : a;
  }
  static MANICULE_INLINE void add(Acc& acc, double a, double b) {
    acc.low_tail += std::min(a, b);
    acc.high_tail += std::max(a, b);
  }
  static MANICULE_INLINE double value(const Acc& acc) {
    const double high = lanes_sum(acc.high) + acc.high_tail;
    if (high == 0) return 0;  // two all-zero rows are identical
    return 1.0 - (lanes_sum(acc.low) + acc.low_tail) / high;
  }
};

// A row-major input and the column-major n x n output, as raw memory.
struct Frame {
  const double* rows;
  Eigen::Index length;  // values per row (= row stride)
  double* out;
  Eigen::Index n;       // output stride
  void put(Eigen::Index i, Eigen::Index j, double v) const { out[i + j * n] = v; }
  const double* row(Eigen::Index i) const { return rows + i * length; }
};

// Rows a[0..RA) against rows b[0..RB): RA * RB sums, each value loaded once per block.
template <class Op, int RA, int RB>
MANICULE_INLINE void pair_block(const double* const* a, const double* const* b, Eigen::Index length,
                                double (&result)[RA][RB]) {
  typename Op::Acc acc[RA][RB];
  Eigen::Index k = 0;
  for (; k + kLanes <= length; k += kLanes) {
    Vec va[RA];
    for (int r = 0; r < RA; ++r) va[r] = load(a[r] + k);
    for (int s = 0; s < RB; ++s) {
      const Vec vb = load(b[s] + k);
      for (int r = 0; r < RA; ++r) Op::add(acc[r][s], va[r], vb);
    }
  }
  for (; k < length; ++k) {
    for (int r = 0; r < RA; ++r) {
      for (int s = 0; s < RB; ++s) Op::add(acc[r][s], a[r][k], b[s][k]);
    }
  }
  for (int r = 0; r < RA; ++r) {
    for (int s = 0; s < RB; ++s) result[r][s] = Op::value(acc[r][s]);
  }
}

// All pairs (i, j), j < i, with i in [i0, i1) and j in [j0, j1): Op::kRows rows against
// Op::kColumns rows at a time, single pairs at the edges.
template <class Op>
MANICULE_INLINE void tile_pairs(const Frame& f, Eigen::Index i0, Eigen::Index i1, Eigen::Index j0,
                                Eigen::Index j1) {
  constexpr int RA = Op::kRows;
  constexpr int RB = Op::kColumns;
  for (Eigen::Index i = i0; i < i1; i += RA) {
    const Eigen::Index rows = std::min<Eigen::Index>(RA, i1 - i);
    const Eigen::Index j_end = std::min(j1, i + rows - 1);  // the last row's pairs end there
    for (Eigen::Index j = j0; j < j_end; j += RB) {
      if (rows == RA && j + RB <= j_end) {
        const double* a[RA];
        const double* b[RB];
        for (int r = 0; r < RA; ++r) a[r] = f.row(i + r);
        for (int s = 0; s < RB; ++s) b[s] = f.row(j + s);
        double result[RA][RB];
        pair_block<Op, RA, RB>(a, b, f.length, result);
        for (int r = 0; r < RA; ++r) {  // some may lie on or above the diagonal
          for (int s = 0; s < RB; ++s) {
            if (j + s < i + r) f.put(i + r, j + s, result[r][s]);
          }
        }
        continue;
      }
      for (Eigen::Index ii = i; ii < i + rows; ++ii) {
        for (Eigen::Index jj = j; jj < std::min(j + RB, j_end) && jj < ii; ++jj) {
          const double* a[1] = {f.row(ii)};
          const double* b[1] = {f.row(jj)};
          double result[1][1];
          pair_block<Op, 1, 1>(a, b, f.length, result);
          f.put(ii, jj, result[0][0]);
        }
      }
    }
  }
}

// One row tile against every earlier tile and itself.
template <class Op>
MANICULE_INLINE void row_tile(const Frame& f, Eigen::Index i0, Eigen::Index i1) {
  for (Eigen::Index j0 = 0; j0 < i1; j0 += kTileRows) tile_pairs<Op>(f, i0, i1, j0, std::min(i1, j0 + kTileRows));
}

// A band of rows (see blocked_pair_sums_band) against the rows first + r, r in [r0, r1).
struct Band {
  const double* rows;
  Eigen::Index length;  // values per row (= row stride)
  Eigen::Index first;
  Eigen::Index count;
  double* out;
  const double* row(Eigen::Index i) const { return rows + i * length; }
  // The pair's sum, and within the band the same sum for the pair seen from its other row.
  void put(Eigen::Index c, Eigen::Index r, double v) const {
    out[c + count * r] = v;
    if (r < count) out[r + count * c] = v;
  }
};

// Pairs (c, r) with c < r only (inside the band a pair is measured once and put at both
// places): tiles of kTileRows band rows, Op::kRows x Op::kColumns pairs at a time.
template <class Op>
MANICULE_INLINE void band_rows(const Band& b, Eigen::Index r0, Eigen::Index r1) {
  constexpr int RA = Op::kRows;
  constexpr int RB = Op::kColumns;
  for (Eigen::Index c0 = 0; c0 < b.count && c0 < r1 - 1; c0 += kTileRows) {
    const Eigen::Index c1 = std::min(b.count, c0 + kTileRows);
    for (Eigen::Index r = r0; r < r1; r += RB) {
      const Eigen::Index rs = std::min<Eigen::Index>(RB, r1 - r);
      for (Eigen::Index c = c0; c < c1 && c < r + rs - 1; c += RA) {
        const Eigen::Index cs = std::min<Eigen::Index>(RA, c1 - c);
        if (cs == RA && rs == RB && c + RA - 1 < r) {  // every pair of the block has c < r
          const double* a[RA];
          const double* o[RB];
          for (int i = 0; i < RA; ++i) a[i] = b.row(b.first + c + i);
          for (int s = 0; s < RB; ++s) o[s] = b.row(b.first + r + s);
          double result[RA][RB];
          pair_block<Op, RA, RB>(a, o, b.length, result);
          for (int i = 0; i < RA; ++i)
            for (int s = 0; s < RB; ++s) b.put(c + i, r + s, result[i][s]);
          continue;
        }
        for (Eigen::Index cc = c; cc < c + cs; ++cc) {
          for (Eigen::Index rr = std::max(r, cc + 1); rr < r + rs; ++rr) {
            const double* a[1] = {b.row(b.first + cc)};
            const double* o[1] = {b.row(b.first + rr)};
            double result[1][1];
            pair_block<Op, 1, 1>(a, o, b.length, result);
            b.put(cc, rr, result[0][0]);
          }
        }
      }
    }
  }
}

// The two kernels as types, each over its own area of output, for compiled_for below.
template <class Op>
struct RowTile {
  using Area = Frame;
  static MANICULE_INLINE void run(const Frame& f, Eigen::Index i0, Eigen::Index i1) { row_tile<Op>(f, i0, i1); }
};
template <class Op>
struct BandRows {
  using Area = Band;
  static MANICULE_INLINE void run(const Band& b, Eigen::Index r0, Eigen::Index r1) { band_rows<Op>(b, r0, r1); }
};

// The same source compiled twice: for the baseline and, where the processor has it, AVX2
// (the kernel is inlined into each, so its vectors take the wrapper's instruction set).
template <class Kernel>
void on_baseline(const typename Kernel::Area& area, Eigen::Index from, Eigen::Index to) {
  Kernel::run(area, from, to);
}

#if defined(__GNUC__) && (defined(__x86_64__) || defined(__i386__))
template <class Kernel>
__attribute__((target("avx2"))) void on_avx2(const typename Kernel::Area& area, Eigen::Index from, Eigen::Index to) {
  Kernel::run(area, from, to);
}
bool has_avx2() { return __builtin_cpu_supports("avx2"); }
#endif

// The build of the kernel to call: AVX2 when asked for and the processor has it.
template <class Kernel>
auto compiled_for(SimdLevel simd) -> void (*)(const typename Kernel::Area&, Eigen::Index, Eigen::Index) {
#if defined(__GNUC__) && (defined(__x86_64__) || defined(__i386__))
  if (simd == SimdLevel::best && has_avx2()) return &on_avx2<Kernel>;
#endif
  return &on_baseline<Kernel>;
}

template <class Op>
void run_band(const RowMatrix& x, Eigen::Index first, Eigen::Index count, double* out, unsigned threads,
              SimdLevel simd) {
  const auto rows = compiled_for<BandRows<Op>>(simd);
  const Band band{x.data(), x.cols(), first, count, out};
  const Eigen::Index rest = x.rows() - first;
  const Eigen::Index tiles = (rest + kTileRows - 1) / kTileRows;
  parallel_items(static_cast<std::size_t>(tiles), threads, [&](std::size_t item) {
    const Eigen::Index r0 = static_cast<Eigen::Index>(item) * kTileRows;
    rows(band, r0, std::min(rest, r0 + kTileRows));
  });
}

template <class Op>
void run_tiles(const RowMatrix& x, unsigned threads, Eigen::MatrixXd& out, SimdLevel simd) {
  const auto tile = compiled_for<RowTile<Op>>(simd);
  const Frame frame{x.data(), x.cols(), out.data(), out.rows()};
  const Eigen::Index n = x.rows();
  const Eigen::Index tiles = (n + kTileRows - 1) / kTileRows;
  // The last row tiles hold the most pairs: hand them out first.
  parallel_items(static_cast<std::size_t>(tiles), threads, [&](std::size_t item) {
    const Eigen::Index i0 = (tiles - 1 - static_cast<Eigen::Index>(item)) * kTileRows;
    tile(frame, i0, std::min(n, i0 + kTileRows));
  });
}

}  // namespace

void blocked_pair_sums(const RowMatrix& rows, PairSum kind, unsigned threads,
                       Eigen::MatrixXd& out, SimdLevel simd) {
  switch (kind) {
    case PairSum::absolute: run_tiles<AbsoluteSum>(rows, threads, out, simd); break;
    case PairSum::squared: run_tiles<SquaredSum>(rows, threads, out, simd); break;
    case PairSum::min_max: run_tiles<MinMaxRatio>(rows, threads, out, simd); break;
  }
}

void blocked_pair_sums_band(const RowMatrix& rows, PairSum kind, Eigen::Index first, Eigen::Index count,
                            double* out, unsigned threads, SimdLevel simd) {
  switch (kind) {
    case PairSum::absolute: run_band<AbsoluteSum>(rows, first, count, out, threads, simd); break;
    case PairSum::squared: run_band<SquaredSum>(rows, first, count, out, threads, simd); break;
    case PairSum::min_max: run_band<MinMaxRatio>(rows, first, count, out, threads, simd); break;
  }
}

}  // namespace manicule
