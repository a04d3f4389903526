#pragma once
/// What every libFuzzer target does with one input: run it through its loader entry point
/// (targets.hpp) and accept only a normal return, an InputError or a LimitError. Any other
/// exception aborts with its type and message, so libFuzzer keeps the input as a crash.
#include <cstddef>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <exception>
#include <string>
#include <typeinfo>

#include "core/error.hpp"
#include "targets.hpp"

namespace sortie::fuzz {

/// Copy the bundled models to the fuzz build's own folder and read model paths only there.
inline int initialize() {
  use_models_from(SORTIE_SOURCE_DIR, SORTIE_FUZZ_MODELS_DIR);
  return 0;
}

inline int run_input(const char* target, const std::uint8_t* data, std::size_t size) {
  static const Target* t = find_target(target);
  if (!t) {
    std::fprintf(stderr, "sortie fuzz: no target named %s\n", target);
    std::abort();
  }
  try {
    t->run(std::string(reinterpret_cast<const char*>(data), size));
  } catch (const InputError&) {
  } catch (const LimitError&) {
  } catch (const std::exception& e) {
    std::fprintf(stderr, "sortie fuzz: %s: uncaught %s: %s\n", target, typeid(e).name(), e.what());
    std::abort();
  }
  return 0;
}

}  // namespace sortie::fuzz
