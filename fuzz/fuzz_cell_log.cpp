// libFuzzer target: a cell test log (CSV, ; or tab separated) as `sortie fit cell` reads it, then
// the replay of its current.
#include "fuzz_main.hpp"

extern "C" int LLVMFuzzerInitialize(int*, char***) { return sortie::fuzz::initialize(); }

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  return sortie::fuzz::run_input("cell_log", data, size);
}
