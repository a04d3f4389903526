// libFuzzer target: a mission profile (JSON; models inline or bundled), then the whole mission with
// a step cap per phase.
#include "fuzz_main.hpp"

extern "C" int LLVMFuzzerInitialize(int*, char***) { return sortie::fuzz::initialize(); }

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  return sortie::fuzz::run_input("profile", data, size);
}
