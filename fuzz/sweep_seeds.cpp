// Boundary-value variants of seed files, for the fuzzers to start from (fuzz/run.sh):
//   sweep_seeds OUT_DIR SEED_FILE...
// Writes every variant of each seed (fuzz/sweep.hpp: each number set in turn to 0, ±1e300,
// 1e-300, the largest double, 1e±9) to OUT_DIR as its own file, named after the seed. A seed
// ending in .json is read as JSON, any other as CSV.
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <iostream>
#include <sstream>
#include <string>
#include <vector>

#include "sweep.hpp"

namespace fs = std::filesystem;

namespace {

std::string read(const fs::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::ostringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

}  // namespace

int main(int argc, char** argv) {
  if (argc < 2) {
    std::cerr << "usage: sweep_seeds OUT_DIR SEED_FILE...\n";
    return 2;
  }
  const fs::path dir = argv[1];
  fs::create_directories(dir);
  std::size_t written = 0;
  for (int i = 2; i < argc; ++i) {
    const fs::path seed = argv[i];
    const std::string text = read(seed);
    const bool json = seed.extension() == ".json";
    const std::vector<std::string> variants =
        json ? sortie::fuzz::json_variants(text) : sortie::fuzz::csv_variants(text);
    for (std::size_t n = 0; n < variants.size(); ++n) {
      char name[32];
      std::snprintf(name, sizeof name, "-%05zu", n);
      std::ofstream(dir / (seed.stem().string() + name + (json ? ".json" : ".csv")), std::ios::binary)
          << variants[n];
    }
    written += variants.size();
  }
  std::cout << written << " variants in " << dir.string() << "\n";
  return 0;
}
