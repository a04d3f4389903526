// libFuzzer target: a load over time (CSV), then the demo pack discharged under it.
#include "fuzz_main.hpp"

extern "C" int LLVMFuzzerInitialize(int*, char***) { return sortie::fuzz::initialize(); }

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  return sortie::fuzz::run_input("load_csv", data, size);
}
