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
  // ids[i] = intern(source.form(i)) for every form of `source`, in id order; faster than
  // one call at a time when this vocabulary has outgrown the caches.
  void intern_all(const Vocabulary& source, std::vector<FeatureId>& ids);
  // The id of `form` if it is known.
  std::optional<FeatureId> find(std::string_view form) const;

  std::string_view form(FeatureId id) const;
  // Makes room for `forms` forms in all, so that interning up to that many never rehashes.
  void reserve(std::size_t forms);
  std::size_t size() const { return hashes_.size(); }

 private:
  // A slot of the open-addressing table. Forms of up to 8 bytes are kept in the slot
  // itself, so that finding a known short form reads one cache line; a longer form's slot
  // says where the form lies in the arena, so that comparing it reads the arena alone
  // (not offsets_ first: two cache misses a lookup in a large vocabulary instead of three).
  struct Slot {
    std::uint32_t id_plus_one = 0;  // 0: empty
    std::uint32_t tag = 0;          // hash bits and length class (tag_of)
    std::uint64_t inline_form = 0;  // the form's bytes if it is short, else arena_ref()
  };
  // A form with what finding it takes: its hash and, for a short form, its packed bytes.
  struct Key {
    std::string_view form;
    std::uint64_t hash = 0;
    std::uint64_t packed = 0;  // pack_short(form) if at most 8 bytes, else 0
  };
  static Key key_of(std::string_view form);
  FeatureId intern(const Key& key);
  static std::uint64_t hash(std::string_view form);
  static std::uint64_t hash_short(std::uint64_t packed, std::size_t size);  // == hash() of that form
  static std::uint64_t pack_short(std::string_view form);  // forms of at most 8 bytes
  std::size_t slot_of(const Key& key) const;
  // A long form's place in the arena as a slot keeps it: the offset above 16 bits, the
  // length below (kLongerThanRef: look the length up in offsets_).
  static std::uint64_t arena_ref(std::size_t offset, std::size_t length);
  static constexpr std::uint64_t kLongerThanRef = 0xFFFF;
  void grow();
  void rehash(std::size_t slot_count);  // a power of 2 above twice the forms

  std::string arena_;                  // all forms, back to back
  std::vector<std::size_t> offsets_;   // form i is arena_[offsets_[i], offsets_[i + 1])
  std::vector<std::uint64_t> hashes_;  // hash of form i, kept for rehashing
  std::vector<Slot> slots_;            // size is a power of 2
};

}  // namespace manicule
