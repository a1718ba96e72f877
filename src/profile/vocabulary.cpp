#include "profile/vocabulary.h"

#include <cstring>

#include "core/error.h"

namespace manicule {

Vocabulary::Vocabulary() : offsets_{0}, slots_(1024, 0) {}

namespace {
constexpr std::uint64_t slot_entry(std::uint64_t h, FeatureId id) { return (h & 0xFFFFFFFF00000000ULL) | (id + 1ULL); }
constexpr FeatureId entry_id(std::uint64_t entry) { return static_cast<FeatureId>((entry & 0xFFFFFFFFULL) - 1); }
}  // namespace

std::uint64_t Vocabulary::hash(std::string_view form) {
  // Eight bytes at a time, each word mixed by a multiply, then a final avalanche so that
  // both the low bits (the slot index) and the high bits (kept in the slot) are mixed.
  std::uint64_t h = 0x9E3779B97F4A7C15ULL ^ form.size();
  std::size_t i = 0;
  for (; i + 8 <= form.size(); i += 8) {
    std::uint64_t word;
    std::memcpy(&word, form.data() + i, 8);
    h = (h ^ word) * 0xff51afd7ed558ccdULL;
    h ^= h >> 32;
  }
  if (i < form.size()) {
    std::uint64_t word = 0;  // the last 1-7 bytes, gathered without a call to memcpy
    for (std::size_t k = 0; i + k < form.size(); ++k)
      word |= static_cast<std::uint64_t>(static_cast<unsigned char>(form[i + k])) << (8 * k);
    h = (h ^ word) * 0xff51afd7ed558ccdULL;
  }
  h ^= h >> 33;
  h *= 0xc4ceb9fe1a85ec53ULL;
  h ^= h >> 33;
  return h;
}

// The slot holding `form`, or the empty slot where it would go (linear probing).
std::size_t Vocabulary::slot_of(std::string_view form, std::uint64_t h) const {
  const std::size_t mask = slots_.size() - 1;
  const std::uint64_t tag = h & 0xFFFFFFFF00000000ULL;
  for (std::size_t slot = h & mask;; slot = (slot + 1) & mask) {
    const std::uint64_t entry = slots_[slot];
    if (entry == 0) return slot;
    if ((entry & 0xFFFFFFFF00000000ULL) != tag) continue;
    const FeatureId id = entry_id(entry);
    const std::size_t begin = offsets_[id];
    const std::size_t length = offsets_[id + 1] - begin;
    if (length == form.size() && std::memcmp(arena_.data() + begin, form.data(), length) == 0) return slot;
  }
}

std::optional<FeatureId> Vocabulary::find(std::string_view form) const {
  const std::uint64_t entry = slots_[slot_of(form, hash(form))];
  if (entry == 0) return std::nullopt;
  return entry_id(entry);
}

FeatureId Vocabulary::intern(std::string_view form) {
  const std::uint64_t h = hash(form);
  std::size_t slot = slot_of(form, h);
  if (slots_[slot] != 0) return entry_id(slots_[slot]);
  if (hashes_.size() >= 0xFFFFFFFEULL) {
    throw Error(ErrorKind::usage, "more than 4 billion distinct features");
  }
  const auto id = static_cast<FeatureId>(hashes_.size());
  arena_.append(form);
  offsets_.push_back(arena_.size());
  hashes_.push_back(h);
  slots_[slot] = slot_entry(h, id);
  if (hashes_.size() * 2 > slots_.size()) grow();  // keep the load factor at most 1/2
  return id;
}

std::string_view Vocabulary::form(FeatureId id) const {
  return std::string_view(arena_).substr(offsets_[id], offsets_[id + 1] - offsets_[id]);
}

void Vocabulary::grow() {
  std::vector<std::uint64_t> bigger(slots_.size() * 2, 0);
  const std::size_t mask = bigger.size() - 1;
  for (FeatureId id = 0; id < hashes_.size(); ++id) {
    std::size_t slot = hashes_[id] & mask;
    while (bigger[slot] != 0) slot = (slot + 1) & mask;
    bigger[slot] = slot_entry(hashes_[id], id);
  }
  slots_.swap(bigger);
}

}  // namespace manicule
