// libFuzzer target: a cell model (JSON), then a minute's discharge of a 4S pack of it.
#include "fuzz_main.hpp"

extern "C" int LLVMFuzzerInitialize(int*, char***) { return sortie::fuzz::initialize(); }

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  return sortie::fuzz::run_input("cell", data, size);
}
