// Unit tests for ProfileBuilder and Vocabulary: interning, sparse counts, n-gram forms and
// totals, streaming equal to whole-segment input, merging builders.
#include <catch2/catch.hpp>

#include "core/error.h"
#include "profile/profile_builder.h"

using namespace manicule;

namespace {
std::uint32_t count_of(const CountProfile& p, std::size_t segment, const std::string& form) {
  const auto id = p.vocabulary.find(form);
  if (!id) return 0;
  for (const auto& [f, c] : p.segments[segment].counts) {
    if (f == *id) return c;
  }
  return 0;
}
}  // namespace

TEST_CASE("vocabulary interns each form once and survives growth", "[profile]") {
  Vocabulary v;
  for (int i = 0; i < 5000; ++i) REQUIRE(v.intern("w" + std::to_string(i)) == FeatureId(i));
  REQUIRE(v.size() == 5000);
  REQUIRE(v.intern("w42") == 42);
  REQUIRE(v.form(4999) == "w4999");
  REQUIRE(v.find("w5000") == std::nullopt);
  REQUIRE(v.intern("") == 5000);  // the empty form is a form like any other
}

TEST_CASE("word counts are sparse, sorted and total the tokens", "[profile]") {
  ProfileBuilder builder;
  builder.add_segment("s1", {"the", "cat", "the", "", "hat"});
  const CountProfile p = builder.finish();
  REQUIRE(p.segments.size() == 1);
  const SegmentCounts& s = p.segments[0];
  CHECK(s.tokens == 4);  // the empty token is not a word
  CHECK(s.feature_total == 4);
  CHECK(s.counts.size() == 3);
  CHECK(std::is_sorted(s.counts.begin(), s.counts.end()));
  CHECK(count_of(p, 0, "the") == 2);
}

TEST_CASE("word n-grams join tokens with one space and stay inside a segment", "[profile]") {
  ProfileBuilder builder({FeatureKind::word_ngram, 2});
  builder.add_segment("a", {"x", "y", "x", "y"});
  builder.add_segment("b", {"y"});
  const CountProfile p = builder.finish();
  CHECK(count_of(p, 0, "x y") == 2);
  CHECK(count_of(p, 0, "y x") == 1);
  CHECK(p.segments[0].feature_total == 3);
  CHECK(p.segments[1].tokens == 1);
  CHECK(p.segments[1].feature_total == 0);  // no bigram across the boundary
}

TEST_CASE("character n-grams count code points over tokens joined by spaces", "[profile]") {
  ProfileBuilder builder({FeatureKind::char_ngram, 3});
  builder.add_segment("a", {"über", "äß"});  // "über äß": 7 code points, 5 trigrams
  const CountProfile p = builder.finish();
  CHECK(p.segments[0].feature_total == 5);
  CHECK(count_of(p, 0, "übe") == 1);
  CHECK(count_of(p, 0, "er ") == 1);
  CHECK(count_of(p, 0, "r ä") == 1);
  CHECK(count_of(p, 0, " äß") == 1);
}

TEST_CASE("streaming tokens gives the same counts as whole segments", "[profile]") {
  const std::vector<std::string> tokens = {"a", "rose", "is", "a", "rose", "is", "a", "rose"};
  for (FeatureSpec spec : {FeatureSpec{FeatureKind::word, 1}, FeatureSpec{FeatureKind::word_ngram, 3},
                           FeatureSpec{FeatureKind::char_ngram, 4}}) {
    ProfileBuilder whole(spec);
    whole.add_segment("s", tokens);
    ProfileBuilder streamed(spec);
    streamed.begin_segment("s");
    for (const std::string& t : tokens) streamed.add_token(t);
    streamed.end_segment();
    const CountProfile a = whole.finish();
    const CountProfile b = streamed.finish();
    REQUIRE(a.segments[0].counts == b.segments[0].counts);
    REQUIRE(a.segments[0].feature_total == b.segments[0].feature_total);
  }
}

TEST_CASE("merging builders re-interns forms", "[profile]") {
  ProfileBuilder left;
  left.add_segment("l", {"b", "a"});
  ProfileBuilder right;
  right.add_segment("r", {"a", "c", "a"});
  left.merge(right.finish());
  const CountProfile p = left.finish();
  REQUIRE(p.segments.size() == 2);
  CHECK(count_of(p, 1, "a") == 2);
  CHECK(count_of(p, 1, "c") == 1);
  CHECK(std::is_sorted(p.segments[1].counts.begin(), p.segments[1].counts.end()));
}

TEST_CASE("misuse of the builder is a usage error", "[profile]") {
  ProfileBuilder builder;
  builder.add_segment("same", {"x"});
  REQUIRE_THROWS_AS(builder.add_segment("same", {"y"}), Error);
  REQUIRE_THROWS_AS(builder.add_token("x"), Error);
  REQUIRE_THROWS_AS(ProfileBuilder({FeatureKind::char_ngram, 0}), Error);
  ProfileBuilder chars({FeatureKind::char_ngram, 2});
  REQUIRE_THROWS_AS(builder.merge(chars.finish()), Error);
}
