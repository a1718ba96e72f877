// SHA-256 (FIPS 180-4) of bytes or of a file, as lowercase hex, computed by GNU Nettle
// (its x86-64 build uses the CPU's SHA extensions where they exist: the hash runs
// alongside the parser for every input, so its speed matters). Nettle rather than
// OpenSSL's libcrypto: both hash at 1.4-1.6 GB/s here, but loading libcrypto costs every
// process some 4 ms against Nettle's 0.4 ms, a sixth of an unchanged archive's re-run.
// Used for provenance (which exact edition a result refers to) and as the archive
// store's content key.
#pragma once
#include <cstddef>
#include <memory>
#include <string>
#include <string_view>

namespace manicule {

class Sha256 {
 public:
  Sha256();
  ~Sha256();
  Sha256(Sha256&&) noexcept;
  Sha256& operator=(Sha256&&) noexcept;
  void update(const void* data, std::size_t size);
  std::string hex_digest();  // finishes the hash

 private:
  struct Context;
  std::unique_ptr<Context> context_;
};

std::string sha256_hex(std::string_view bytes);

// Throws Error(bad_input) if the file cannot be read.
std::string sha256_file(const std::string& path);

}  // namespace manicule
