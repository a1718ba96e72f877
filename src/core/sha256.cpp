#include "core/sha256.h"

#include <nettle/sha2.h>

#include <cerrno>
#include <cstdio>
#include <cstring>

#include "core/error.h"
#include "core/regular_file.h"

namespace manicule {

struct Sha256::Context {
  sha256_ctx state;
};

Sha256::Sha256() : context_(std::make_unique<Context>()) { sha256_init(&context_->state); }

Sha256::~Sha256() = default;
Sha256::Sha256(Sha256&&) noexcept = default;
Sha256& Sha256::operator=(Sha256&&) noexcept = default;

void Sha256::update(const void* data, std::size_t size) {
  if (size) sha256_update(&context_->state, size, static_cast<const std::uint8_t*>(data));
}

std::string Sha256::hex_digest() {
  std::uint8_t digest[SHA256_DIGEST_SIZE];
  sha256_digest(&context_->state, SHA256_DIGEST_SIZE, digest);
  static const char* hex = "0123456789abcdef";
  std::string out;
  for (std::uint8_t byte : digest) {
    out.push_back(hex[byte >> 4]);
    out.push_back(hex[byte & 0xf]);
  }
  return out;
}

std::string sha256_hex(std::string_view bytes) {
  Sha256 h;
  h.update(bytes.data(), bytes.size());
  return h.hex_digest();
}

std::string sha256_file(const std::string& path) {
  std::FILE* f = open_regular_file(path);
  Sha256 h;
  char buf[1 << 16];
  std::size_t n;
  while ((n = std::fread(buf, 1, sizeof buf, f)) > 0) h.update(buf, n);
  std::fclose(f);
  return h.hex_digest();
}

}  // namespace manicule
