#include "measure/blocked_pairs.h"

#include <algorithm>
#include <cmath>

#include "measure/parallel_items.h"

namespace manicule {

namespace {

constexpr int kLanes = 4;  // doubles per accumulator: one AVX or two SSE2 registers
using Pack = Eigen::Array<double, kLanes, 1>;
using PackMap = Eigen::Map<const Pack, Eigen::Unaligned>;
constexpr Eigen::Index kTileRows = 16;  // 16 rows of 2,000 doubles = 256 KiB per tile

// Each operation accumulates packs, then scalar tail elements, then yields the result.
struct AbsoluteSum {
  struct Acc {
    Pack packs = Pack::Zero();
    double tail = 0;
  };
  static void add(Acc& acc, const Pack& a, const Pack& b) { acc.packs += (a - b).abs(); }
  static void add(Acc& acc, double a, double b) { acc.tail += std::abs(a - b); }
  static double value(const Acc& acc) { return acc.packs.sum() + acc.tail; }
};

struct SquaredSum {
  struct Acc {
    Pack packs = Pack::Zero();
    double tail = 0;
  };
  static void add(Acc& acc, const Pack& a, const Pack& b) { acc.packs += (a - b).square(); }
  static void add(Acc& acc, double a, double b) { acc.tail += (a - b) * (a - b); }
  static double value(const Acc& acc) { return acc.packs.sum() + acc.tail; }
};

struct MinMaxRatio {
  struct Acc {
    Pack low = Pack::Zero();
    Pack high = Pack::Zero();
    double low_tail = 0;
    double high_tail = 0;
  };
  static void add(Acc& acc, const Pack& a, const Pack& b) {
    acc.low += a.min(b);
    acc.high += a.max(b);
  }
  static void add(Acc& acc, double a, double b) {
    acc.low_tail += std::min(a, b);
    acc.high_tail += std::max(a, b);
  }
  static double value(const Acc& acc) {
    const double high = acc.high.sum() + acc.high_tail;
    if (high == 0) return 0;  // two all-zero rows are identical
    return 1.0 - (acc.low.sum() + acc.low_tail) / high;
  }
};

// Rows a[0..RA) against rows b[0..RB): RA * RB sums, each value loaded once per block.
template <class Op, int RA, int RB>
void pair_block(const double* const* a, const double* const* b, Eigen::Index length,
                double (&result)[RA][RB]) {
  typename Op::Acc acc[RA][RB];
  Eigen::Index k = 0;
  for (; k + kLanes <= length; k += kLanes) {
    Pack pa[RA];
    for (int r = 0; r < RA; ++r) pa[r] = PackMap(a[r] + k);
    for (int s = 0; s < RB; ++s) {
      const Pack pb = PackMap(b[s] + k);
      for (int r = 0; r < RA; ++r) Op::add(acc[r][s], pa[r], pb);
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

// All pairs (i, j), j < i, with i in [i0, i1) and j in [j0, j1).
template <class Op>
void tile_pairs(const RowMatrix& x, Eigen::Index i0, Eigen::Index i1, Eigen::Index j0,
                Eigen::Index j1, Eigen::MatrixXd& out) {
  const Eigen::Index length = x.cols();
  for (Eigen::Index i = i0; i < i1; i += 2) {
    const Eigen::Index j_end = std::min(j1, i + 1);  // j < i, plus j = i for the second row
    for (Eigen::Index j = j0; j < j_end; j += 2) {
      if (i + 1 < i1 && j + 1 < j_end) {
        const double* a[2] = {x.row(i).data(), x.row(i + 1).data()};
        const double* b[2] = {x.row(j).data(), x.row(j + 1).data()};
        double r[2][2];
        pair_block<Op, 2, 2>(a, b, length, r);
        // Some of the four may lie on or above the diagonal; only j < i is kept.
        if (j < i) out(i, j) = r[0][0];
        if (j + 1 < i) out(i, j + 1) = r[0][1];
        if (j < i + 1) out(i + 1, j) = r[1][0];
        if (j + 1 < i + 1) out(i + 1, j + 1) = r[1][1];
      } else {
        for (Eigen::Index ii = i; ii < std::min(i + 2, i1); ++ii) {
          for (Eigen::Index jj = j; jj < std::min(j + 2, j_end) && jj < ii; ++jj) {
            const double* a[1] = {x.row(ii).data()};
            const double* b[1] = {x.row(jj).data()};
            double r[1][1];
            pair_block<Op, 1, 1>(a, b, length, r);
            out(ii, jj) = r[0][0];
          }
        }
      }
    }
  }
}

template <class Op>
void run_tiles(const RowMatrix& x, unsigned threads, Eigen::MatrixXd& out) {
  const Eigen::Index n = x.rows();
  const Eigen::Index tiles = (n + kTileRows - 1) / kTileRows;
  // The last row tiles hold the most pairs: hand them out first.
  parallel_items(static_cast<std::size_t>(tiles), threads, [&](std::size_t item) {
    const Eigen::Index tile = tiles - 1 - static_cast<Eigen::Index>(item);
    const Eigen::Index i0 = tile * kTileRows;
    const Eigen::Index i1 = std::min(n, i0 + kTileRows);
    for (Eigen::Index j0 = 0; j0 < i1; j0 += kTileRows) {
      tile_pairs<Op>(x, i0, i1, j0, std::min(i1, j0 + kTileRows), out);
    }
  });
}

}  // namespace

void blocked_pair_sums(const RowMatrix& rows, PairSum kind, unsigned threads,
                       Eigen::MatrixXd& out) {
  switch (kind) {
    case PairSum::absolute: run_tiles<AbsoluteSum>(rows, threads, out); break;
    case PairSum::squared: run_tiles<SquaredSum>(rows, threads, out); break;
    case PairSum::min_max: run_tiles<MinMaxRatio>(rows, threads, out); break;
  }
}

}  // namespace manicule
