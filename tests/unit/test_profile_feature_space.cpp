// Unit tests for the feature space: ranking and its tie-break, ranges, culling, stop lists,
// minimum segment size, and the documented edge cases (zero variance, vocabulary shorter
// than the range, a single segment, empty segments). Expected numbers are worked by hand
// from the definitions in feature_table.h.
#include <catch2/catch.hpp>

#include <cmath>

#include "core/error.h"
#include "profile/feature_space.h"
#include "profile/profile_builder.h"
#include "profile/stop_list.h"

using namespace manicule;

namespace {
CountProfile profile_of(const std::vector<std::pair<std::string, std::vector<std::string>>>& segments) {
  ProfileBuilder builder;
  for (const auto& [id, tokens] : segments) builder.add_segment(id, tokens);
  return builder.finish();
}

FeatureSpaceOptions small(std::size_t first = 1, std::size_t last = 1000) {
  FeatureSpaceOptions o;
  o.rank_first = first;
  o.rank_last = last;
  o.min_segment_tokens = 1;
  return o;
}
}  // namespace

TEST_CASE("features rank by total count, ties by UTF-8 bytes", "[profile]") {
  // Totals: b 3, a 2, é 2, z 2, c 1. "é" (0xC3 0xA9) sorts after "z" (0x7A) by bytes.
  const CountProfile p = profile_of({{"s1", {"b", "b", "z", "é", "a"}}, {"s2", {"b", "a", "z", "é", "c"}}});
  const FeatureTable t = build_feature_table(p, small());
  REQUIRE(t.features == std::vector<std::string>{"b", "a", "z", "é", "c"});
  REQUIRE(t.feature_ranks == std::vector<std::size_t>{1, 2, 3, 4, 5});
  const FeatureTable middle = build_feature_table(p, small(2, 3));
  REQUIRE(middle.features == std::vector<std::string>{"a", "z"});
  // Relative frequency is over all 5 tokens of the segment, not over the selected features.
  CHECK(middle.relative(0, 0) == Approx(0.2));
}

TEST_CASE("a zero-variance feature gets z = 0, never NaN", "[profile][edge]") {
  const CountProfile p = profile_of({{"s1", {"x", "y"}}, {"s2", {"x", "z"}}, {"s3", {"x", "y"}}});
  // Both ways of building: beside the relative frequencies, and in their place.
  const bool keep_relative = GENERATE(true, false);
  FeatureSpaceOptions options = small();
  options.keep_relative = keep_relative;
  const FeatureTable t = build_feature_table(p, options);
  REQUIRE(t.features.front() == "x");  // 0.5 in every segment
  CHECK(t.report.zero_variance == 1);
  CHECK(t.sd[0] == 0.0);
  CHECK(t.z.allFinite());
  CHECK(t.z.col(0).isZero());
  // y: 0.5, 0, 0.5 -> mean 1/3, sample sd sqrt(1/12); z of s1 = (1/6)/sqrt(1/12) = 1/sqrt(3)
  CHECK(t.mean[1] == Approx(1.0 / 3.0));
  CHECK(t.sd[1] == Approx(std::sqrt(1.0 / 12.0)));
  CHECK(t.z(0, 1) == Approx(1.0 / std::sqrt(3.0)));
  CHECK(t.z(1, 1) == Approx(-2.0 / std::sqrt(3.0)));  // (0 - 1/3) / sqrt(1/12)
  CHECK(t.relative.size() == (keep_relative ? t.z.size() : 0));
  if (keep_relative) CHECK(t.relative(1, 1) == 0.0);
}

TEST_CASE("asking for more features than exist uses those that exist", "[profile][edge]") {
  const CountProfile p = profile_of({{"s1", {"a", "b"}}, {"s2", {"a", "c"}}});
  const FeatureTable t = build_feature_table(p, small(1, 1000));
  CHECK(t.feature_count() == 3);
  CHECK(t.report.fewer_than_asked);
  CHECK(t.report.candidates == 3);
  try {
    build_feature_table(p, small(4, 10));
    FAIL("expected an error");
  } catch (const Error& e) {
    CHECK(e.kind() == ErrorKind::nothing_selected);
  }
}

TEST_CASE("a single segment gives a table whose z-scores are 0", "[profile][edge]") {
  FeatureSpaceOptions options = small();
  options.keep_relative = GENERATE(true, false);
  const FeatureTable t = build_feature_table(profile_of({{"only", {"a", "b", "a"}}}), options);
  CHECK(t.segment_count() == 1);
  CHECK(t.report.zero_variance == 2);
  CHECK(t.z.isZero());
}

TEST_CASE("small and empty segments are left out and reported", "[profile][edge]") {
  const CountProfile p = profile_of({{"big", {"a", "b", "c"}}, {"empty", {}}, {"tiny", {"a"}}, {"big2", {"a", "c", "c"}}});
  FeatureSpaceOptions o = small();
  o.min_segment_tokens = 2;
  const FeatureTable t = build_feature_table(p, o);
  REQUIRE(t.segment_ids == std::vector<std::string>{"big", "big2"});
  REQUIRE(t.report.excluded_segments.size() == 2);
  CHECK(t.report.excluded_segments[0].id == "empty");
  CHECK(t.report.excluded_segments[0].tokens == 0);
  CHECK(t.report.excluded_segments[1].id == "tiny");
  CHECK(t.report.excluded_segments[1].tokens == 1);
  o.min_segment_tokens = 0;  // even with no minimum an empty segment has nothing to compare
  CHECK(build_feature_table(p, o).report.excluded_segments.size() == 1);
  o.min_segment_tokens = 10;
  try {
    build_feature_table(p, o);
    FAIL("expected an error");
  } catch (const Error& e) {
    CHECK(e.kind() == ErrorKind::nothing_selected);
  }
}

TEST_CASE("the default minimum segment size is 1,500 tokens", "[profile]") {
  CHECK(FeatureSpaceOptions{}.min_segment_tokens == 1500);
}

TEST_CASE("culling keeps features found in enough segments", "[profile]") {
  const CountProfile p = profile_of({{"s1", {"a", "b", "c"}}, {"s2", {"a", "b"}}, {"s3", {"a", "d", "d", "d"}}});
  FeatureSpaceOptions o = small();
  o.culling_percent = 60;  // at least 1.8 of 3 segments
  const FeatureTable t = build_feature_table(p, o);
  CHECK(t.features == std::vector<std::string>{"a", "b"});
  CHECK(t.report.culled == 2);
  o.culling_percent = 101;
  CHECK_THROWS_AS(build_feature_table(p, o), Error);
}

TEST_CASE("stop lists leave words and the n-grams holding them out", "[profile]") {
  const std::vector<std::string> stop = parse_stop_list("# names\n  anna \r\nbob # the dog\n\n");
  REQUIRE(stop == std::vector<std::string>{"anna", "bob"});
  ProfileBuilder words;
  words.add_segment("s1", {"anna", "saw", "bob"});
  words.add_segment("s2", {"bob", "saw", "it"});
  FeatureSpaceOptions o = small();
  o.stop_words = stop;
  const FeatureTable t = build_feature_table(words.finish(), o);
  CHECK(t.features == std::vector<std::string>{"saw", "it"});
  CHECK(t.report.stopped == 2);
  CHECK(t.relative(1, 0) == Approx(1.0 / 3.0));  // the denominator still counts "bob"

  ProfileBuilder bigrams({FeatureKind::word_ngram, 2});
  bigrams.add_segment("s1", {"anna", "saw", "it"});
  bigrams.add_segment("s2", {"we", "saw", "it"});
  CHECK(build_feature_table(bigrams.finish(), o).features == std::vector<std::string>{"saw it", "we saw"});

  ProfileBuilder chars({FeatureKind::char_ngram, 2});
  chars.add_segment("s1", {"ab"});
  CHECK_THROWS_AS(build_feature_table(chars.finish(), o), Error);
  CHECK_THROWS_AS(load_stop_list("no/such/stop-list.txt"), Error);
}

TEST_CASE("bad ranges are usage errors", "[profile]") {
  const CountProfile p = profile_of({{"s1", {"a"}}});
  for (auto [first, last] : {std::pair<std::size_t, std::size_t>{0, 5}, {6, 5}}) {
    try {
      build_feature_table(p, small(first, last));
      FAIL("expected an error");
    } catch (const Error& e) {
      CHECK(e.kind() == ErrorKind::usage);
    }
  }
}

TEST_CASE("a table built on several threads counts every segment once", "[profile][threads]") {
  // 700 segments (the counting is split in parts of at least 256): segment i holds "a"
  // (i mod 3) + 1 times, "b" twice and "c<i mod 10>" once. By construction: totals b 1,400,
  // a 234 * 1 + 233 * 2 + 233 * 3 = 1,399, each c<k> 70 (ties in byte order), and in row i
  // each feature's count over the segment's (i mod 3) + 4 tokens.
  std::vector<std::pair<std::string, std::vector<std::string>>> segments;
  for (int i = 0; i < 700; ++i) {
    std::vector<std::string> tokens(static_cast<std::size_t>(i % 3 + 1), "a");
    tokens.insert(tokens.end(), {"b", "b", "c" + std::to_string(i % 10)});
    segments.push_back({"s" + std::to_string(i), tokens});
  }
  const CountProfile p = profile_of(segments);
  const unsigned threads = GENERATE(1u, 2u, 3u, 0u);
  const FeatureTable t = build_feature_table(p, small(), threads);
  REQUIRE(t.features == std::vector<std::string>{"b", "a", "c0", "c1", "c2", "c3", "c4", "c5", "c6", "c7", "c8", "c9"});
  CHECK(t.feature_totals == std::vector<std::size_t>{1400, 1399, 70, 70, 70, 70, 70, 70, 70, 70, 70, 70});
  REQUIRE(t.relative.rows() == 700);
  for (int i = 0; i < 700; ++i) {
    const double tokens = i % 3 + 4;
    for (int c = 0; c < 12; ++c) {
      const double expected = c == 0 ? 2 / tokens : c == 1 ? (i % 3 + 1) / tokens : c - 2 == i % 10 ? 1 / tokens : 0.0;
      CHECK(t.relative(i, c) == expected);  // the same division: bit for bit
    }
  }
}
