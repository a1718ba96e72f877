// FeatureSpace: chooses the features of a run and builds the FeatureTable.
// In this order:
//  1. Segments with fewer than min_segment_tokens words, or with no feature occurrence at
//     all (empty, or shorter than n for word n-grams), are left out and listed in
//     report.excluded_segments with their sizes.
//  2. Features on the stop list are left out (word n-grams: any n-gram containing a listed
//     word; a stop list with character n-grams is a usage error).
//  3. Culling: a feature must occur in at least culling_percent % of the kept segments.
//  4. The remaining features are ranked by total count over the kept segments, descending;
//     ties are broken by the form's UTF-8 bytes, ascending (so the order is the same on
//     every machine and run). Ranks rank_first..rank_last (1-based, inclusive) are used.
//     If fewer features exist, those that do are used and report.fewer_than_asked is set.
// Errors: usage for a bad range or share; nothing_selected if no segment is kept or no
// feature reaches rank_first.
#pragma once
#include <cstddef>
#include <string>
#include <vector>

#include "profile/count_profile.h"
#include "profile/feature_table.h"

namespace manicule {

// Default minimum segment size in words. Burrows (2002, LLC 17(3)) found Delta fairly
// reliable for texts down to about 1,500 words; Eder (2015, DSH 30(2)) needed about 5,000
// words for stable attribution in most languages (2,500 for Latin prose). 1,500 is the
// floor below which Delta results are not worth showing; docs/measures.md says more.
inline constexpr std::size_t kDefaultMinSegmentTokens = 1500;

struct FeatureSpaceOptions {
  std::size_t rank_first = 1;
  std::size_t rank_last = 1000;
  double culling_percent = 0.0;  // 0..100
  std::vector<std::string> stop_words;
  std::string stop_words_source;  // where they came from, for the record ("names.txt, SHA-256 ...")
  std::size_t min_segment_tokens = kDefaultMinSegmentTokens;
  // false: the z-scores are computed in the relative frequencies' place and
  // FeatureTable::relative is left empty: one table's memory less (20 MiB for the novels'
  // long chapters, fresh memory that costs page faults) for an analysis of z-scores only.
  bool keep_relative = true;
};

// Throws Error(usage) for options no table can be built with (ranks out of order, culling
// outside 0-100 %, a stop list for character n-grams); build_feature_table checks them too,
// a caller about to read an archive first can check them before.
void validate_feature_space_options(const FeatureSpec& spec, const FeatureSpaceOptions& options);

// `threads` (0: one per core) share the counting and the filling of the table; the
// table is the same, bit for bit, whatever their number.
FeatureTable build_feature_table(const CountProfile& profile, const FeatureSpaceOptions& options,
                                 unsigned threads = 1);

}  // namespace manicule
