// Unit tests for CountArena and CountProfile::release_counts: count lists cut from the
// arena keep their values, and releasing them hands their memory back to the system, as
// the kernel itself accounts it (/proc/self/status, RssAnon: proc(5)). Also that a count
// blob decoded into the arena takes its list from there at its exact size.
#include <catch2/catch.hpp>

#include <cstdint>
#include <fstream>
#include <string>

#include "core/facade.h"
#include "profile/count_arena.h"
#include "profile/count_profile.h"
#include "profile/profile_builder.h"
#include "store/count_blob.h"

using namespace manicule;

namespace {

// Anonymous memory resident in this process, in KiB, as the kernel reports it.
long resident_anonymous_kib() {
  std::ifstream status("/proc/self/status");
  std::string key;
  while (status >> key) {
    long value = 0;
    if (key == "RssAnon:" && status >> value) return value;
    std::getline(status, key);
  }
  return -1;
}

}  // namespace

TEST_CASE("counts cut from an arena go back to the system when released", "[profile]") {
  const long before = resident_anonymous_kib();
  if (before < 0) {
    WARN("no RssAnon in /proc/self/status on this system: not checked");
    return;
  }
  CountProfile profile;
  profile.count_memory = std::make_shared<CountArena>();
  // 3,000 lists of 4,000 pairs: 96,000,000 bytes, every one written.
  constexpr std::uint32_t kLists = 3000;
  constexpr std::uint32_t kPairs = 4000;
  for (std::uint32_t s = 0; s < kLists; ++s) {
    CountEntries counts(profile.count_memory.get());
    counts.reserve(kPairs);
    for (std::uint32_t f = 0; f < kPairs; ++f) counts.emplace_back(f, s + f);
    profile.segments.push_back(SegmentCounts{"s" + std::to_string(s), kPairs, kPairs, std::move(counts)});
  }
  // Moved into the profile (and through its vector's growth), the lists stayed in the arena.
  bool in_arena = true;
  for (const SegmentCounts& s : profile.segments)
    in_arena = in_arena && s.counts.get_allocator().resource() == profile.count_memory.get();
  CHECK(in_arena);
  // Every value, read after all lists were written: lists that overlapped would show.
  bool values_kept = true;
  for (std::uint32_t s = 0; s < kLists; ++s)
    for (std::uint32_t f = 0; f < kPairs; ++f)
      values_kept = values_kept && profile.segments[s].counts[f] == std::pair<FeatureId, std::uint32_t>(f, s + f);
  CHECK(values_kept);
  const long filled = resident_anonymous_kib();
  // 96,000,000 bytes are 93,750 KiB. Some slack: kernels before 6.2 count a thread's
  // small-page faults into the process's figure only every 64 faults or so (from memory,
  // mm's SPLIT_RSS_COUNTING), and a release that kept the blocks would hand back 0.
  CHECK(filled - before >= 80'000);

  profile.release_counts();
  const long released = resident_anonymous_kib();
  CHECK(filled - released >= 80'000);
  CHECK(profile.count_memory->mapped_bytes() == 0);
  bool all_empty = true;
  for (const SegmentCounts& s : profile.segments) all_empty = all_empty && s.counts.empty();
  CHECK(all_empty);
  CHECK(profile.segments.size() == kLists);  // the segments themselves are kept
}

TEST_CASE("a count blob is decoded into the arena at its exact size", "[store]") {
  // Unsigned LEB128 (the DWARF standard, "Variable Length Data", section 7.6 in versions
  // 4 and 5, from memory), as docs/store.md lays the blob out: feature
  // 5 once; then the gap 300 (0xAC 0x02) to feature 305, counted 2; then the gap 1 to
  // feature 306, counted 200 (0xC8 0x01).
  const std::string blob("\x05\x01\xAC\x02\x02\x01\xC8\x01", 8);
  CountArena arena;
  const store::FeatureCounts counts = store::decode_counts(blob, &arena);
  const CountEntries expected{{5, 1}, {305, 2}, {306, 200}};
  CHECK(counts == expected);
  CHECK(counts.capacity() == 3);
  CHECK(counts.get_allocator().resource() == &arena);
  CHECK(arena.mapped_bytes() > 0);
}

TEST_CASE("merging a profile whose counts lie in an arena keeps them readable", "[profile]") {
  // The merged profile must keep the arena alive, or copy the lists out of it: otherwise
  // reading them after the merged-from profile is gone touches unmapped memory.
  const auto arena_profile = [](const std::string& id, std::uint32_t count) {
    CountProfile p;
    p.count_memory = std::make_shared<CountArena>();
    p.vocabulary.intern("und");
    p.vocabulary.intern("der");
    CountEntries counts(p.count_memory.get());
    counts.reserve(2);
    counts.emplace_back(0, count);
    counts.emplace_back(1, count + 1);
    p.segments.push_back(SegmentCounts{id, 2 * count + 1, 2 * count + 1, std::move(counts)});
    return p;
  };
  ProfileBuilder builder;
  CountProfile first = arena_profile("first", 3);
  const CountArena* first_arena = first.count_memory.get();
  builder.merge(std::move(first));            // into a profile with no arena: taken along
  builder.merge(arena_profile("second", 7));  // with another arena held: copied to the heap
  const CountProfile merged = builder.finish();
  CHECK(merged.count_memory.get() == first_arena);
  CHECK(merged.segments[0].counts.get_allocator().resource() == first_arena);
  REQUIRE(merged.segments.size() == 2);
  const FeatureId und = *merged.vocabulary.find("und");
  const FeatureId der = *merged.vocabulary.find("der");
  CHECK(merged.segments[0].counts == CountEntries{{und, 3}, {der, 4}});
  CHECK(merged.segments[1].counts == CountEntries{{und, 7}, {der, 8}});
  CHECK(merged.segments[1].counts.get_allocator().resource() == std::pmr::get_default_resource());
}

TEST_CASE("an arena another holder shares is not unmapped by one profile's release", "[profile]") {
  auto arena = std::make_shared<CountArena>();
  CountEntries elsewhere(arena.get());  // a list the profile does not know of
  elsewhere.assign({{1, 2}, {3, 4}});
  CountProfile profile;
  profile.count_memory = arena;
  CountEntries counts(arena.get());
  counts.assign({{5, 6}});
  profile.segments.push_back(SegmentCounts{"s", 6, 6, std::move(counts)});
  profile.release_counts();
  CHECK(profile.segments[0].counts.empty());
  CHECK(arena->mapped_bytes() > 0);
  // Read after the release: unmapped, this would be a fault, not a failed check.
  CHECK(elsewhere == CountEntries{{1, 2}, {3, 4}});
}

TEST_CASE("a copied profile holds its lists on the heap and no arena", "[profile]") {
  CountProfile profile;
  profile.count_memory = std::make_shared<CountArena>();
  CountEntries counts(profile.count_memory.get());
  counts.assign({{0, 1}, {2, 3}});
  profile.segments.push_back(SegmentCounts{"s", 4, 4, std::move(counts)});
  const CountProfile copy(profile);
  CHECK(copy.count_memory == nullptr);
  CHECK(copy.segments[0].counts.get_allocator().resource() == std::pmr::get_default_resource());
  CHECK(copy.segments[0].counts == CountEntries{{0, 1}, {2, 3}});
  // The original is still the arena's only holder: its release hands the memory back.
  profile.release_counts();
  CHECK(profile.count_memory->mapped_bytes() == 0);
}

namespace {

// Three segments of 2,000 words over three words, their counts in one arena.
Corpus three_segments_in_an_arena() {
  Corpus corpus;
  corpus.files = {"a.xml"};
  corpus.file_sha256 = {""};
  CountProfile& counts = corpus.counts;
  counts.count_memory = std::make_shared<CountArena>();
  for (const char* form : {"und", "der", "die"}) counts.vocabulary.intern(form);
  const std::uint32_t rows[3][3] = {{1000, 600, 400}, {500, 900, 600}, {700, 700, 600}};
  for (int s = 0; s < 3; ++s) {
    SegmentRecord record;
    record.segment.id = "a#s" + std::to_string(s);
    record.segment.file = "a.xml";
    record.tokens = 2000;
    record.types = 3;
    corpus.segments.push_back(record);
    CountEntries list(counts.count_memory.get());
    list.reserve(3);
    for (FeatureId f = 0; f < 3; ++f) list.emplace_back(f, rows[s][f]);
    counts.segments.push_back(SegmentCounts{record.segment.id, 2000, 2000, std::move(list)});
  }
  return corpus;
}

}  // namespace

TEST_CASE("an analysis that frees the counts does so after the table, unless clustering needs them", "[profile]") {
  Request request;
  request.feature_space.min_segment_tokens = 100;
  request.neighbours = 1;
  request.threads = 1;
  Corpus corpus = three_segments_in_an_arena();
  const Analysis analysis = analyse_corpus_freeing_counts(request, corpus);
  CHECK(analysis.table.segment_count() == 3);
  CHECK(analysis.table.feature_count() == 3);
  bool all_empty = true;
  for (const SegmentCounts& s : corpus.counts.segments) all_empty = all_empty && s.counts.empty();
  CHECK(all_empty);
  CHECK(corpus.counts.count_memory->mapped_bytes() == 0);
  CHECK(corpus.segments.size() == 3);  // the rest of the corpus is left as it was

  request.clustering.compute = true;  // the clustering reads the counts after the table
  Corpus kept = three_segments_in_an_arena();
  const Analysis clustered = analyse_corpus_freeing_counts(request, kept);
  CHECK(clustered.clustering.has_value());
  CHECK(kept.counts.segments[1].counts == CountEntries{{0, 500}, {1, 900}, {2, 600}});
  CHECK(kept.counts.count_memory->mapped_bytes() > 0);
}
