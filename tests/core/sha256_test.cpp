#include <doctest/doctest.h>

#include <string>
#include <utility>

#include "core/sha256.hpp"

using sortie::sha256_hex;

// Reference digests: NIST FIPS 180-4 examples (CSRC "SHA256.pdf", one-block "abc" and the
// two-block 448-bit message), and the empty string and one million 'a' from the same NIST
// example set (from memory, as widely reproduced).
TEST_CASE("sha256: the NIST example messages") {
  CHECK(sha256_hex("abc") == "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
  CHECK(sha256_hex("abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq") ==
        "248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1");
  CHECK(sha256_hex("") == "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855");
  CHECK(sha256_hex(std::string(1000000, 'a')) ==
        "cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0");
}

TEST_CASE("sha256: the lengths around the padding boundary") {
  // 55, 56, 63, 64, 65 and 119 bytes of 'x' are where the length field moves to a second block
  // (FIPS 180-4 5.1.1). Reference digests from GNU coreutils sha256sum 9.1 (an independent
  // implementation), `head -c N /dev/zero | tr '\0' x | sha256sum`.
  const std::pair<std::size_t, const char*> cases[] = {
      {55, "d5e285683cd4efc02d021a5c62014694958901005d6f71e89e0989fac77e4072"},
      {56, "04c26261370ee7541549d16dee320c723e3fd14671e66a099afe0a377c16888e"},
      {63, "75220b47218278e656f2013bb8f0c455a25eaf01e86c64924e9d48d89776d6f2"},
      {64, "7ce100971f64e7001e8fe5a51973ecdfe1ced42befe7ee8d5fd6219506b5393c"},
      {65, "9537c5fdf120482f7d58d25e9ed583f52c02b4e304ea814db1633ad565aed7e9"},
      {119, "000b48d4edf0fa7bee3c6236ecd2785baa5db4eeb8bb54341b029e0d9fa5fb0c"}};
  for (const auto& [n, digest] : cases) {
    CAPTURE(n);
    CHECK(sha256_hex(std::string(n, 'x')) == digest);
  }
}
