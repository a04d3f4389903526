#pragma once
/// Boundary-value variants of seed files, for the fuzzers to start from (fuzz/sweep_seeds.cpp
/// writes them, fuzz/run.sh runs each once). Each number in a JSON seed (every leaf of the
/// document) and each number in a CSV seed (every field that reads as one) is set, one at a time,
/// to each of a few extremes — 0, ±1e300, 1e-300, the largest double, 1e±9 — giving one variant
/// per number and extreme. Byte mutations rarely turn "0.0018" into "1e300"; a range check that
/// lets such a value through, and a simulation that then overflows, are found on the first pass
/// over the seeds this way.
#include <charconv>
#include <cstddef>
#include <nlohmann/json.hpp>
#include <sstream>
#include <string>
#include <vector>

namespace sortie::fuzz {

/// The values each JSON number is set to in turn.
inline const std::vector<double>& json_extremes() {
  static const std::vector<double> v = {0.0, 1e-300, 1e300, -1e300, 1.7976931348623157e308, 1e-9, 1e9};
  return v;
}

/// The texts each CSV number is set to in turn (with not-a-number, infinity and an empty field).
inline const std::vector<std::string>& csv_extremes() {
  static const std::vector<std::string> v = {"0",   "1e-300", "1e300", "-1e300", "1.7976931348623157e308",
                                             "1e-9", "1e9",   "nan",   "inf",    ""};
  return v;
}

/// Every variant of a JSON seed, in document order; none when the text is not JSON.
inline std::vector<std::string> json_variants(const std::string& text) {
  std::vector<std::string> out;
  const nlohmann::json doc = nlohmann::json::parse(text, nullptr, false);
  if (doc.is_discarded()) return out;
  // A named copy: `for (... : doc.flatten().items())` iterates a temporary that is already
  // destroyed (a range-for keeps only the outermost temporary, items()'s proxy, alive).
  const nlohmann::json flat = doc.flatten();
  for (const auto& [pointer, value] : flat.items()) {
    if (!value.is_number()) continue;
    for (double v : json_extremes()) {
      nlohmann::json j = doc;
      j[nlohmann::json::json_pointer(pointer)] = v;
      out.push_back(j.dump());
    }
  }
  return out;
}

/// A whole field that reads as a number (an optional leading '+').
inline bool is_csv_number(const std::string& s) {
  double v = 0.0;
  const char* b = s.data();
  const char* e = b + s.size();
  if (b != e && *b == '+') ++b;
  const auto r = std::from_chars(b, e, v);
  return b != e && r.ec == std::errc() && r.ptr == e;
}

/// Every variant of a CSV seed, line by line and field by field. Each line's delimiter is ';'
/// if it has one, else a tab if it has one, else ','. Lines end in "\n" in the variants.
inline std::vector<std::string> csv_variants(const std::string& text) {
  std::vector<std::string> out;
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
      if (!is_csv_number(cells[ci])) continue;
      for (const auto& v : csv_extremes()) {
        std::string t;
        for (std::size_t k = 0; k < lines.size(); ++k) {
          if (k != li) {
            t += lines[k] + "\n";
            continue;
          }
          for (std::size_t c = 0; c < cells.size(); ++c) t += (c ? std::string(1, sep) : "") + (c == ci ? v : cells[c]);
          t += "\n";
        }
        out.push_back(t);
      }
    }
  }
  return out;
}

}  // namespace sortie::fuzz
