#include "profile/profile_builder.h"

#include <algorithm>

#include "core/error.h"

namespace manicule {

namespace {
bool is_utf8_continuation(char c) { return (static_cast<unsigned char>(c) & 0xC0) == 0x80; }
}  // namespace

ProfileBuilder::ProfileBuilder(FeatureSpec spec) {
  validate(spec);
  profile_.spec = spec;
}

void ProfileBuilder::claim_id(const std::string& segment_id) {
  if (!seen_ids_.insert(segment_id).second) {
    throw Error(ErrorKind::usage, "segment id '" + segment_id + "' occurs twice in one profile");
  }
}

void ProfileBuilder::add_segment(std::string segment_id, const std::vector<std::string>& tokens) {
  begin_segment(std::move(segment_id));
  for (const std::string& token : tokens) add_token(token);
  end_segment();
}

void ProfileBuilder::begin_segment(std::string segment_id) {
  if (in_segment_) throw Error(ErrorKind::usage, "begin_segment() inside an open segment");
  claim_id(segment_id);
  in_segment_ = true;
  current_ = SegmentCounts{};
  current_.id = std::move(segment_id);
  recent_tokens_.resize(profile_.spec.kind == FeatureKind::word_ngram ? profile_.spec.n : 0);
  recent_next_ = 0;
  char_window_.clear();
}

void ProfileBuilder::count(std::string_view form) {
  const FeatureId id = profile_.vocabulary.intern(form);
  if (id >= scratch_counts_.size()) scratch_counts_.resize(std::max<std::size_t>(id + 1, 2 * scratch_counts_.size()), 0);
  if (scratch_counts_[id]++ == 0) touched_.push_back(id);
  ++current_.feature_total;
}

void ProfileBuilder::add_token(std::string_view token) {
  if (!in_segment_) throw Error(ErrorKind::usage, "add_token() outside a segment");
  if (token.empty()) return;  // an empty token carries no word
  ++current_.tokens;
  const FeatureSpec& spec = profile_.spec;
  if (spec.kind == FeatureKind::word || (spec.kind == FeatureKind::word_ngram && spec.n == 1)) {
    count(token);
    return;
  }
  if (spec.kind == FeatureKind::word_ngram) {
    const std::size_t n = recent_tokens_.size();
    recent_tokens_[recent_next_].assign(token);
    recent_next_ = (recent_next_ + 1) % n;
    if (current_.tokens < n) return;
    ngram_buffer_.clear();
    for (std::size_t k = 0; k < n; ++k) {  // oldest first: the ring's next slot is the oldest
      if (k > 0) ngram_buffer_.push_back(' ');
      ngram_buffer_.append(recent_tokens_[(recent_next_ + k) % n]);
    }
    count(ngram_buffer_);
    return;
  }
  if (current_.tokens > 1) char_window_.push_back(' ');
  char_window_.append(token);
  count_char_ngrams_ending_in_window();
}

// The window holds at most n-1 code points of earlier text followed by the new token, so
// each complete n-gram in it is new. Afterwards only the last n-1 code points are kept.
void ProfileBuilder::count_char_ngrams_ending_in_window() {
  const auto n = static_cast<std::size_t>(profile_.spec.n);
  code_point_starts_.clear();
  for (std::size_t i = 0; i < char_window_.size(); ++i) {
    if (!is_utf8_continuation(char_window_[i])) code_point_starts_.push_back(i);
  }
  code_point_starts_.push_back(char_window_.size());
  const std::size_t code_points = code_point_starts_.size() - 1;
  const std::string_view window(char_window_);
  for (std::size_t first = 0; first + n <= code_points; ++first) {
    const std::size_t begin = code_point_starts_[first];
    count(window.substr(begin, code_point_starts_[first + n] - begin));
  }
  if (code_points >= n) char_window_.erase(0, code_point_starts_[code_points - (n - 1)]);
}

void ProfileBuilder::end_segment() {
  if (!in_segment_) throw Error(ErrorKind::usage, "end_segment() without begin_segment()");
  current_.counts.reserve(touched_.size());
  // Every id counted is below both (count() grows scratch_counts_ to hold it).
  const std::size_t known = std::min(profile_.vocabulary.size(), scratch_counts_.size());
  if (touched_.size() * 16 >= known) {
    // Many of the known features: listing them by one pass over the counts in id order
    // costs less than sorting the ids touched (a speaker of a play uses thousands of its words).
    touched_.clear();
    for (FeatureId id = 0; id < static_cast<FeatureId>(known); ++id)
      if (scratch_counts_[id] != 0) touched_.push_back(id);
  } else {
    std::sort(touched_.begin(), touched_.end());
  }
  for (FeatureId id : touched_) {
    current_.counts.emplace_back(id, scratch_counts_[id]);
    scratch_counts_[id] = 0;
  }
  touched_.clear();
  profile_.segments.push_back(std::move(current_));
  current_ = SegmentCounts{};
  in_segment_ = false;
}

void ProfileBuilder::merge(CountProfile other) {
  if (in_segment_) throw Error(ErrorKind::usage, "merge() inside an open segment");
  if (other.spec.kind != profile_.spec.kind ||
      (other.spec.kind != FeatureKind::word && other.spec.n != profile_.spec.n)) {
    throw Error(ErrorKind::usage, "cannot merge counts of " + describe(other.spec) +
                                      " into a profile of " + describe(profile_.spec));
  }
  // Each form of `other` is looked up once, not once per segment that uses it (a word
  // spoken by twenty speakers of a play would otherwise be hashed twenty times).
  constexpr FeatureId kUnmapped = static_cast<FeatureId>(-1);
  std::vector<FeatureId> ours(other.vocabulary.size(), kUnmapped);
  // Lists cut from `other`'s arena must not outlive it: the arena comes along, or, where
  // this profile holds another, they are copied to the heap.
  const bool adopt_arena = other.count_memory && (!profile_.count_memory || profile_.count_memory == other.count_memory);
  if (adopt_arena) profile_.count_memory = other.count_memory;
  const bool copy_lists = other.count_memory && !adopt_arena;
  for (SegmentCounts& segment : other.segments) {
    claim_id(segment.id);
    bool ascending = true;
    FeatureId previous = 0;
    for (std::size_t k = 0; k < segment.counts.size(); ++k) {
      FeatureId& id = segment.counts[k].first;
      FeatureId& mapped = ours[id];
      if (mapped == kUnmapped) mapped = profile_.vocabulary.intern(other.vocabulary.form(id));
      id = mapped;
      if (k > 0 && id < previous) ascending = false;
      previous = id;
    }
    if (!ascending) std::sort(segment.counts.begin(), segment.counts.end());
    if (copy_lists)  // a new list (assigned, a list would stay in its arena)
      profile_.segments.push_back(SegmentCounts{std::move(segment.id), segment.tokens, segment.feature_total,
                                                CountEntries(segment.counts.begin(), segment.counts.end())});
    else
      profile_.segments.push_back(std::move(segment));
  }
}

CountProfile ProfileBuilder::finish() {
  if (in_segment_) throw Error(ErrorKind::usage, "finish() inside an open segment");
  CountProfile done = std::move(profile_);
  profile_ = CountProfile{};
  profile_.spec = done.spec;
  seen_ids_.clear();
  scratch_counts_.clear();
  return done;
}

}  // namespace manicule
