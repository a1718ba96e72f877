// Analysis: the one plain value a run produces. Every writer (tables, JSON, TEI standoff,
// Web Annotation, the archive store, the report) reads only this; nothing downstream
// reaches back into the XML. Parts a run did not compute stay empty.
#pragma once
#include <optional>
#include <string>
#include <vector>

#include "attribution/attribution_result.h"
#include "core/clustering.h"
#include "core/provenance.h"
#include "core/segment.h"
#include "measure/distance_measure.h"
#include "measure/pca.h"
#include "profile/feature_table.h"

namespace manicule {

struct SegmentSummary {
  std::string id;          // "<file stem>#<local id>"
  std::string file;
  // The work it belongs to, which evaluation and calibration hold out whole: its file, or
  // in a file of several texts (a teiCorpus of letters) its own text, "FILE#text3".
  std::string work;
  std::string local_id;
  std::string unit;
  std::string label;
  std::string language;
  std::vector<std::string> pointers;  // "#id" or xpath(...) into `file`
  std::string author;      // who the edition says wrote/spoke it ("" = questioned)
  Authorship authorship = Authorship::unknown;
  std::size_t tokens = 0;
  std::size_t types = 0;
  bool measured = false;   // in the feature table (passed the minimum size)
  std::string excluded_reason;  // why not, when not measured
  std::vector<std::string> warnings;

  // The file's part of the id, all before "#" and the local id ("ferry-letters" of
  // "ferry-letters#L07"): a file's name may hold a '#' itself, a local id may not end
  // the id otherwise.
  std::string id_prefix() const {
    const std::size_t tail = local_id.size() + 1;
    if (id.size() > tail && id.compare(id.size() - tail, tail, "#" + local_id) == 0) return id.substr(0, id.size() - tail);
    return id.substr(0, id.find('#'));
  }
};

struct Neighbour {
  std::size_t segment = 0;  // index into Analysis::segments
  double distance = 0;
};

struct DistanceResult {
  DistanceMeasure measure = DistanceMeasure::cosine_delta;
  std::vector<std::size_t> rows;  // index into Analysis::segments for each row/column
  Eigen::MatrixXd values;
  // For each row, the k nearest other segments, nearest first.
  std::vector<std::vector<Neighbour>> nearest;
};

struct Analysis {
  Provenance provenance;
  std::vector<SegmentSummary> segments;
  // The numbers every measure used: measured segments x features (rank order), with
  // counts, relative frequencies, z-scores and what the feature selection reported.
  // Row r is segment table_rows[r].
  FeatureTable table;
  std::vector<std::size_t> table_rows;  // index into segments for each table row
  std::optional<DistanceResult> distances;
  std::optional<PcaResult> pca;  // segment_ids are the measured segments, in row order
  std::optional<ClusteringResult> clustering;
  // Attribution (attribution/attribution_result.h): candidates ranked for each questioned
  // segment; General Impostors verification with its calibrated band; self-evaluation.
  std::vector<AttributionResult> attributions;
  std::vector<VerificationResult> verifications;
  std::optional<VerificationBand> verification_band;
  std::optional<EvaluationResult> evaluation;
  std::vector<std::string> notes;  // run-level remarks for the user (e.g. excluded segments)
};

}  // namespace manicule
