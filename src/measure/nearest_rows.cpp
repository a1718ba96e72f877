#include "measure/nearest_rows.h"

#include <algorithm>

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
  const std::vector<NearRow>& rows() const { return best_; }
  std::vector<NearRow> take() { return std::move(best_); }

 private:
  static bool before(double distance, std::size_t row, const NearRow& other) {
    return distance < other.distance || (distance == other.distance && row < other.row);
  }
  std::size_t k_;
  std::vector<NearRow> best_;
};

// About this many bytes of dot products a block: large enough for the matrix product to
// run at speed, small enough to stay in the caches while the best are picked.
constexpr std::size_t kBlockBytes = std::size_t{4} << 20;

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

std::vector<std::vector<NearRow>> nearest_rows(const RowMatrix& rows, DistanceMeasure measure, std::size_t k,
                                               const NearestOptions& options) {
  if (!uses_gram_matrix(measure))
    return nearest_in_matrix(pairwise_distances(rows, measure, options.distance), k, options.distance.threads);
  check_distance_input(rows);
  const auto n = static_cast<std::size_t>(rows.rows());
  const std::size_t keep = std::min(k, n - 1);
  const std::size_t block =
      std::min(n, options.block_rows ? options.block_rows : std::max<std::size_t>(1, kBlockBytes / sizeof(double) / n));
  const RowLengths lengths = row_lengths(rows);
  // Each block's products are written whole before they are read; only data() is used,
  // with the block's own row count as the leading dimension.
  Eigen::MatrixXd dots = uninitialised_matrix<Eigen::MatrixXd>(static_cast<Eigen::Index>(block),
                                                               static_cast<Eigen::Index>(n));
  std::vector<BestRows> best(n, BestRows(keep));
  // Each pair once, as the symmetric product does: a block of rows against itself and the
  // rows after it. A pair offers each row to the other's best; the rows after the block
  // are shared out among the threads, each row's best kept by one thread, and what the
  // block's rows are offered is gathered per thread and merged after.
  const std::size_t parts = 2 * resolve_thread_count(options.distance.threads);
  std::vector<std::vector<BestRows>> offered_to_block(parts);
  for (std::size_t first = 0; first < n; first += block) {
    const std::size_t count = std::min(block, n - first);
    const std::size_t rest = n - first;  // rows first .. n - 1, the block's own included
    // dots[c + count * r]: block row c . row first + r
    dot_products(rows, static_cast<Eigen::Index>(first), static_cast<Eigen::Index>(count),
                 static_cast<Eigen::Index>(first), static_cast<Eigen::Index>(rest), dots.data());
    const std::size_t part_rows = (rest + parts - 1) / parts;
    parallel_items(parts, options.distance.threads, [&](std::size_t part) {
      std::vector<BestRows>& to_block = offered_to_block[part];
      to_block.assign(count, BestRows(keep));
      const std::size_t end = std::min(rest, (part + 1) * part_rows);
      for (std::size_t r = part * part_rows; r < end; ++r) {
        const std::size_t j = first + r;
        const double* column = dots.data() + r * count;
        for (std::size_t c = 0; c < count; ++c) {
          const std::size_t i = first + c;
          if (i == j) continue;
          const double d = cosine_from_dot(column[c], lengths, i, j);
          best[j].offer(i, d);
          // A pair inside the block offers to both from both ends (r runs over the block
          // too); a row after it offers to the block's row here, once.
          if (r >= count) to_block[c].offer(j, d);
        }
      }
    });
    for (const auto& to_block : offered_to_block)
      for (std::size_t c = 0; c < to_block.size(); ++c)
        for (const NearRow& r : to_block[c].rows()) best[first + c].offer(r.row, r.distance);
  }
  std::vector<std::vector<NearRow>> out(n);
  for (std::size_t i = 0; i < n; ++i) out[i] = best[i].take();
  return out;
}

}  // namespace manicule
