// libFuzzer target: an airframe model (JSON), then the thrust it needs in hover, cruise, climb and
// descent.
#include "fuzz_main.hpp"

extern "C" int LLVMFuzzerInitialize(int*, char***) { return sortie::fuzz::initialize(); }

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  return sortie::fuzz::run_input("airframe", data, size);
}
