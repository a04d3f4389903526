#pragma once
/// The one number validator: a documented interval with its unit, shared by the JSON loaders
/// (io/json_reader.hpp) and the command-line options (cli/number_option.hpp), so that NaN, ±inf
/// and values past a physical bound are refused in the same words wherever they come in.
#include <optional>
#include <string>

namespace sortie {

/// An allowed interval for a number, with the unit shown in messages. Never contains NaN or ±inf.
struct Range {
  double lo = -1e300;
  double hi = 1e300;
  bool lo_open = false;  ///< true: lo itself is refused
  bool hi_open = false;
  std::string unit;

  bool contains(double v) const;
  /// "a number > 0 A", "a number from 0 to 1", "a number from 2.5 to 4.5 V" ...
  std::string describe() const;
};

Range positive(std::string unit);                          ///< (0, 1e300]
Range non_negative(std::string unit);                      ///< [0, 1e300]
Range between(double lo, double hi, std::string unit);     ///< [lo, hi]
Range above_to(double lo, double hi, std::string unit);    ///< (lo, hi]
Range any_number(std::string unit);                        ///< any finite number

/// What is wrong with `v` for `r`, as "not a finite number (got NaN, expected a number from 0 to
/// 1)" or "out of range (got 7, expected ...)"; nullopt when `r` contains `v`. Callers put the
/// place (file and JSON pointer, or the option) in front.
std::optional<std::string> range_problem(double v, const Range& r);

/// Parse a whole command-line word as a number (strtod: decimal, exponent, "nan", "inf"), or
/// nullopt when it is not one (trailing text, empty).
std::optional<double> parse_number_word(const std::string& word);

}  // namespace sortie
