#include "core/text.hpp"

#include <algorithm>
#include <cctype>
#include <cmath>
#include <cstdio>

namespace sortie {

std::string format_fixed(double v, int digits) {
  if (std::isnan(v)) return "-";
  if (std::isinf(v)) return v > 0 ? "inf" : "-inf";
  char buf[64];
  const double a = std::fabs(v);
  const bool shows_zero = a < 0.5 * std::pow(10.0, -digits);
  if (a >= 1e9 || (a > 0 && a < 1e-6 && shows_zero)) {
    std::snprintf(buf, sizeof buf, "%.3e", v);
    return buf;
  }
  std::snprintf(buf, sizeof buf, "%.*f", digits, v);
  std::string s = buf;
  if (s[0] == '-' && s.find_first_not_of("-0.") == std::string::npos) s.erase(0, 1);  // no "-0.0"
  return s;
}

std::string trim(std::string s) {
  auto not_space = [](unsigned char c) { return !std::isspace(c); };
  s.erase(s.begin(), std::find_if(s.begin(), s.end(), not_space));
  s.erase(std::find_if(s.rbegin(), s.rend(), not_space).base(), s.end());
  return s;
}

std::string to_lower(std::string s) {
  for (char& c : s) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return s;
}

std::string printable(const std::string& s, bool keep_newlines) {
  static const char* hex = "0123456789abcdef";
  std::string out;
  out.reserve(s.size());
  for (std::size_t i = 0; i < s.size(); ++i) {
    const auto c = static_cast<unsigned char>(s[i]);
    if (keep_newlines && (c == '\n' || c == '\t')) {
      out += static_cast<char>(c);
    } else if (c < 0x20 || c == 0x7f) {
      out += "\\x";
      out += hex[c >> 4];
      out += hex[c & 15];
    } else if (c == 0xc2 && i + 1 < s.size() && static_cast<unsigned char>(s[i + 1]) >= 0x80 &&
               static_cast<unsigned char>(s[i + 1]) <= 0x9f) {
      // UTF-8 of U+0080..U+009F: C1 controls (CSI at U+009B) some terminals obey.
      const auto d = static_cast<unsigned char>(s[++i]);
      out += "\\u00";
      out += hex[d >> 4];
      out += hex[d & 15];
    } else {
      out += static_cast<char>(c);
    }
  }
  return out;
}

}  // namespace sortie
