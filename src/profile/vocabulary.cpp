#include "profile/vocabulary.h"

#include "core/error.h"

namespace manicule {

Vocabulary::Vocabulary() : offsets_{0}, slots_(1024, 0) {}

std::uint64_t Vocabulary::hash(std::string_view form) {
  // FNV-1a, then a final avalanche so that the low bits used for the slot index are mixed.
  std::uint64_t h = 1469598103934665603ULL;
  for (unsigned char c : form) {
    h ^= c;
    h *= 1099511628211ULL;
  }
  h ^= h >> 33;
  h *= 0xff51afd7ed558ccdULL;
  h ^= h >> 33;
  return h;
}

// The slot holding `form`, or the empty slot where it would go (linear probing).
std::size_t Vocabulary::slot_of(std::string_view form, std::uint64_t h) const {
  const std::size_t mask = slots_.size() - 1;
  for (std::size_t slot = h & mask;; slot = (slot + 1) & mask) {
    const std::uint32_t entry = slots_[slot];
    if (entry == 0) return slot;
    const FeatureId id = entry - 1;
    if (hashes_[id] == h && this->form(id) == form) return slot;
  }
}

std::optional<FeatureId> Vocabulary::find(std::string_view form) const {
  const std::uint32_t entry = slots_[slot_of(form, hash(form))];
  if (entry == 0) return std::nullopt;
  return entry - 1;
}

FeatureId Vocabulary::intern(std::string_view form) {
  const std::uint64_t h = hash(form);
  std::size_t slot = slot_of(form, h);
  if (slots_[slot] != 0) return slots_[slot] - 1;
  if (hashes_.size() >= 0xFFFFFFFEULL) {
    throw Error(ErrorKind::usage, "more than 4 billion distinct features");
  }
  const auto id = static_cast<FeatureId>(hashes_.size());
  arena_.append(form);
  offsets_.push_back(arena_.size());
  hashes_.push_back(h);
  slots_[slot] = id + 1;
  if (hashes_.size() * 2 > slots_.size()) grow();  // keep the load factor at most 1/2
  return id;
}

std::string_view Vocabulary::form(FeatureId id) const {
  return std::string_view(arena_).substr(offsets_[id], offsets_[id + 1] - offsets_[id]);
}

void Vocabulary::grow() {
  std::vector<std::uint32_t> bigger(slots_.size() * 2, 0);
  const std::size_t mask = bigger.size() - 1;
  for (FeatureId id = 0; id < hashes_.size(); ++id) {
    std::size_t slot = hashes_[id] & mask;
    while (bigger[slot] != 0) slot = (slot + 1) & mask;
    bigger[slot] = id + 1;
  }
  slots_.swap(bigger);
}

}  // namespace manicule
