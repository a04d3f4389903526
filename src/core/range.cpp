#include "core/range.hpp"

#include <cerrno>
#include <cmath>
#include <cstdio>
#include <cstdlib>

#include "core/error.hpp"

namespace sortie {

namespace {

/// A bound or a value in words: whole numbers below 1e15 in full ("100000", not "1e+05"), the
/// rest as the shortest text that reads back the same.
std::string words(double v) {
  if (std::isfinite(v) && v == std::floor(v) && std::fabs(v) < 1e15) {
    char buf[32];
    std::snprintf(buf, sizeof buf, "%.0f", v);
    return buf;
  }
  return format_number(v);
}

}  // namespace

bool Range::contains(double v) const {
  if (!std::isfinite(v)) return false;
  if (lo_open ? !(v > lo) : !(v >= lo)) return false;
  if (hi_open ? !(v < hi) : !(v <= hi)) return false;
  return true;
}

std::string Range::describe() const {
  const std::string u = unit.empty() ? "" : " " + unit;
  const bool has_lo = lo > -1e299, has_hi = hi < 1e299;
  if (has_lo && has_hi) {
    std::string s = "a number ";
    s += lo_open ? "above " + words(lo) : "from " + words(lo);
    if (lo_open) s += hi_open ? " and below " + words(hi) : ", up to " + words(hi);
    else s += hi_open ? " to below " + words(hi) : " to " + words(hi);
    return s + u;
  }
  if (has_lo) return std::string("a number ") + (lo_open ? "> " : ">= ") + words(lo) + u;
  if (has_hi) return std::string("a number ") + (hi_open ? "< " : "<= ") + words(hi) + u;
  return "a finite number" + u;
}

Range positive(std::string unit) { return Range{0.0, 1e300, true, false, std::move(unit)}; }
Range non_negative(std::string unit) { return Range{0.0, 1e300, false, false, std::move(unit)}; }
Range between(double lo, double hi, std::string unit) { return Range{lo, hi, false, false, std::move(unit)}; }
Range above_to(double lo, double hi, std::string unit) { return Range{lo, hi, true, false, std::move(unit)}; }
Range any_number(std::string unit) { return Range{-1e300, 1e300, false, false, std::move(unit)}; }

std::optional<std::string> range_problem(double v, const Range& r) {
  if (r.contains(v)) return std::nullopt;
  const std::string what = std::isfinite(v) ? "out of range" : "not a finite number";
  return what + " (got " + words(v) + ", expected " + r.describe() + ")";
}

std::optional<double> parse_number_word(const std::string& word) {
  if (word.empty()) return std::nullopt;
  const char* begin = word.c_str();
  char* end = nullptr;
  errno = 0;
  const double v = std::strtod(begin, &end);
  if (end == begin || *end != '\0') return std::nullopt;
  return v;  // an overflow (1e999) is ±HUGE_VAL, i.e. ±inf: refused by every Range
}

}  // namespace sortie
