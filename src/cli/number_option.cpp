#include "cli/number_option.hpp"

#include <cmath>

#include "core/error.hpp"

namespace sortie::cli {

namespace {

/// The word as typed, shortened and with control characters shown, for "got ..." in a message.
std::string shown(const std::string& word) {
  std::string out;
  for (unsigned char c : word.substr(0, 40)) {
    if (c < 0x20 || c == 0x7f) {
      static const char* hex = "0123456789abcdef";
      out += "\\x";
      out += hex[c >> 4];
      out += hex[c & 15];
    } else {
      out += static_cast<char>(c);
    }
  }
  return word.size() > 40 ? out + "..." : out;
}

}  // namespace

CLI::Validator number_in(const Range& r) {
  // CLI11 puts the option's name in front: "--sample-s: <what this returns>".
  return CLI::Validator(
      [r](std::string& word) -> std::string {
        const auto v = parse_number_word(word);
        if (!v) return "not a number (got " + shown(word) + ", expected " + r.describe() + ")";
        if (const auto why = range_problem(*v, r)) return *why;
        return {};
      },
      r.describe(), "number_in");
}

CLI::Validator whole_in(int lo, int hi, const std::string& unit) {
  const std::string expected =
      "a whole number from " + std::to_string(lo) + " to " + std::to_string(hi) + (unit.empty() ? "" : " " + unit);
  return CLI::Validator(
      [lo, hi, expected](std::string& word) -> std::string {
        const auto v = parse_number_word(word);
        if (!v) return "not a number (got " + shown(word) + ", expected " + expected + ")";
        if (std::isfinite(*v) && word.find_first_not_of("+-0123456789") != std::string::npos)
          return "not a whole number (got " + shown(word) + ", expected " + expected + ")";
        if (!std::isfinite(*v)) return "not a finite number (got " + format_number(*v) + ", expected " + expected + ")";
        if (*v != std::floor(*v) || *v < lo || *v > hi)
          return "out of range (got " + format_number(*v) + ", expected " + expected + ")";
        return {};
      },
      expected, "whole_in");
}

CLI::Validator output_path() {
  return CLI::Validator(
      [](std::string& word) -> std::string {
        if (word.empty()) return "an empty path (got \"\", expected a file name, or - for standard output)";
        return {};
      },
      "", "output_path");
}

}  // namespace sortie::cli
