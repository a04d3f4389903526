#include "report/svg_plot.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>

namespace sortie::report::svg {

std::string escape(const std::string& s) {
  std::string out;
  out.reserve(s.size());
  for (char c : s) {
    switch (c) {
      case '&': out += "&amp;"; break;
      case '<': out += "&lt;"; break;
      case '>': out += "&gt;"; break;
      case '"': out += "&quot;"; break;
      case '\'': out += "&#39;"; break;
      default:
        // XML 1.0 allows no C0 control but tab and line breaks, not even as a character
        // reference: shown as text (a name from a file may hold one).
        if ((static_cast<unsigned char>(c) < 0x20 && c != '\t' && c != '\n' && c != '\r') || c == 0x7f) {
          static const char* hex = "0123456789abcdef";
          out += "\\x";
          out += hex[static_cast<unsigned char>(c) >> 4];
          out += hex[static_cast<unsigned char>(c) & 15];
        } else {
          out += c;
        }
    }
  }
  return out;
}

std::string tick_label(double v, int decimals) {
  char buf[64];
  std::snprintf(buf, sizeof buf, "%.*f", std::clamp(decimals, 0, 12), v);
  std::string s = buf;
  if (s.find_first_not_of("-0.") == std::string::npos && s[0] == '-') s.erase(0, 1);
  return s;
}

Ticks nice_ticks(double lo, double hi, int target, bool quarter_steps) {
  if (!std::isfinite(lo) || !std::isfinite(hi)) lo = 0.0, hi = 1.0;
  if (hi < lo) std::swap(lo, hi);
  target = std::max(target, 1);
  const double mag = std::max(std::fabs(lo), std::fabs(hi));
  if (hi - lo <= 1e-12 * std::max(mag, 1e-300)) {
    const double d = mag > 0 ? 0.1 * mag : 1.0;
    lo -= d;
    hi += d;
  }
  const double raw = (hi - lo) / target;
  const double p = std::pow(10.0, std::floor(std::log10(raw)));
  double step = 10.0 * p;
  for (double m : {1.0, 2.0, 2.5, 5.0, 10.0})
    if ((quarter_steps || m != 2.5) && m * p >= raw * (1 - 1e-9)) {
      step = m * p;
      break;
    }
  Ticks t;
  t.step = step;
  t.lo = std::floor(lo / step + 1e-9) * step;
  t.hi = std::ceil(hi / step - 1e-9) * step;
  t.decimals = 0;
  while (t.decimals < 12) {
    const double scaled = step * std::pow(10.0, t.decimals);
    if (std::fabs(scaled - std::round(scaled)) < 1e-6 * std::max(1.0, scaled)) break;
    ++t.decimals;
  }
  const auto n = static_cast<long>(std::lround((t.hi - t.lo) / step));
  for (long i = 0; i <= n; ++i) {
    double v = t.lo + static_cast<double>(i) * step;
    if (std::fabs(v) < 1e-9 * step) v = 0.0;
    t.at.push_back(v);
  }
  return t;
}

void thin(std::vector<double>& x, std::vector<double>& y, std::size_t max_points) {
  const std::size_t n = std::min(x.size(), y.size());
  if (n <= max_points || max_points < 4) return;
  const std::size_t buckets = std::max<std::size_t>(1, (max_points - 2) / 2);
  std::vector<std::size_t> keep = {0, n - 1};
  for (std::size_t b = 0; b < buckets; ++b) {
    const std::size_t a = 1 + b * (n - 2) / buckets, e = 1 + (b + 1) * (n - 2) / buckets;
    std::optional<std::size_t> lo, hi, gap;
    for (std::size_t i = a; i < e; ++i) {
      if (!std::isfinite(y[i])) {
        if (!gap) gap = i;
        continue;
      }
      if (!lo || y[i] < y[*lo]) lo = i;
      if (!hi || y[i] > y[*hi]) hi = i;
    }
    for (const auto& k : {lo, hi, gap})
      if (k) keep.push_back(*k);
  }
  std::sort(keep.begin(), keep.end());
  keep.erase(std::unique(keep.begin(), keep.end()), keep.end());
  std::vector<double> nx, ny;
  for (std::size_t i : keep) {
    nx.push_back(x[i]);
    ny.push_back(y[i]);
  }
  x = std::move(nx);
  y = std::move(ny);
}

}  // namespace sortie::report::svg
