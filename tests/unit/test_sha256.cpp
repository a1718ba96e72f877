// SHA-256 against the examples of FIPS 180-2, Appendix B (B.1 "abc", B.2 the 448-bit
// message, B.3 one million 'a'), fed in pieces to exercise streaming.
#include <catch2/catch.hpp>

#include <string>

#include "core/sha256.h"

using manicule::Sha256;
using manicule::sha256_hex;

TEST_CASE("SHA-256 matches the FIPS 180-2 examples") {
  CHECK(sha256_hex("abc") == "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
  CHECK(sha256_hex("abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq") ==
        "248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1");
  Sha256 h;
  std::string chunk(1000, 'a');
  for (int i = 0; i < 1000; ++i) h.update(chunk.data(), chunk.size());
  CHECK(h.hex_digest() == "cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0");
}
