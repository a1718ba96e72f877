// Vocabulary: interns feature forms (UTF-8 strings) to dense ids 0, 1, 2, ... in order of
// first appearance. Forms are stored once in one arena and found through an open-addressing
// table, so looking up a known form allocates nothing. Views returned by form() stay valid
// until the next intern(). One vocabulary per run; not safe for concurrent writers.
#pragma once
#include <cstddef>
#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace manicule {

using FeatureId = std::uint32_t;

class Vocabulary {
 public:
  Vocabulary();

  // The id of `form`, adding it if it is new.
  FeatureId intern(std::string_view form);
  // The id of `form` if it is known.
  std::optional<FeatureId> find(std::string_view form) const;

  std::string_view form(FeatureId id) const;
  std::size_t size() const { return hashes_.size(); }

 private:
  static std::uint64_t hash(std::string_view form);
  std::size_t slot_of(std::string_view form, std::uint64_t h) const;
  void grow();

  std::string arena_;                  // all forms, back to back
  std::vector<std::size_t> offsets_;   // form i is arena_[offsets_[i], offsets_[i + 1])
  std::vector<std::uint64_t> hashes_;  // hash of form i, kept for rehashing
  // (high 32 bits of the hash) << 32 | (id + 1), or 0 for an empty slot; the size is a
  // power of 2. The hash bits in the slot turn most mismatches away without touching the
  // form or hashes_.
  std::vector<std::uint64_t> slots_;
};

}  // namespace manicule
