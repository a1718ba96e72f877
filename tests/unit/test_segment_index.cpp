// Unit tests for SegmentIndex (core/segment_index.h): each id found at its position, the
// first of equal ids kept, an unknown id not found. The expected positions are known by
// construction (the ids are made from their positions), and, for many ids sharing long
// prefixes as a play's speakers do, by the definition the index replaced: the first
// segment in order whose id is equal.
#include <catch2/catch.hpp>

#include <string>
#include <vector>

#include "core/analysis.h"
#include "core/segment_index.h"

using namespace manicule;

namespace {
std::vector<SegmentSummary> segments_with_ids(const std::vector<std::string>& ids) {
  std::vector<SegmentSummary> out(ids.size());
  for (std::size_t i = 0; i < ids.size(); ++i) out[i].id = ids[i];
  return out;
}
}  // namespace

TEST_CASE("segment index: positions, the first of equal ids, unknown ids", "[segment_index]") {
  const auto segments = segments_with_ids({"a#x", "a#y", "b#x", "a#y", ""});
  const SegmentIndex index(segments);
  CHECK(index.find("a#x") == 0);
  CHECK(index.find("a#y") == 1);  // not 3: the first of the two
  CHECK(index.find("b#x") == 2);
  CHECK(index.find("") == 4);
  CHECK(index.find("a#") == SegmentIndex::npos);
  CHECK(index.find("a#x ") == SegmentIndex::npos);
  CHECK(SegmentIndex(segments_with_ids({})).find("a#x") == SegmentIndex::npos);
}

TEST_CASE("segment index: ids with long shared prefixes, against the first equal id in order", "[segment_index]") {
  // Play-like ids: a long file stem, then a speaker; every tenth id repeats an earlier one.
  std::vector<std::string> ids;
  for (int i = 0; i < 5000; ++i) {
    const int n = i % 10 == 9 ? i / 2 : i;
    ids.push_back("die-letzten-tage-eines-langen-dramas-in-fuenf-akten-" + std::to_string(n / 100) + "#speaker-" +
                  std::to_string(n % 100));
  }
  const auto segments = segments_with_ids(ids);
  const SegmentIndex index(segments);
  for (std::size_t i = 0; i < ids.size(); ++i) {
    std::size_t first = 0;
    while (ids[first] != ids[i]) ++first;
    REQUIRE(index.find(ids[i]) == first);
  }
  CHECK(index.find("die-letzten-tage-eines-langen-dramas-in-fuenf-akten-0#speaker-100") == SegmentIndex::npos);
}
