// libFuzzer target: a pack model (JSON; its cell inline or one of the bundled cells), then a
// minute's discharge.
#include "fuzz_main.hpp"

extern "C" int LLVMFuzzerInitialize(int*, char***) { return sortie::fuzz::initialize(); }

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  return sortie::fuzz::run_input("pack", data, size);
}
