// What attribution adds to an Analysis: plain values that every writer (TSV, JSON, the
// TEI standoff writer) can read without knowing how they were computed.
// Indices into Analysis::segments are called `segment`; labels are candidate names as the
// edition or the labels file spells them. Distances are under the run's measure (smaller
// = nearer); scores are in [0, 1] (larger = more likely the same author). No field is ever
// NaN or infinite.
#pragma once
#include <cstddef>
#include <cstdint>
#include <string>
#include <vector>

namespace manicule {

// Carried by every attribution and verification output, in every format.
inline constexpr const char* kAttributionCaution =
    "Statistical evidence, not proof: these figures measure stylistic likeness under the "
    "settings recorded here. Weigh them with the documentary evidence; the attribution "
    "remains the judgement of the responsible scholar.";

// One candidate as measured from one questioned segment.
struct CandidateDistance {
  std::string candidate;
  std::size_t rank = 0;             // 1 = nearest under the rule
  double distance = 0;              // to the candidate's profile under the rule
  double nearest_distance = 0;      // to the candidate's nearest single segment
  std::size_t nearest_segment = 0;  // that segment (index into Analysis::segments)
  std::size_t nearest_rank = 0;     // rank when candidates are ordered by nearest_distance
  std::size_t segments = 0;         // the candidate's measured segments
  std::size_t words = 0;            // their words in all
};

// `attribute`: the candidates for one questioned segment, ranked.
struct AttributionResult {
  std::size_t segment = 0;            // the questioned segment
  std::string edition_conjecture;     // author the edition conjectures, if it does
  std::string rule;                   // "weighted centroid", "centroid", "nearest segment"
  std::vector<CandidateDistance> candidates;  // nearest first
  double margin = 0;     // distance of the second minus that of the first (0 if alone)
  double stability = 0;  // share of resampled feature sets in which the first stays first
  std::size_t resamples = 0;
  double resample_share = 0;  // share of the features in each resample
  std::uint64_t seed = 0;
  std::vector<std::string> warnings;
};

// The band of General Impostors scores treated as "undecided", calibrated on problems
// whose answer the run knows (labelled segments, each left out in turn).
struct VerificationBand {
  double low = 0.5;   // scores below: different author
  double high = 0.5;  // scores above: same author; in between: undecided
  bool calibrated = false;        // false: too few known problems, the band is [0.5, 0.5]
  std::size_t same_problems = 0;  // known problems used, by their true answer
  std::size_t different_problems = 0;
  double auc = 0, c_at_1 = 0, f05u = 0;  // on those problems (in-sample)
  std::string method;                   // how the band was chosen, in words
  // AUC needs problems of both answers, c@1 and F0.5u any (as for VerificationEvaluation);
  // and, unlike there, all three are computed only for a band that was calibrated: they
  // describe the band, and an uncalibrated one has none to describe.
  bool auc_defined() const { return calibrated && same_problems > 0 && different_problems > 0; }
  bool rates_defined() const { return calibrated && same_problems + different_problems > 0; }
};

// `verify`: General Impostors (Koppel & Winter 2014) for one questioned segment and one
// candidate.
struct VerificationResult {
  std::size_t segment = 0;
  std::string candidate;
  double score = 0;             // share of iterations in which the candidate beat every impostor
  double calibrated_score = 0;  // band mapped to 0.5, below to [0, 0.5), above to (0.5, 1]
  std::string decision;         // "same-author", "different-author" or "undecided"
  std::size_t iterations = 0;
  double feature_share = 0;
  std::size_t impostors_per_iteration = 0;
  std::size_t impostor_pool = 0;      // impostors drawn from: other authors or impostor files
  std::size_t impostor_segments = 0;  // their segments, all of them
  std::uint64_t seed = 0;
  std::string edition_conjecture;  // author the edition conjectures for the segment, if it does
  std::vector<std::string> warnings;
};

// `evaluate`: how the settings fare on the run's own labelled segments.
struct CandidateEvaluation {
  std::string candidate;
  std::size_t segments = 0;   // labelled segments of this candidate that were held out
  std::size_t predicted = 0;  // held-out segments attributed to it
  std::size_t correct = 0;
  double precision = 0;       // correct / predicted (0 when nothing was predicted)
  double recall = 0;          // correct / segments
};

struct EvaluatedSegment {
  std::size_t segment = 0;
  std::string truth;
  std::string predicted;  // "" when no other segment of any candidate was left
  double margin = 0;
  bool truth_had_other_text = true;  // false: its candidate had nothing else left in
};

struct RuleAccuracy {
  std::string rule;
  std::size_t correct = 0;
  std::size_t evaluated = 0;
};

struct VerificationProblemScore {
  std::size_t segment = 0;     // the held-out (questioned) segment
  std::string candidate;       // the candidate, or the label of the pair's other segment
  std::size_t known_segment = 0;  // pairs: the other segment; else = segment
  bool same = false;           // the true answer
  double score = 0;            // General Impostors score
  double calibrated_score = 0; // on the PAN scale, band from the other half of the files
  bool band_calibrated = false;  // false: that band could not be calibrated; the score is read against 0.5
};

struct VerificationEvaluation {
  std::string problems;  // "segment against candidate" or "segment pairs"
  std::size_t same = 0, different = 0, undecided = 0;
  // AUC is undefined unless both answers occur, c@1 and F0.5u without any problem; the
  // fields then hold 0 and the writers print null / n/a.
  bool auc_defined() const { return same > 0 && different > 0; }
  bool rates_defined() const { return same + different > 0; }
  // PAN definitions, on calibrated scores; where a half's band could not be calibrated,
  // on its scores read against 0.5, as verify reads them then (`calibration` says so).
  double auc = 0, c_at_1 = 0, f05u = 0;
  double raw_auc = 0;                    // AUC of the scores themselves (no band)
  std::string calibration;               // how the bands were chosen without the answers
  std::vector<VerificationProblemScore> scores;  // every problem, for checking and plotting
};

struct EvaluationResult {
  std::string held_out;  // "segment" or "file"
  std::size_t evaluated = 0, correct = 0;
  double accuracy = 0;   // correct / evaluated; segments without other text count as wrong
  std::vector<std::string> candidates;             // rows and columns of the confusion matrix
  std::vector<std::vector<std::size_t>> confusion;  // [truth][predicted]
  std::vector<CandidateEvaluation> per_candidate;
  std::vector<EvaluatedSegment> segments;
  std::vector<RuleAccuracy> rules;  // each rule on the same held-out problems
  std::vector<VerificationEvaluation> verification;
  std::vector<std::string> warnings;
};

}  // namespace manicule
