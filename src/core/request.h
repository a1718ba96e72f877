// Request: everything a caller (the command line, a host editor through the C ABI) says
// about a run: which files, which units, which text, how to tokenise and what to count.
// Later layers add their own option blocks here; faces fill it, the facade reads it.
#pragma once
#include <string>
#include <vector>

#include "attribution/attribution_options.h"
#include "core/clustering.h"
#include "measure/distance_measure.h"
#include "measure/pca.h"
#include "profile/feature_space.h"
#include "profile/feature_spec.h"
#include "tei/selection_rules.h"
#include "text/tokenizer_options.h"

namespace manicule {

struct Request {
  std::vector<std::string> inputs;  // TEI files, or folders searched for *.xml
  std::string unit = "whole";       // speaker | letter | chapter | whole | xpath:EXPR
  Preset preset = Preset::reading;
  std::vector<std::string> keep;    // element names to keep although skipped by default
  std::vector<std::string> drop;    // element names to leave out as well
  JointSpeech joint = JointSpeech::each;
  std::string base_witness;         // app without lem: take the rdg of this witness
  std::string default_language;     // when the edition declares none
  TokenizerOptions tokenizer;
  FeatureSpec features;             // what to count per segment (words by default)
  bool keep_text = false;           // keep each segment's selected text in the result
  bool keep_counts = true;          // merge each file's counts into Corpus::counts (listing
                                    // segments needs only their token and type numbers)
  unsigned threads = 0;             // 0 = one per core

  // Analysis: which features, which measure, what to compute beyond the profiles.
  FeatureSpaceOptions feature_space;  // rank range, culling, stop words, minimum size
  DistanceMeasure measure = DistanceMeasure::cosine_delta;
  bool compute_distances = true;
  // false: of the distances only each segment's nearest are kept (DistanceResult::values
  // stays empty), found without the n x n matrix where the measure allows (nearest_rows.h);
  // a dendrogram still gets its matrix.
  bool keep_distance_matrix = true;
  std::size_t neighbours = 5;         // nearest segments kept per segment
  bool compute_pca = false;
  PcaOptions pca;
  ClusteringOptions clustering;       // dendrogram or consensus tree (core/clustering.h)
  AttributionOptions attribution;     // labels, candidate rule, resampling, impostors

  // The selection rules this request describes (throws Error(usage) on bad names).
  SelectionRules selection_rules() const;
};

}  // namespace manicule
