// Unit tests for ProfileBuilder and Vocabulary: interning, sparse counts, n-gram forms and
// totals, streaming equal to whole-segment input, merging builders.
#include <catch2/catch.hpp>

#include <map>
#include <unordered_map>

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

TEST_CASE("vocabulary tells apart forms that short-form packing could confuse", "[profile]") {
  // Forms of up to 8 bytes live packed in the hash slot: zero-padded, so "a", "a\0" and
  // "a\0\0" pack alike and their lengths (in the hash and the slot) tell them apart; prefixes of longer forms,
  // forms of exactly 8 and 9 bytes, and every length 0..24 are checked against a
  // std::unordered_map (the reference: ids are dense in order of first appearance).
  std::vector<std::string> forms = {"", std::string(1, '\0'), std::string(2, '\0'), "a", std::string("a\0", 2),
                                    std::string("a\0\0", 3), "abcdefgh", "abcdefghi", "abcdefgh\0", "Fräulein",
                                    "Fräulei", "Fräuleins"};
  for (std::size_t length = 0; length <= 24; ++length) {
    for (char c : {'x', 'y'}) forms.push_back(std::string(length, c));
    forms.push_back(std::string(length, 'x') + "y");
  }
  for (int reserve : {0, 1}) {
    Vocabulary v;
    if (reserve) v.reserve(forms.size() * 3);
    std::unordered_map<std::string, FeatureId> reference;
    for (int round = 0; round < 3; ++round) {  // a second and third round finds each form
      for (std::size_t i = 0; i < forms.size(); ++i) {
        const std::string form = forms[i] + (round == 2 ? std::to_string(i) : "");
        const auto [it, added] = reference.emplace(form, static_cast<FeatureId>(reference.size()));
        REQUIRE(v.intern(form) == it->second);
        (void)added;
      }
    }
    REQUIRE(v.size() == reference.size());
    for (const auto& [form, id] : reference) {
      REQUIRE(v.form(id) == form);
      REQUIRE(v.find(form) == id);
    }
    REQUIRE(v.find(std::string(3, '\0')) == std::nullopt);
    REQUIRE(v.find("abcdefghij") == std::nullopt);
  }
}

TEST_CASE("vocabulary compares long forms at every byte, at every length", "[profile]") {
  // A long form's slot points into the arena; forms of 9 to 16 bytes are compared as two
  // overlapping words, longer ones with memcmp, and a form longer than the slot's length
  // field (65,535 bytes and up) has its length looked up. Forms differing in one byte,
  // at each position of each length, must get ids of their own, checked against
  // std::unordered_map (the reference: ids dense in order of first appearance), with and
  // without a table grown under them, one at a time and through intern_all. (A compare
  // that wrongly says equal would only show when two forms share the slot's 28 hash bits,
  // which this test cannot arrange; one that wrongly says different, or a wrong length,
  // gives a form two ids and fails here.)
  std::vector<std::string> forms;
  for (std::size_t length : {9, 10, 11, 12, 13, 14, 15, 16, 17, 24, 33}) {
    const std::string base(length, 'q');
    forms.push_back(base);
    for (std::size_t at = 0; at < length; ++at) {
      std::string changed = base;
      changed[at] = 'r';
      forms.push_back(changed);
    }
  }
  for (std::size_t length : {65534, 65535, 65536, 70000}) {
    const std::string base(length, 'z');
    forms.push_back(base);
    forms.push_back(base.substr(0, length - 1) + "y");
    forms.push_back("y" + base.substr(1));
  }
  for (int reserve : {0, 1}) {
    Vocabulary one_at_a_time;
    if (reserve) one_at_a_time.reserve(forms.size());
    std::unordered_map<std::string, FeatureId> reference;
    for (int round = 0; round < 2; ++round) {
      for (const auto& form : forms) {
        const auto it = reference.emplace(form, static_cast<FeatureId>(reference.size())).first;
        REQUIRE(one_at_a_time.intern(form) == it->second);
      }
    }
    REQUIRE(one_at_a_time.size() == forms.size());
    Vocabulary all_at_once;
    std::vector<FeatureId> ids;
    all_at_once.intern_all(one_at_a_time, ids);  // a fresh target: every form new
    all_at_once.intern_all(one_at_a_time, ids);  // again: every form found
    for (std::size_t i = 0; i < forms.size(); ++i) {
      REQUIRE(ids[i] == reference.at(forms[i]));
      REQUIRE(all_at_once.find(forms[i]) == reference.at(forms[i]));
      REQUIRE(one_at_a_time.form(static_cast<FeatureId>(i)) == forms[i]);
    }
    REQUIRE(one_at_a_time.find(std::string(65537, 'z')) == std::nullopt);
    REQUIRE(one_at_a_time.find(std::string(16, 's')) == std::nullopt);
  }
}

TEST_CASE("interning a whole vocabulary at once gives the ids one at a time would", "[profile]") {
  // intern_all fetches slots ahead and reuses the source's hashes; the reference is
  // std::unordered_map (ids dense in order of first appearance). The target already holds
  // some of the forms, and grows several times on the way (from its 1,024 slots).
  Vocabulary source, target;
  std::unordered_map<std::string, FeatureId> reference;
  for (int i = 0; i < 3000; i += 3) {  // a third of the forms known to the target beforehand
    const std::string form = "w" + std::to_string(i * 7919 % 3001) + (i % 2 ? "longer-than-eight" : "");
    reference.emplace(form, static_cast<FeatureId>(reference.size()));
    target.intern(form);
  }
  std::vector<std::string> forms;
  for (int i = 0; i < 3000; ++i)
    forms.push_back("w" + std::to_string(i * 7919 % 3001) + (i % 2 ? "longer-than-eight" : ""));
  forms.push_back("");
  forms.push_back(std::string(1, '\0'));
  for (const std::string& form : forms) source.intern(form);
  std::vector<FeatureId> ids;
  target.intern_all(source, ids);
  REQUIRE(ids.size() == source.size());
  for (std::size_t i = 0; i < ids.size(); ++i) {
    const std::string form(source.form(static_cast<FeatureId>(i)));
    const auto it = reference.emplace(form, static_cast<FeatureId>(reference.size())).first;
    REQUIRE(ids[i] == it->second);
    REQUIRE(target.form(ids[i]) == form);
  }
  REQUIRE(target.size() == reference.size());
}

TEST_CASE("counts come out sorted whether a segment touches few or most known words", "[profile]") {
  // end_segment collects counts by scanning ids when a segment uses many of the known
  // features, by sorting the ids it touched otherwise; both must give what std::map gives.
  ProfileBuilder builder;
  std::vector<std::vector<std::string>> segments;
  std::vector<std::string> wide;  // 300 words in a scrambled order, some repeated
  for (int i = 0; i < 300; ++i) wide.push_back("w" + std::to_string((i * 7919) % 300));
  for (int i = 0; i < 50; ++i) wide.push_back("w" + std::to_string(i * 3));
  segments.push_back({"alone", "alone"});            // id 0, in no later segment
  segments.push_back(wide);                            // most of the known words: scanning
  segments.push_back({"w299", "w5", "w5", "w150"});  // few of the 301 known: sorting
  segments.push_back(wide);
  for (std::size_t i = 0; i < segments.size(); ++i) builder.add_segment("s" + std::to_string(i), segments[i]);
  const CountProfile p = builder.finish();
  for (std::size_t i = 0; i < segments.size(); ++i) {
    std::map<FeatureId, std::uint32_t> reference;
    for (const auto& w : segments[i]) ++reference[*p.vocabulary.find(w)];
    const CountEntries expected(reference.begin(), reference.end());
    CHECK(p.segments[i].counts == expected);
  }
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
