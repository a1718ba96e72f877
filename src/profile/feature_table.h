// FeatureTable: the dense segments x features numbers every measure works on.
// Rows are the segments that passed the minimum size, in the order they were added;
// columns are the selected features, most frequent first (rank order).
//  - relative: count / the segment's total feature occurrences (all tokens for words, all
//              n-grams for n-grams), NOT over the selected features only, so a word's share
//              does not change with how many other words are selected; empty when the
//              table was built without keep_relative (feature_space.h)
//  - mean, sd: per feature over the table's segments; sd is the sample standard deviation
//              (divisor n - 1, as R's sd() and numpy's std(ddof=1))
//  - z:        (relative - mean) / sd; defined as 0 where sd is 0 (a feature with the same
//              relative frequency in every segment, or a table of one segment), never NaN
// The raw counts are not kept (feature_counts() gives them back): every measure works on
// relative frequencies or z-scores, and an analysis of the plays spared 16 MiB of fresh
// memory, which costs page faults on a virtual machine.
#pragma once
#include <cstddef>
#include <string>
#include <vector>

#include <Eigen/Dense>

#include "profile/feature_spec.h"

namespace manicule {

using RowMatrix = Eigen::Matrix<double, Eigen::Dynamic, Eigen::Dynamic, Eigen::RowMajor>;

struct ExcludedSegment {
  std::string id;
  std::size_t tokens = 0;
  std::string reason;  // e.g. "1203 tokens, fewer than the minimum of 1500"
};

// What the selection did, so that callers can tell the user instead of hiding it.
struct FeatureSelectionReport {
  std::size_t rank_first = 0;       // the range asked for
  std::size_t rank_last = 0;
  std::size_t candidates = 0;       // features that passed the stop list and culling
  std::size_t stopped = 0;          // features left out by the stop list
  std::size_t culled = 0;           // features left out by culling
  std::size_t zero_variance = 0;    // selected features with sd 0 (their z-scores are 0)
  bool fewer_than_asked = false;    // the vocabulary ran out before rank_last
  std::vector<ExcludedSegment> excluded_segments;
};

struct FeatureTable {
  FeatureSpec spec;
  std::vector<std::string> segment_ids;
  std::vector<std::size_t> segment_tokens;  // words per segment
  std::vector<std::size_t> segment_totals;  // feature occurrences per segment (denominator)
  std::vector<std::string> features;        // forms, rank order
  std::vector<std::size_t> feature_ranks;   // 1-based rank of each column
  std::vector<std::size_t> feature_totals;  // occurrences over the table's segments
  RowMatrix relative;
  Eigen::VectorXd mean;
  Eigen::VectorXd sd;
  RowMatrix z;
  FeatureSelectionReport report;

  std::size_t segment_count() const { return segment_ids.size(); }
  std::size_t feature_count() const { return features.size(); }
};

// The raw counts: relative x the segment's total, rounded (exact: a count is an integer far
// below 2^53, and relative is its quotient correctly rounded).
RowMatrix feature_counts(const FeatureTable& table);

// Fills mean, sd and z from relative (see above) and counts the zero-variance features.
// Without keep_relative, z takes relative's memory and relative is left empty.
void standardise(FeatureTable& table, bool keep_relative = true);

}  // namespace manicule
