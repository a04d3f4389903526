// libFuzzer target: a cell test log through the whole of `sortie fit cell` (fit, model written and read back, reports).
#include "fuzz_main.hpp"

extern "C" int LLVMFuzzerInitialize(int*, char***) { return sortie::fuzz::initialize(); }

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  return sortie::fuzz::run_input("fit_cell", data, size);
}
