#include "attribution/verification_band.h"

#include <cmath>

#include "attribution/verification_metrics.h"

namespace manicule {

double calibrated_score(double score, const VerificationBand& band) {
  if (score < band.low) return band.low > 0 ? 0.5 * score / band.low : 0.0;
  if (score > band.high) return band.high < 1 ? 0.5 + 0.5 * (score - band.high) / (1 - band.high) : 1.0;
  return 0.5;
}

std::string verification_decision(double score, const VerificationBand& band) {
  if (score < band.low) return "different-author";
  if (score > band.high) return "same-author";
  return "undecided";
}

VerificationBand calibrate_band(const std::vector<KnownProblem>& problems, std::size_t minimum_each) {
  VerificationBand band;
  std::vector<bool> same;
  for (const auto& p : problems) {
    same.push_back(p.same);
    (p.same ? band.same_problems : band.different_problems) += 1;
  }
  band.method = "c@1 maximised over bands on a 0.01 grid, on " + std::to_string(problems.size()) +
                " problems of the run's labelled segments, each left out in turn";
  if (band.same_problems < minimum_each || band.different_problems < minimum_each) {
    band.method = "not calibrated: " + std::to_string(band.same_problems) + " same-author and " +
                  std::to_string(band.different_problems) + " different-author known problems, fewer than " +
                  std::to_string(minimum_each) + " of each; scores are read against 0.5";
    return band;
  }
  double best = -1, best_width = 2, best_offcentre = 2;
  std::vector<double> mapped(problems.size());
  for (int lo = 0; lo <= 100; ++lo) {
    for (int hi = lo; hi <= 100; ++hi) {
      VerificationBand trial;
      trial.low = lo / 100.0;
      trial.high = hi / 100.0;
      for (std::size_t i = 0; i < problems.size(); ++i) mapped[i] = calibrated_score(problems[i].score, trial);
      const double value = c_at_1(mapped, same);
      const double width = trial.high - trial.low;
      const double offcentre = std::abs((trial.high + trial.low) / 2 - 0.5);
      const bool better = value > best + 1e-12 ||
                          (std::abs(value - best) <= 1e-12 &&
                           (width < best_width - 1e-12 || (std::abs(width - best_width) <= 1e-12 && offcentre < best_offcentre)));
      if (better) {
        best = value;
        best_width = width;
        best_offcentre = offcentre;
        band.low = trial.low;
        band.high = trial.high;
      }
    }
  }
  band.calibrated = true;
  std::vector<double> scores;
  for (const auto& p : problems) scores.push_back(calibrated_score(p.score, band));
  band.auc = roc_auc(scores, same);
  band.c_at_1 = c_at_1(scores, same);
  band.f05u = f05u(scores, same);
  return band;
}

}  // namespace manicule
