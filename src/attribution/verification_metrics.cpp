#include "attribution/verification_metrics.h"

#include <algorithm>
#include <numeric>

namespace manicule {

double roc_auc(const std::vector<double>& scores, const std::vector<bool>& same) {
  // Rank-sum form of the Mann-Whitney U with mid-ranks for ties.
  const std::size_t n = scores.size();
  std::vector<std::size_t> order(n);
  std::iota(order.begin(), order.end(), std::size_t{0});
  std::sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) { return scores[a] < scores[b]; });
  double positive_rank_sum = 0, positives = 0;
  for (std::size_t i = 0; i < n;) {
    std::size_t j = i;
    while (j < n && scores[order[j]] == scores[order[i]]) ++j;
    const double mid_rank = (static_cast<double>(i) + static_cast<double>(j) + 1) / 2;  // ranks i+1..j
    for (std::size_t t = i; t < j; ++t) {
      if (same[order[t]]) {
        positive_rank_sum += mid_rank;
        positives += 1;
      }
    }
    i = j;
  }
  const double negatives = static_cast<double>(n) - positives;
  if (positives == 0 || negatives == 0) return 0.0;
  return (positive_rank_sum - positives * (positives + 1) / 2) / (positives * negatives);
}

double c_at_1(const std::vector<double>& scores, const std::vector<bool>& same) {
  const double n = static_cast<double>(scores.size());
  if (n == 0) return 0.0;
  double correct = 0, unanswered = 0;
  for (std::size_t i = 0; i < scores.size(); ++i) {
    if (scores[i] == 0.5) {
      unanswered += 1;
    } else if ((scores[i] > 0.5) == same[i]) {
      correct += 1;
    }
  }
  return (correct + unanswered * correct / n) / n;
}

double f05u(const std::vector<double>& scores, const std::vector<bool>& same) {
  double tp = 0, fp = 0, fn = 0, unanswered = 0;
  for (std::size_t i = 0; i < scores.size(); ++i) {
    if (scores[i] == 0.5) {
      unanswered += 1;
    } else if (scores[i] > 0.5) {
      (same[i] ? tp : fp) += 1;
    } else if (same[i]) {
      fn += 1;
    }
  }
  if (tp == 0) return 0.0;
  return 1.25 * tp / (1.25 * tp + 0.25 * (fn + unanswered) + fp);
}

}  // namespace manicule
