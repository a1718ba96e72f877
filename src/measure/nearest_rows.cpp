#include "measure/nearest_rows.h"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <functional>
#include <limits>
#include <optional>

#include "core/parallel_items.h"
#include "measure/cosine_gram.h"
#include "profile/large_matrix.h"

namespace manicule {

namespace {

// The best k offered so far, nearest first, equal distances in row order (whatever the
// order of offering).
class BestRows {
 public:
  explicit BestRows(std::size_t k = 0) : k_(k) { best_.reserve(k); }
  void offer(std::size_t row, double distance) {
    if (k_ == 0) return;
    if (best_.size() == k_) {
      if (!before(distance, row, best_.back())) return;
      best_.pop_back();
    }
    auto at = std::upper_bound(best_.begin(), best_.end(), NearRow{row, distance},
                               [](const NearRow& a, const NearRow& b) { return before(a.distance, a.row, b); });
    best_.insert(at, NearRow{row, distance});
  }
  template <typename Visit>
  void for_each(Visit visit) const {
    for (const NearRow& r : best_) visit(r.row, r.distance);
  }
  std::vector<NearRow> take() { return std::move(best_); }
  // Every row's, in row order.
  static std::vector<std::vector<NearRow>> take_all(std::vector<BestRows>& rows) {
    std::vector<std::vector<NearRow>> out(rows.size());
    for (std::size_t i = 0; i < rows.size(); ++i) out[i] = rows[i].take();
    return out;
  }

 private:
  static bool before(double distance, std::size_t row, const NearRow& other) {
    return distance < other.distance || (distance == other.distance && row < other.row);
  }
  std::size_t k_;
  std::vector<NearRow> best_;
};

// A row's candidates while the single-precision similarities go by: the k largest so far,
// and every row offered no further than `window` below the k-th largest at the time. The
// k-th largest only rises, so what is kept at the end includes every row within the
// window of the final k-th largest.
class Candidates {
 public:
  Candidates(std::size_t k, double window) : k_(k), window_(window) { top_.reserve(k); }
  // Inline: once the k-th largest is known, nearly every similarity offered lies below the
  // floor, and the test is all it should cost; as a call, offer took 9 % of the CPU of an
  // analysis of 10,000 segments.
  void offer(std::size_t row, float similarity) {
    if (k_ == 0 || similarity < floor_) return;
    keep(row, similarity);
  }
  // Every row kept that is within the window of the k-th largest.
  template <typename Visit>
  void for_each(Visit visit) const {
    for (const Kept& c : kept_)
      if (c.similarity >= floor_) visit(c.row, c.similarity);
  }

 private:
  struct Kept {
    float similarity;
    std::uint32_t row;
  };
  [[gnu::noinline]] void keep(std::size_t row, float similarity) {
    if (top_.size() < k_ || similarity > top_.back()) {
      if (top_.size() == k_) top_.pop_back();
      top_.insert(std::upper_bound(top_.begin(), top_.end(), similarity, std::greater<float>()), similarity);
      if (top_.size() == k_) floor_ = static_cast<double>(top_.back()) - window_;
    }
    kept_.push_back({similarity, static_cast<std::uint32_t>(row)});
    if (kept_.size() >= 2 * prune_at_) prune();
  }
  void prune() {
    kept_.erase(std::remove_if(kept_.begin(), kept_.end(), [&](const Kept& c) { return c.similarity < floor_; }),
                kept_.end());
    prune_at_ = std::max(prune_at_, kept_.size());
  }
  std::size_t k_;
  double window_;
  double floor_ = -std::numeric_limits<double>::infinity();
  std::vector<float> top_;  // largest first
  std::vector<Kept> kept_;
  std::size_t prune_at_ = 16;
};

// About this many bytes of dot products a block: large enough for the matrix product to
// run at speed, small enough to stay in the caches while the best are picked; but never
// fewer rows than kFewestBlockRows, as the bytes alone would give with many segments (104
// rows at 10,000): each block's product packs all the rows after it again, and a thin
// block pays that for little work. An analysis of 10,443 play segments took 1.38 s with
// 100 rows a block, 1.21 s with 256 (10 MiB) and 1.16 s with 512 (20 MiB).
constexpr std::size_t kBlockBytes = std::size_t{4} << 20;
constexpr std::size_t kFewestBlockRows = 256;

// Each pair of n rows once, as the symmetric product does: a block of rows against itself
// and the rows after it. products(first, count, rest, out) writes block row c . row
// first + r to out[c + count * r] (false: it cannot, which it must say at its first call,
// before any share is told to options.progress); a pair offers value(product, i, j)
// to both rows' keepers. The rows after the block are shared out among the threads, each
// row's keeper used by one thread, and what the block's rows are offered is gathered per
// thread and merged after.
template <typename Scalar, typename Keeper, typename Products, typename Value>
bool offer_every_pair(std::size_t n, const NearestOptions& options, const Keeper& empty, std::vector<Keeper>& keepers,
                      Products products, Value value) {
  const unsigned threads = options.distance.threads;
  const std::size_t block =
      std::min(n, options.block_rows ? options.block_rows : std::max(kFewestBlockRows, kBlockBytes / sizeof(Scalar) / n));
  // Each block's products are written whole before they are read; only data() is used,
  // with the block's own row count as the leading dimension.
  using BlockProducts = Eigen::Matrix<Scalar, Eigen::Dynamic, Eigen::Dynamic>;
  BlockProducts dots = uninitialised_matrix<BlockProducts>(static_cast<Eigen::Index>(block), static_cast<Eigen::Index>(n));
  keepers.assign(n, empty);
  const std::size_t parts = 2 * resolve_thread_count(threads);
  std::vector<std::vector<Keeper>> offered_to_block(parts);
  // A block's work is its products, count x rest: the share done is told by that measure.
  double all_products = 0, products_done = 0;
  for (std::size_t first = 0; first < n; first += block)
    all_products += static_cast<double>(std::min(block, n - first)) * static_cast<double>(n - first);
  for (std::size_t first = 0; first < n; first += block) {
    const std::size_t count = std::min(block, n - first);
    const std::size_t rest = n - first;  // rows first .. n - 1, the block's own included
    if (!products(first, count, rest, dots.data())) return false;
    const std::size_t part_rows = (rest + parts - 1) / parts;
    parallel_items(parts, threads, [&](std::size_t part) {
      std::vector<Keeper>& to_block = offered_to_block[part];
      to_block.assign(count, empty);
      const std::size_t end = std::min(rest, (part + 1) * part_rows);
      for (std::size_t r = part * part_rows; r < end; ++r) {
        const std::size_t j = first + r;
        const Scalar* column = dots.data() + r * count;
        for (std::size_t c = 0; c < count; ++c) {
          const std::size_t i = first + c;
          if (i == j) continue;
          const auto v = value(column[c], i, j);
          keepers[j].offer(i, v);
          // A pair inside the block offers to both from both ends (r runs over the block
          // too); a row after it offers to the block's row here, once.
          if (r >= count) to_block[c].offer(j, v);
        }
      }
    });
    for (const auto& to_block : offered_to_block)
      for (std::size_t c = 0; c < to_block.size(); ++c)
        to_block[c].for_each([&](std::size_t row, auto v) { keepers[first + c].offer(row, v); });
    // The last block's share (1) is told by nearest_rows once the whole search is done.
    products_done += static_cast<double>(count) * static_cast<double>(rest);
    if (options.progress && products_done < all_products) options.progress(products_done / all_products);
  }
  return true;
}

// How far a single-precision cosine similarity of two rows can be from the exact one, for
// rows of `cols` features scaled to length 1 in double precision and then rounded to
// single precision (unit roundoff u = 2^-24). Rounding each value gives each product a
// relative error of at most 2u + u^2, and the products of two unit vectors add up in
// absolute value to at most 1 (Cauchy-Schwarz); summing `cols` products in single
// precision, in any order and with or without fused multiply-adds, adds at most
// gamma_cols = cols u / (1 - cols u) times that sum (Higham, Accuracy and Stability of
// Numerical Algorithms, 2nd ed., 2002, section 3.1). Twice that bound is used, for room.
double similarity_error_bound(std::size_t cols) {
  const double u = std::ldexp(1.0, -24);
  const double terms = static_cast<double>(cols) + 2.0;
  return 2.0 * terms * u / (1.0 - terms * u);
}

// Screening pays while the window stays narrow: at 16,384 features the bound is 2e-3.
constexpr std::size_t kMostScreenedFeatures = 16384;

// The nearest by screening (see nearest_rows.h): dot products of the rows scaled to
// length 1, in single precision; then each row's candidates measured in double
// precision. Null when the BLAS has no sgemm.
std::optional<std::vector<std::vector<NearRow>>> nearest_by_screening(const RowMatrix& rows, std::size_t keep,
                                                                      const RowLengths& lengths,
                                                                      const NearestOptions& options) {
  const auto n = static_cast<std::size_t>(rows.rows());
  using FloatRows = Eigen::Matrix<float, Eigen::Dynamic, Eigen::Dynamic, Eigen::RowMajor>;
  FloatRows unit = uninitialised_matrix<FloatRows>(rows.rows(), rows.cols());
  parallel_items(n, options.distance.threads, [&](std::size_t i) {
    const auto r = static_cast<Eigen::Index>(i);
    unit.row(r) = (rows.row(r) * lengths.inverse[i]).cast<float>();  // a zero row stays 0
  });
  // Two rows whose exact similarities differ by less than the rounding of the double
  // precision distances (some 1e-13 here) must both be candidates, hence the 1e-9.
  const double window = 2 * similarity_error_bound(static_cast<std::size_t>(rows.cols())) + 1e-9;
  std::vector<Candidates> candidates;
  const bool screened = offer_every_pair<float>(
      n, options, Candidates(keep, window), candidates,
      [&](std::size_t first, std::size_t count, std::size_t rest, float* out) {
        return float_dot_products(unit.data(), unit.cols(), static_cast<Eigen::Index>(first),
                                  static_cast<Eigen::Index>(count), static_cast<Eigen::Index>(first),
                                  static_cast<Eigen::Index>(rest), out);
      },
      [](float similarity, std::size_t, std::size_t) { return similarity; });
  if (!screened) return std::nullopt;
  std::vector<std::vector<NearRow>> out(n);
  parallel_items(n, options.distance.threads, [&](std::size_t i) {
    // The k nearest in double precision are among the candidates: a row outside the
    // window is, exactly, further than each of the k rows with the largest screened
    // similarities, by more than the double-precision distances' rounding. A zero row
    // (scaled, still 0) has the similarity 0 with every row, which is exact for a row
    // that is not zero (distance 1, cosine_gram.h); for a zero row itself every row is
    // then a candidate, and the other zero rows' distance 0 comes from cosine_from_dot.
    BestRows best(keep);
    const auto a = static_cast<Eigen::Index>(i);
    candidates[i].for_each([&](std::size_t j, float) {
      const double dot = rows.row(a).dot(rows.row(static_cast<Eigen::Index>(j)));
      best.offer(j, cosine_from_dot(dot, lengths, i, j));
    });
    out[i] = best.take();
  });
  return out;
}

}  // namespace

std::vector<std::vector<NearRow>> nearest_in_matrix(const Eigen::MatrixXd& distances, std::size_t k,
                                                    unsigned threads) {
  const auto n = static_cast<std::size_t>(distances.rows());
  std::vector<std::vector<NearRow>> out(n);
  parallel_items(n, threads, [&](std::size_t i) {
    // The matrix is symmetric: row i is read as column i, contiguous in column-major storage.
    const double* column = distances.data() + static_cast<std::ptrdiff_t>(i * n);
    BestRows best(std::min(k, n - 1));
    for (std::size_t j = 0; j < n; ++j)
      if (j != i) best.offer(j, column[j]);
    out[i] = best.take();
  });
  return out;
}

namespace {

std::vector<std::vector<NearRow>> search_nearest(const RowMatrix& rows, DistanceMeasure measure, std::size_t k,
                                                 const NearestOptions& options) {
  check_distance_input(rows);
  const auto n = static_cast<std::size_t>(rows.rows());
  const std::size_t keep = std::min(k, n - 1);
  if (!uses_gram_matrix(measure)) {
    // The pair sums a band of rows at a time (blocked_pairs.h), each turned into its
    // distance as the whole matrix has it: the same distances, in a band's memory.
    const PairSumMeasure how = pair_sum_measure(measure, rows.cols());
    RowMatrix weighted;
    const RowMatrix& summed = rows_to_sum(rows, how, weighted);
    std::vector<BestRows> best;
    offer_every_pair<double>(
        n, options, BestRows(keep), best,
        [&](std::size_t first, std::size_t count, std::size_t, double* out) {
          blocked_pair_sums_band(summed, how.kind, static_cast<Eigen::Index>(first), static_cast<Eigen::Index>(count),
                                 out, options.distance.threads);
          return true;
        },
        [&](double sum, std::size_t, std::size_t) { return how.distance(sum); });
    return BestRows::take_all(best);
  }
  const RowLengths lengths = row_lengths(rows);
  if (options.screen && keep > 0 && static_cast<std::size_t>(rows.cols()) <= kMostScreenedFeatures)
    if (auto screened = nearest_by_screening(rows, keep, lengths, options)) return std::move(*screened);
  // Every pair in double precision.
  std::vector<BestRows> best;
  offer_every_pair<double>(
      n, options, BestRows(keep), best,
      [&](std::size_t first, std::size_t count, std::size_t rest, double* out) {
        dot_products(rows, static_cast<Eigen::Index>(first), static_cast<Eigen::Index>(count),
                     static_cast<Eigen::Index>(first), static_cast<Eigen::Index>(rest), out);
        return true;
      },
      [&](double dot, std::size_t i, std::size_t j) { return cosine_from_dot(dot, lengths, i, j); });
  return BestRows::take_all(best);
}

}  // namespace

std::vector<std::vector<NearRow>> nearest_rows(const RowMatrix& rows, DistanceMeasure measure, std::size_t k,
                                               const NearestOptions& options) {
  std::vector<std::vector<NearRow>> nearest = search_nearest(rows, measure, k, options);
  if (options.progress) options.progress(1.0);  // the candidates measured in double precision too
  return nearest;
}

}  // namespace manicule
