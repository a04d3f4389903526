// libFuzzer target: the command line: option words after a command prefix, through cli::run.
#include "fuzz_main.hpp"

extern "C" int LLVMFuzzerInitialize(int*, char***) { return sortie::fuzz::initialize(); }

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  return sortie::fuzz::run_input("cli_options", data, size);
}
