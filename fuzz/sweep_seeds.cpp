// Boundary-value variants of seed files, for the fuzzers to start from (fuzz/run.sh):
//   sweep_seeds OUT_DIR SEED_FILE...
// Each number in a JSON seed (every leaf of the document) and each number in a CSV seed (every
// field that reads as one) is set, one at a time, to each of a few extremes — 0, ±1e300, 1e-300,
// the largest double, 1e±9 — and written to OUT_DIR as its own file. Byte mutations rarely turn
// "0.0018" into "1e300"; a range check that lets such a value through, and a simulation that
// then overflows, are found on the first pass over the seeds this way.
#include <charconv>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <iostream>
#include <nlohmann/json.hpp>
#include <sstream>
#include <string>
#include <vector>

namespace fs = std::filesystem;

namespace {

const std::vector<double> kExtremes = {0.0, 1e-300, 1e300, -1e300, 1.7976931348623157e308, 1e-9, 1e9};
const std::vector<std::string> kCsvExtremes = {"0", "1e-300", "1e300", "-1e300", "1.7976931348623157e308",
                                               "1e-9", "1e9", "nan", "inf", ""};

std::string read(const fs::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::ostringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

struct Writer {
  fs::path dir;
  std::string stem;
  int n = 0;
  void operator()(const std::string& text, const std::string& ext) {
    char name[32];
    std::snprintf(name, sizeof name, "-%05d", n++);
    std::ofstream(dir / (stem + name + ext), std::ios::binary) << text;
  }
};

void sweep_json(const std::string& text, Writer& out) {
  const nlohmann::json doc = nlohmann::json::parse(text, nullptr, false);
  if (doc.is_discarded()) return;
  for (const auto& [pointer, value] : doc.flatten().items()) {
    if (!value.is_number()) continue;
    for (double v : kExtremes) {
      nlohmann::json j = doc;
      j[nlohmann::json::json_pointer(pointer)] = v;
      out(j.dump(), ".json");
    }
  }
}

bool is_number(const std::string& s) {
  double v = 0.0;
  const char* b = s.data();
  const char* e = b + s.size();
  if (b != e && *b == '+') ++b;
  const auto r = std::from_chars(b, e, v);
  return b != e && r.ec == std::errc() && r.ptr == e;
}

void sweep_csv(const std::string& text, Writer& out) {
  std::vector<std::string> lines;
  std::istringstream in(text);
  for (std::string l; std::getline(in, l);) lines.push_back(l);
  for (std::size_t li = 0; li < lines.size(); ++li) {
    const std::string& line = lines[li];
    const char sep = line.find(';') != std::string::npos ? ';' : line.find('\t') != std::string::npos ? '\t' : ',';
    std::vector<std::string> cells;
    std::size_t a = 0;
    for (std::size_t b; (b = line.find(sep, a)) != std::string::npos; a = b + 1) cells.push_back(line.substr(a, b - a));
    cells.push_back(line.substr(a));
    for (std::size_t ci = 0; ci < cells.size(); ++ci) {
      if (!is_number(cells[ci])) continue;
      for (const auto& v : kCsvExtremes) {
        std::string t;
        for (std::size_t k = 0; k < lines.size(); ++k) {
          if (k != li) {
            t += lines[k] + "\n";
            continue;
          }
          for (std::size_t c = 0; c < cells.size(); ++c) t += (c ? std::string(1, sep) : "") + (c == ci ? v : cells[c]);
          t += "\n";
        }
        out(t, ".csv");
      }
    }
  }
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
    Writer out{dir, seed.stem().string()};
    const std::string text = read(seed);
    if (seed.extension() == ".json") sweep_json(text, out);
    else sweep_csv(text, out);
    written += static_cast<std::size_t>(out.n);
  }
  std::cout << written << " variants in " << dir.string() << "\n";
  return 0;
}
