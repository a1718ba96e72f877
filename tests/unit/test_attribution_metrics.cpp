// Unit tests for the verification metrics and the undecided band, against small examples
// worked by hand from the published definitions (verification_metrics.h): c@1 as Peñas &
// Rodrigo (2011) define it, F0.5u as Bevendorff et al. (2019) define it, AUC as the
// Mann-Whitney probability with ties counting 1/2. Agreement with scikit-learn's
// roc_auc_score on real problems is in tests/reference/test_attribution_reference.py.
#include <catch2/catch.hpp>

#include "attribution/verification_band.h"
#include "attribution/verification_metrics.h"

using namespace manicule;

namespace {
// Six problems: two by the same author, four not. 0.5 = unanswered.
const std::vector<double> kScores{0.9, 0.2, 0.5, 0.7, 0.5, 0.1};
const std::vector<bool> kSame{true, false, true, false, false, false};
}  // namespace

TEST_CASE("c@1 worked by hand", "[attribution]") {
  // Answered: 0.9 same (right), 0.2 different (right), 0.7 same (wrong), 0.1 different
  // (right): n_c = 3; n_u = 2; n = 6. c@1 = (3 + 2 * 3/6) / 6 = 4/6.
  CHECK(c_at_1(kScores, kSame) == Approx(4.0 / 6.0));
  // With every problem answered c@1 is accuracy.
  CHECK(c_at_1({0.9, 0.1, 0.6}, {true, false, false}) == Approx(2.0 / 3.0));
  // Nothing answered: n_c = 0, so 0 (Peñas & Rodrigo: no credit without a right answer).
  CHECK(c_at_1({0.5, 0.5}, {true, false}) == 0.0);
  CHECK(c_at_1({}, {}) == 0.0);
}

TEST_CASE("F0.5u worked by hand", "[attribution]") {
  // tp = 1 (0.9), fp = 1 (0.7), fn = 0, non-answers = 2 (counted as false negatives):
  // 1.25 * 1 / (1.25 * 1 + 0.25 * (0 + 2) + 1) = 1.25 / 2.75.
  CHECK(f05u(kScores, kSame) == Approx(1.25 / 2.75));
  // All right: tp = 1, nothing else: 1.
  CHECK(f05u({0.8, 0.3}, {true, false}) == Approx(1.0));
  // A missed same-author problem: tp = 1, fn = 1: 1.25 / (1.25 + 0.25) = 5/6.
  CHECK(f05u({0.8, 0.3}, {true, true}) == Approx(5.0 / 6.0));
  CHECK(f05u({0.2}, {true}) == 0.0);  // no true positive: 0, not a division by zero
}

TEST_CASE("AUC worked by hand, ties counting one half", "[attribution]") {
  // Positives 0.9 and 0.5 against negatives 0.2, 0.7, 0.5, 0.1: 0.9 beats all four (4);
  // 0.5 beats 0.2 and 0.1, ties 0.5, loses to 0.7 (2.5). (4 + 2.5) / 8.
  CHECK(roc_auc(kScores, kSame) == Approx(6.5 / 8.0));
  CHECK(roc_auc({0.1, 0.9}, {false, true}) == Approx(1.0));
  CHECK(roc_auc({0.9, 0.1}, {false, true}) == Approx(0.0));
  CHECK(roc_auc({0.4, 0.4}, {false, true}) == Approx(0.5));
  // One class only: undefined; the function returns 0 and the writers print null / n/a
  // (VerificationEvaluation::auc_defined), never a figure that reads as a result.
  CHECK(roc_auc({0.4, 0.6}, {true, true}) == 0.0);
}

TEST_CASE("calibrated scores put the band at 0.5 and keep the order", "[attribution]") {
  VerificationBand band;
  band.low = 0.4;
  band.high = 0.8;
  CHECK(calibrated_score(0.2, band) == Approx(0.25));  // 0.5 * 0.2 / 0.4
  CHECK(calibrated_score(0.4, band) == 0.5);
  CHECK(calibrated_score(0.8, band) == 0.5);
  CHECK(calibrated_score(0.9, band) == Approx(0.75));  // 0.5 + 0.5 * 0.1 / 0.2
  CHECK(calibrated_score(1.0, band) == Approx(1.0));
  CHECK(verification_decision(0.39, band) == "different-author");
  CHECK(verification_decision(0.6, band) == "undecided");
  CHECK(verification_decision(0.81, band) == "same-author");
  band.low = 0.0;
  CHECK(calibrated_score(0.0, band) == 0.5);  // the band reaches 0: no division by zero
}

TEST_CASE("the band leaves the mixed scores undecided", "[attribution]") {
  // Same-author problems score 0.9 (x10) and 0.55 (x2); different-author ones 0.1 (x10)
  // and 0.55 (x2). Any band holding 0.55 and neither 0.1 nor 0.9 answers 20 right and
  // leaves 4 open: c@1 = (20 + 4 * 20/24) / 24; answering 0.55 either way gives only
  // 22 right of 24, less. The narrowest such band on the grid is [0.55, 0.55].
  std::vector<KnownProblem> problems;
  for (int i = 0; i < 10; ++i) problems.push_back({0.9, true});
  for (int i = 0; i < 10; ++i) problems.push_back({0.1, false});
  for (int i = 0; i < 2; ++i) problems.push_back({0.55, true});
  for (int i = 0; i < 2; ++i) problems.push_back({0.55, false});
  const VerificationBand band = calibrate_band(problems);
  CHECK(band.calibrated);
  CHECK(band.low == Approx(0.55));
  CHECK(band.high == Approx(0.55));
  CHECK(band.c_at_1 == Approx((20 + 4 * 20.0 / 24) / 24));
  CHECK(band.same_problems == 12);
  CHECK(band.different_problems == 12);
}

TEST_CASE("too few known problems leave the band uncalibrated", "[attribution]") {
  const VerificationBand band = calibrate_band({{0.9, true}, {0.1, false}});
  CHECK_FALSE(band.calibrated);
  CHECK(band.low == 0.5);
  CHECK(band.high == 0.5);
}
