// SHA-256 (FIPS 180-4) of bytes or of a file, as lowercase hex. Used for provenance (which
// exact edition a result refers to) and as the archive store's content key.
#pragma once
#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>

namespace manicule {

class Sha256 {
 public:
  Sha256();
  void update(const void* data, std::size_t size);
  std::string hex_digest();  // finishes the hash

 private:
  void block(const std::uint8_t* p);
  std::uint32_t h_[8];
  std::uint8_t buffer_[64];
  std::size_t buffered_ = 0;
  std::uint64_t length_ = 0;
};

std::string sha256_hex(std::string_view bytes);
// Throws Error(bad_input) if the file cannot be read.
std::string sha256_file(const std::string& path);

}  // namespace manicule
