// ProfileBuilder: turns each segment's token sequence (normalised strings from the text
// layer) into sparse feature counts, interning every feature form once.
// Either call add_segment() with all tokens, or stream: begin_segment(), add_token()...,
// end_segment(). Segment ids must be unique within a builder (Error usage otherwise).
// Counting uses a dense scratch array indexed by feature id, so the hot path does one
// hash lookup per feature and no allocation once the forms are known.
// One builder per thread; merge() folds in the counts of another builder's profile.
#pragma once
#include <string>
#include <string_view>
#include <unordered_set>
#include <vector>

#include "profile/count_profile.h"

namespace manicule {

class ProfileBuilder {
 public:
  explicit ProfileBuilder(FeatureSpec spec = {});
  // Makes room for about `features` distinct features (a guess; more still fit), so that
  // the vocabulary does not grow step by step while counting.
  void expect_features(std::size_t features) { profile_.vocabulary.reserve(features); }

  void add_segment(std::string segment_id, const std::vector<std::string>& tokens);

  void begin_segment(std::string segment_id);
  void add_token(std::string_view token);
  void end_segment();

  // Appends the segments of `other` (built with the same FeatureSpec) to this profile.
  void merge(CountProfile other);  // taken by value: its segments are moved in

  // The counts so far; the builder is empty afterwards.
  CountProfile finish();

  // Refuses a segment id this profile already holds (usage error); every segment added is
  // claimed, and a caller listing segments without counting them can claim theirs.
  void claim_id(const std::string& segment_id);

 private:
  void count(std::string_view form);
  void count_char_ngrams_ending_in_window();

  CountProfile profile_;
  std::unordered_set<std::string> seen_ids_;
  bool in_segment_ = false;
  SegmentCounts current_;
  std::vector<std::uint32_t> scratch_counts_;  // by feature id; zero outside a segment
  std::vector<FeatureId> touched_;             // ids counted in the current segment
  // Word n-grams: the last n tokens (a ring; strings keep their capacity).
  std::vector<std::string> recent_tokens_;
  std::size_t recent_next_ = 0;
  std::string ngram_buffer_;
  // Character n-grams: the tail of the joined text still needed for the next n-grams.
  std::string char_window_;
  std::vector<std::size_t> code_point_starts_;
};

}  // namespace manicule
