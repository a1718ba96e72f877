#include "profile/vocabulary.h"

#include <algorithm>
#include <cstring>

#include "core/error.h"
#include "profile/large_matrix.h"

namespace manicule {

Vocabulary::Vocabulary() : offsets_{0}, slots_(1024) {}

namespace {
// The slot's tag: high bits of the hash, and in the low 4 bits the form's length up to 8
// (9: longer), so that short forms match on tag and packed bytes alone, NUL bytes included.
std::uint32_t tag_of(std::uint64_t h, std::size_t length) {
  return (static_cast<std::uint32_t>(h >> 32) & ~0xFu) | static_cast<std::uint32_t>(length <= 8 ? length : 9);
}
}  // namespace

// The bytes of a form of at most 8 bytes as one little-endian word, zero-padded. Two
// overlapping loads instead of a loop: the bytes they share are the same bytes.
// Inline, as are hash_short and key_of: they run for every token counted.
inline std::uint64_t Vocabulary::pack_short(std::string_view form) {
  const auto* p = reinterpret_cast<const unsigned char*>(form.data());
  const std::size_t n = form.size();
  if (n >= 4) {
    std::uint32_t low, high;
    std::memcpy(&low, p, 4);
    std::memcpy(&high, p + n - 4, 4);
    return static_cast<std::uint64_t>(low) | (static_cast<std::uint64_t>(high) << (8 * (n - 4)));
  }
  if (n == 0) return 0;
  return static_cast<std::uint64_t>(p[0]) | (static_cast<std::uint64_t>(p[n / 2]) << (8 * (n / 2))) |
         (static_cast<std::uint64_t>(p[n - 1]) << (8 * (n - 1)));
}

namespace {
std::uint64_t avalanche(std::uint64_t h) {
  h ^= h >> 33;
  h *= 0xc4ceb9fe1a85ec53ULL;
  h ^= h >> 33;
  return h;
}
}  // namespace

inline std::uint64_t Vocabulary::hash_short(std::uint64_t packed, std::size_t size) {
  return avalanche(((0x9E3779B97F4A7C15ULL ^ size) ^ packed) * 0xff51afd7ed558ccdULL);
}

std::uint64_t Vocabulary::hash(std::string_view form) {
  // Eight bytes at a time, each word mixed by a multiply, then a final avalanche so that
  // both the low bits (the slot index) and the high bits (kept in the slot) are mixed.
  std::uint64_t h = 0x9E3779B97F4A7C15ULL ^ form.size();
  if (form.size() <= 8) return hash_short(pack_short(form), form.size());
  std::size_t i = 0;
  for (; i + 8 <= form.size(); i += 8) {
    std::uint64_t word;
    std::memcpy(&word, form.data() + i, 8);
    h = (h ^ word) * 0xff51afd7ed558ccdULL;
    h ^= h >> 32;
  }
  if (i < form.size()) h = (h ^ pack_short(form.substr(i))) * 0xff51afd7ed558ccdULL;
  return avalanche(h);
}

inline std::uint64_t Vocabulary::arena_ref(std::size_t offset, std::size_t length) {
  return (static_cast<std::uint64_t>(offset) << 16) | std::min<std::uint64_t>(length, kLongerThanRef);
}

namespace {
// Whether the n bytes at a and b are equal, for n > 8: up to 16 bytes as two overlapping
// words (no call), longer ones with memcmp.
inline bool same_long_bytes(const char* a, const char* b, std::size_t n) {
  if (n <= 16) {
    std::uint64_t a0, a1, b0, b1;
    std::memcpy(&a0, a, 8);
    std::memcpy(&b0, b, 8);
    std::memcpy(&a1, a + n - 8, 8);
    std::memcpy(&b1, b + n - 8, 8);
    return ((a0 ^ b0) | (a1 ^ b1)) == 0;
  }
  return std::memcmp(a, b, n) == 0;
}
}  // namespace

inline Vocabulary::Key Vocabulary::key_of(std::string_view form) {
  if (form.size() > 8) return Key{form, hash(form), 0};
  const std::uint64_t packed = pack_short(form);
  return Key{form, hash_short(packed, form.size()), packed};
}

// The slot holding `form`, or the empty slot where it would go (linear probing).
std::size_t Vocabulary::slot_of(const Key& key) const {
  const std::string_view form = key.form;
  const std::uint64_t h = key.hash;
  const std::size_t mask = slots_.size() - 1;
  const std::uint32_t tag = tag_of(h, form.size());
  const bool is_short = form.size() <= 8;
  const std::uint64_t packed = key.packed;
  for (std::size_t slot = h & mask;; slot = (slot + 1) & mask) {
    const Slot& entry = slots_[slot];
    if (entry.id_plus_one == 0) return slot;
    if (entry.tag != tag) continue;
    if (is_short) {
      if (entry.inline_form == packed) return slot;
      continue;
    }
    const std::size_t begin = entry.inline_form >> 16;
    std::size_t length = entry.inline_form & kLongerThanRef;
    if (length == kLongerThanRef) {
      const FeatureId id = entry.id_plus_one - 1;
      length = offsets_[id + 1] - begin;
    }
    if (length == form.size() && same_long_bytes(arena_.data() + begin, form.data(), length)) return slot;
  }
}

std::optional<FeatureId> Vocabulary::find(std::string_view form) const {
  const Slot& entry = slots_[slot_of(key_of(form))];
  if (entry.id_plus_one == 0) return std::nullopt;
  return entry.id_plus_one - 1;
}

FeatureId Vocabulary::intern(std::string_view form) {
  return intern(key_of(form));  // the form's bytes are packed and hashed once
}

void Vocabulary::intern_all(const Vocabulary& source, std::vector<FeatureId>& ids) {
  const std::size_t n = source.size();
  ids.resize(n);
  // The keys first (the source keeps each form's hash: the same function), then the
  // lookups, each slot fetched a few lookups ahead: in a table larger than the caches the
  // lookups then wait for memory together instead of one after another.
  std::vector<Key> keys(n);
  for (std::size_t i = 0; i < n; ++i) {
    const std::string_view form = source.form(static_cast<FeatureId>(i));
    keys[i] = Key{form, source.hashes_[i], form.size() <= 8 ? pack_short(form) : 0};
  }
  // Two stages: a long form's first slot, fetched kAhead lookups earlier, says where the
  // form it holds lies in the arena, which is fetched kAhead / 2 lookups ahead.
  constexpr std::size_t kAhead = 12;
  const std::size_t mask = slots_.size() - 1;
  for (std::size_t i = 0; i < n; ++i) {
    if (i + kAhead < n) __builtin_prefetch(&slots_[keys[i + kAhead].hash & mask]);
    if (i + kAhead / 2 < n && keys[i + kAhead / 2].form.size() > 8) {
      const Key& soon = keys[i + kAhead / 2];
      const Slot& first = slots_[soon.hash & mask];
      if (first.id_plus_one != 0 && first.tag == tag_of(soon.hash, soon.form.size()))
        __builtin_prefetch(arena_.data() + (first.inline_form >> 16));
    }
    ids[i] = intern(keys[i]);
  }
}

FeatureId Vocabulary::intern(const Key& key) {
  const std::string_view form = key.form;
  const std::uint64_t h = key.hash;
  std::size_t slot = slot_of(key);
  if (slots_[slot].id_plus_one != 0) return slots_[slot].id_plus_one - 1;
  if (hashes_.size() >= 0xFFFFFFFEULL) {
    throw Error(ErrorKind::usage, "more than 4 billion distinct features");
  }
  const auto id = static_cast<FeatureId>(hashes_.size());
  const std::size_t begin = arena_.size();
  arena_.append(form);
  offsets_.push_back(arena_.size());
  hashes_.push_back(h);
  slots_[slot] = Slot{id + 1, tag_of(h, form.size()), form.size() <= 8 ? key.packed : arena_ref(begin, form.size())};
  if (hashes_.size() * 2 > slots_.size()) grow();  // keep the load factor at most 1/2
  return id;
}

std::string_view Vocabulary::form(FeatureId id) const {
  return std::string_view(arena_).substr(offsets_[id], offsets_[id + 1] - offsets_[id]);
}

void Vocabulary::reserve(std::size_t forms) {
  offsets_.reserve(forms + 1);
  hashes_.reserve(forms);
  std::size_t size = slots_.size();
  while (forms * 2 > size) size *= 2;
  if (size > slots_.size()) rehash(size);
}

void Vocabulary::grow() { rehash(slots_.size() * 2); }

void Vocabulary::rehash(std::size_t size) {
  // Forms are re-inserted in id order, so hashes_, offsets_ and the arena are read
  // sequentially; only the writes into the new table land at random.
  std::vector<Slot> bigger;
  bigger.reserve(size);
  advise_huge_pages(bigger.data(), sizeof(Slot) * size);  // before the slots are written
  bigger.resize(size);
  const std::size_t mask = bigger.size() - 1;
  for (FeatureId id = 0; id < hashes_.size(); ++id) {
    const std::string_view f = form(id);
    std::size_t slot = hashes_[id] & mask;
    while (bigger[slot].id_plus_one != 0) slot = (slot + 1) & mask;
    bigger[slot] = Slot{id + 1, tag_of(hashes_[id], f.size()), f.size() <= 8 ? pack_short(f) : arena_ref(offsets_[id], f.size())};
  }
  slots_.swap(bigger);
}

}  // namespace manicule
