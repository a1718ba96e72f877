// AttributionOptions: how `attribute`, `verify` and `evaluate` work on the feature table of
// a run. One block in Request; the command line fills it (cli/attribution_cli_options.h).
// Every default is documented in docs/attribution.md with the evidence behind it.
#pragma once
#include <cstddef>
#include <cstdint>
#include <string>
#include <utility>
#include <vector>

namespace manicule {

// How a candidate's segments are summed up into one profile to measure a questioned text
// against.
enum class CandidateRule {
  // The mean of the candidate's segments, each weighted by its nearness to the questioned
  // text: weight exp(-(d / d_nearest - 1) / weight_spread), so the nearest segment counts
  // fully and one 20% farther (with the default spread) counts e^-1. Between the two
  // rules below: a candidate who wrote in several manners is met in the nearest one.
  weighted_centroid,
  centroid,  // the plain mean of the candidate's segments
  nearest,   // the candidate's single nearest segment
};

// One row of a labels file: a segment id and who wrote it ("" = questioned).
struct LabelOverride {
  std::string segment;
  std::string label;
  std::size_t line = 0;  // where it was read, for messages
  std::string source;    // the file it came from
};

struct AttributionOptions {
  // Labels read from a file (`segment,label`); they override what the edition says.
  std::vector<LabelOverride> labels;
  // Files whose segments serve only as impostors (verification), never as candidates.
  std::vector<std::string> impostor_files;
  // Whether the front end reads a labels file (--labels): messages on missing candidates or
  // questioned segments suggest it only then (the archive store takes the edition's word).
  bool labels_option = true;

  CandidateRule rule = CandidateRule::weighted_centroid;
  double weight_spread = 0.2;
  // z-scores beyond +-z_limit are set to +-z_limit before measuring (0 = not limited), so
  // that one word a text overuses (a name, a topic word) cannot dominate the distance.
  double z_limit = 2.0;

  // Stability: random subsets of the features (share of the columns), seeded.
  std::size_t resamples = 100;
  double resample_share = 0.5;
  std::uint64_t seed = 1;

  // General Impostors verification.
  std::size_t impostor_iterations = 100;
  double impostor_feature_share = 0.5;
  std::size_t impostors_per_iteration = 10;
  std::string verify_candidate;      // verify against this candidate only ("" = each)
  std::size_t calibration_problems = 400;  // at most this many known problems calibrate

  // Evaluation: leave out the held-out segment's whole file, so that chapters of one
  // novel never vouch for each other.
  bool leave_out_files = false;
  std::size_t verification_pairs = 0;  // evaluate: also this many same + different pairs
  // Known verification problems simulate a questioned text whose author is not in the run:
  // a held-out segment's own author is left out of the impostors of its different-author
  // problems. `verify` always calibrates so (the case that misleads); `evaluate` reports
  // both ways.
  bool author_absent = false;

  // Sizes behind the warnings (Eder 2015, DSH 30(2): about 5,000 words in most languages).
  std::size_t reliable_words = 5000;
};

}  // namespace manicule
