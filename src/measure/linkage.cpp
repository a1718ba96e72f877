#include "measure/linkage.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numeric>

#include "core/error.h"

namespace manicule {

namespace {

// Position of pair (i, j), i != j, in the condensed upper triangle.
std::size_t condensed(std::size_t n, std::size_t i, std::size_t j) {
  if (i > j) std::swap(i, j);
  return n * i - i * (i + 1) / 2 + (j - i - 1);
}

void check_matrix(const Eigen::MatrixXd& d, std::size_t labels) {
  if (d.rows() != d.cols()) throw Error(ErrorKind::usage, "a distance matrix must be square");
  if (d.rows() < 2) throw Error(ErrorKind::usage, "clustering needs at least two segments");
  if (labels != static_cast<std::size_t>(d.rows())) {
    throw Error(ErrorKind::usage, "clustering needs one label per segment");
  }
  for (Eigen::Index i = 0; i < d.rows(); ++i) {
    for (Eigen::Index j = 0; j < i; ++j) {
      const double a = d(i, j);
      const double b = d(j, i);
      if (!std::isfinite(a) || !std::isfinite(b) || a < 0 || b < 0) {
        throw Error(ErrorKind::usage, "distances must be finite and not negative");
      }
      if (std::abs(a - b) > 1e-12 * std::max({1.0, a, b})) {
        throw Error(ErrorKind::usage, "a distance matrix must be symmetric");
      }
    }
  }
}

double updated_distance(LinkageMethod method, double d_xi, double d_yi, double d_xy, double n_x,
                        double n_y, double n_i) {
  switch (method) {
    case LinkageMethod::complete: return std::max(d_xi, d_yi);
    case LinkageMethod::average: return (n_x * d_xi + n_y * d_yi) / (n_x + n_y);
    case LinkageMethod::ward: {
      const double sum = (n_i + n_x) * d_xi * d_xi + (n_i + n_y) * d_yi * d_yi - n_i * d_xy * d_xy;
      return std::sqrt(std::max(0.0, sum / (n_i + n_x + n_y)));
    }
  }
  return 0;
}

// Nearest-neighbour chain: merges in the order found; cluster ids are slot numbers.
std::vector<Merge> chain_merges(const Eigen::MatrixXd& d, LinkageMethod method) {
  const auto n = static_cast<std::size_t>(d.rows());
  std::vector<double> dist(n * (n - 1) / 2);
  for (std::size_t i = 0; i < n; ++i) {
    for (std::size_t j = i + 1; j < n; ++j) {
      dist[condensed(n, i, j)] = d(static_cast<Eigen::Index>(j), static_cast<Eigen::Index>(i));
    }
  }
  std::vector<std::size_t> size(n, 1);  // 0 = slot no longer in use
  std::vector<std::size_t> chain;
  std::vector<Merge> merges;
  while (merges.size() + 1 < n) {
    if (chain.empty()) {
      chain.push_back(static_cast<std::size_t>(
          std::find_if(size.begin(), size.end(), [](std::size_t s) { return s > 0; }) - size.begin()));
    }
    std::size_t x = 0;
    std::size_t y = 0;
    double nearest = 0;
    while (true) {
      x = chain.back();
      // Prefer the previous chain element on a tie, so the chain cannot cycle.
      nearest = std::numeric_limits<double>::infinity();
      if (chain.size() > 1) {
        y = chain[chain.size() - 2];
        nearest = dist[condensed(n, x, y)];
      }
      for (std::size_t i = 0; i < n; ++i) {
        if (size[i] == 0 || i == x) continue;
        const double candidate = dist[condensed(n, x, i)];
        if (candidate < nearest) {
          nearest = candidate;
          y = i;
        }
      }
      if (chain.size() > 1 && y == chain[chain.size() - 2]) break;
      chain.push_back(y);
    }
    chain.resize(chain.size() - 2);
    if (x > y) std::swap(x, y);
    const auto n_x = static_cast<double>(size[x]);
    const auto n_y = static_cast<double>(size[y]);
    merges.push_back({x, y, nearest, size[x] + size[y]});
    size[x] = 0;
    size[y] += static_cast<std::size_t>(n_x);  // slot y now holds the merged cluster
    for (std::size_t i = 0; i < n; ++i) {
      if (size[i] == 0 || i == y) continue;
      double& d_yi = dist[condensed(n, i, y)];
      d_yi = updated_distance(method, dist[condensed(n, i, x)], d_yi, nearest, n_x, n_y,
                              static_cast<double>(size[i]));
    }
  }
  return merges;
}

// Sorts merges by height (stable) and renames slots to SciPy's cluster ids.
void relabel(std::vector<Merge>& merges, std::size_t n) {
  std::stable_sort(merges.begin(), merges.end(),
                   [](const Merge& a, const Merge& b) { return a.height < b.height; });
  std::vector<std::size_t> parent(2 * n - 1);
  std::iota(parent.begin(), parent.end(), 0);
  auto root = [&](std::size_t c) {
    while (parent[c] != c) c = parent[c] = parent[parent[c]];
    return c;
  };
  for (std::size_t k = 0; k < merges.size(); ++k) {
    const std::size_t a = root(merges[k].a);
    const std::size_t b = root(merges[k].b);
    merges[k].a = std::min(a, b);
    merges[k].b = std::max(a, b);
    parent[a] = parent[b] = n + k;
  }
}

}  // namespace

std::string_view linkage_method_name(LinkageMethod method) {
  switch (method) {
    case LinkageMethod::ward: return "ward";
    case LinkageMethod::average: return "average";
    case LinkageMethod::complete: return "complete";
  }
  return "ward";
}

LinkageMethod parse_linkage_method(std::string_view name) {
  for (LinkageMethod m : {LinkageMethod::ward, LinkageMethod::average, LinkageMethod::complete}) {
    if (linkage_method_name(m) == name) return m;
  }
  throw Error(ErrorKind::usage, "unknown linkage method '" + std::string(name) +
                                    "' (expected ward, average or complete)");
}

Dendrogram hierarchical_clustering(const Eigen::MatrixXd& distances,
                                   std::vector<std::string> labels, LinkageMethod method) {
  check_matrix(distances, labels.size());
  Dendrogram tree;
  tree.method = method;
  tree.labels = std::move(labels);
  tree.merges = chain_merges(distances, method);
  relabel(tree.merges, tree.labels.size());
  return tree;
}

}  // namespace manicule
