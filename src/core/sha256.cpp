#include "core/sha256.h"

#include <openssl/crypto.h>
#include <openssl/evp.h>

#include <cerrno>
#include <cstdio>
#include <cstring>

#include "core/error.h"

namespace manicule {

struct Sha256::Context {
  EVP_MD_CTX* md = EVP_MD_CTX_new();
  ~Context() { EVP_MD_CTX_free(md); }
};

void sha256_without_system_config() {
  // On failure the first digest reports that SHA-256 is unavailable.
  OPENSSL_init_crypto(OPENSSL_INIT_NO_LOAD_CONFIG, nullptr);
}

Sha256::Sha256() {
  context_ = std::make_unique<Context>();
  if (!context_->md || EVP_DigestInit_ex(context_->md, EVP_sha256(), nullptr) != 1)
    throw Error(ErrorKind::internal, "SHA-256 is not available from libcrypto");
}

Sha256::~Sha256() = default;
Sha256::Sha256(Sha256&&) noexcept = default;
Sha256& Sha256::operator=(Sha256&&) noexcept = default;

void Sha256::update(const void* data, std::size_t size) {
  if (size) EVP_DigestUpdate(context_->md, data, size);
}

std::string Sha256::hex_digest() {
  unsigned char digest[EVP_MAX_MD_SIZE];
  unsigned int length = 0;
  EVP_DigestFinal_ex(context_->md, digest, &length);
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
