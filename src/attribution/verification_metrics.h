// Verification metrics as defined for the PAN authorship-verification tasks (2020-2023).
// Scores are in [0, 1]; `same` is the true answer of each problem. A score of exactly 0.5
// is a non-answer; above 0.5 answers "same author", below "different author".
//  - AUC: area under the ROC curve of the scores, i.e. the Mann-Whitney probability that a
//    same-author problem scores higher than a different-author one, ties counting 1/2.
//  - c@1 (Peñas & Rodrigo 2011, "A simple measure to assess non-response", ACL-HLT):
//    (n_correct + n_unanswered * n_correct / n) / n.
//  - F0.5u (Bevendorff, Stein, Hagen & Potthast 2019, "Generalizing unmasking for short
//    texts", NAACL-HLT): F0.5 with non-answers counted as false negatives:
//    1.25 tp / (1.25 tp + 0.25 (fn + nu) + fp).
// Each returns 0 when it is undefined (no problems; AUC without both answers; F0.5u with
// no true positive), never NaN.
#pragma once
#include <vector>

namespace manicule {

double roc_auc(const std::vector<double>& scores, const std::vector<bool>& same);
double c_at_1(const std::vector<double>& scores, const std::vector<bool>& same);
double f05u(const std::vector<double>& scores, const std::vector<bool>& same);

}  // namespace manicule
