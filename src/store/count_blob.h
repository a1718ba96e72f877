// A segment's counts as the store keeps them: one BLOB of unsigned LEB128 varints holding,
// for each feature in ascending id order, the gap to the previous id (for the first, the id
// itself) and then the count. About three bytes a feature, where a row per (segment,
// feature) would cost SQLite twenty or more; that keeps first runs fast and stores small.
// docs/store.md describes the format for readers in other languages.
#pragma once
#include <cstdint>
#include <memory_resource>
#include <string>
#include <string_view>

#include "profile/count_profile.h"
#include "profile/vocabulary.h"

namespace manicule::store {

using FeatureCounts = CountEntries;

// `counts` must be sorted by id with no id twice.
std::string encode_counts(const FeatureCounts& counts);

// Throws Error(bad_input) for a truncated or malformed blob. The list is taken from
// `memory` at its final size (a CountArena reuses nothing given back).
FeatureCounts decode_counts(std::string_view blob,
                            std::pmr::memory_resource* memory = std::pmr::get_default_resource());

// decode_counts for a blob read from a store: a damaged one is reported with the store's
// path and `segment` (which segment it is, in words), so that the user knows where to look.
FeatureCounts decode_stored_counts(std::string_view blob, const std::string& store, const std::string& segment,
                                   std::pmr::memory_resource* memory = std::pmr::get_default_resource());

}  // namespace manicule::store
