#include "store/count_blob.h"

#include "core/error.h"

namespace manicule::store {

namespace {

void put_varint(std::string& out, std::uint64_t v) {
  while (v >= 0x80) {
    out.push_back(static_cast<char>((v & 0x7f) | 0x80));
    v >>= 7;
  }
  out.push_back(static_cast<char>(v));
}

std::uint64_t get_varint(std::string_view blob, std::size_t& pos) {
  std::uint64_t v = 0;
  for (int shift = 0; shift < 64; shift += 7) {
    if (pos >= blob.size()) throw Error(ErrorKind::bad_input, "damaged counts in the store (truncated varint)");
    auto byte = static_cast<unsigned char>(blob[pos++]);
    v |= static_cast<std::uint64_t>(byte & 0x7f) << shift;
    if (!(byte & 0x80)) return v;
  }
  throw Error(ErrorKind::bad_input, "damaged counts in the store (varint too long)");
}

}  // namespace

std::string encode_counts(const FeatureCounts& counts) {
  std::string out;
  out.reserve(counts.size() * 3);
  std::uint64_t previous = 0;
  for (const auto& [id, count] : counts) {
    put_varint(out, id - previous);
    put_varint(out, count);
    previous = id;
  }
  return out;
}

FeatureCounts decode_counts(std::string_view blob, std::pmr::memory_resource* memory) {
  FeatureCounts out(memory);
  // Two varints a feature, each ending in its one byte below 0x80: the list's exact size.
  std::size_t ends = 0;
  for (char c : blob) ends += static_cast<unsigned char>(c) < 0x80;
  out.reserve(ends / 2);
  std::size_t pos = 0;
  std::uint64_t id = 0;
  while (pos < blob.size()) {
    id += get_varint(blob, pos);
    std::uint64_t count = get_varint(blob, pos);
    if (id > UINT32_MAX || count > UINT32_MAX || (!out.empty() && id <= out.back().first))
      throw Error(ErrorKind::bad_input, "damaged counts in the store (ids out of order or too large)");
    out.emplace_back(static_cast<FeatureId>(id), static_cast<std::uint32_t>(count));
  }
  return out;
}

FeatureCounts decode_stored_counts(std::string_view blob, const std::string& store, const std::string& segment,
                                   std::pmr::memory_resource* memory) {
  try {
    return decode_counts(blob, memory);
  } catch (const Error& e) {
    throw Error(ErrorKind::bad_input,
                std::string(e.what()) + ", " + segment + ": make the store again with batch, or use a copy", store);
  }
}

}  // namespace manicule::store
