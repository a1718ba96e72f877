#include "core/sha256.h"

// OpenSSL 3 marks the one-digest functions (SHA256_Init and kin) deprecated in favour of
// EVP, but the EVP route first sets up a "provider", which costs every process about a
// millisecond: a tenth of what an unchanged archive's re-run takes in all. These functions
// run the same code on the data (the SHA extensions where the CPU has them) without that.
#define OPENSSL_SUPPRESS_DEPRECATED
#include <openssl/sha.h>

#include <cerrno>
#include <cstdio>
#include <cstring>

#include "core/error.h"

namespace manicule {

struct Sha256::Context {
  SHA256_CTX state;
};

Sha256::Sha256() : context_(std::make_unique<Context>()) {
  if (SHA256_Init(&context_->state) != 1) throw Error(ErrorKind::internal, "SHA-256 is not available from libcrypto");
}

Sha256::~Sha256() = default;
Sha256::Sha256(Sha256&&) noexcept = default;
Sha256& Sha256::operator=(Sha256&&) noexcept = default;

void Sha256::update(const void* data, std::size_t size) {
  if (size) SHA256_Update(&context_->state, data, size);
}

std::string Sha256::hex_digest() {
  unsigned char digest[SHA256_DIGEST_LENGTH];
  const unsigned int length = SHA256_DIGEST_LENGTH;
  SHA256_Final(digest, &context_->state);
  static const char* hex = "0123456789abcdef";
  std::string out;
  for (unsigned int i = 0; i < length; ++i) {
    out.push_back(hex[digest[i] >> 4]);
    out.push_back(hex[digest[i] & 0xf]);
  }
  return out;
}

std::string sha256_hex(std::string_view bytes) {
  Sha256 h;
  h.update(bytes.data(), bytes.size());
  return h.hex_digest();
}

std::string sha256_file(const std::string& path) {
  std::FILE* f = std::fopen(path.c_str(), "rb");
  if (!f) throw Error(ErrorKind::bad_input, std::string("cannot read the file: ") + std::strerror(errno), path);
  Sha256 h;
  char buf[1 << 16];
  std::size_t n;
  while ((n = std::fread(buf, 1, sizeof buf, f)) > 0) h.update(buf, n);
  std::fclose(f);
  return h.hex_digest();
}

}  // namespace manicule
