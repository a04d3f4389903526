#pragma once
/// SHA-256 (FIPS 180-4, "Secure Hash Standard", NIST 2015, section 6.2) of bytes, as 64 lowercase
/// hex digits. The logbook keys a flight by its log's hash (the same file twice is refused) and
/// records the pack file it was made from; written here so that no crypto library is needed.
/// Not for security: nothing here is a secret.
#include <string>
#include <string_view>

namespace sortie {

std::string sha256_hex(std::string_view bytes);

}  // namespace sortie
