#include "report/svg_draw.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>

namespace sortie::report::svg::draw {

namespace {

// Mean advance of a sans-serif glyph, as a fraction of the font size: enough to keep labels
// from colliding without measuring text (DejaVu Sans averages about 0.55 em on mixed text).
constexpr double kGlyphEm = 0.6;

}  // namespace

double text_width(const std::string& s, double font) {
  std::size_t n = 0;
  for (unsigned char c : s)
    if ((c & 0xC0) != 0x80) ++n;  // UTF-8 code points
  return static_cast<double>(n) * kGlyphEm * font;
}

std::string num(double v) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.1f", v);
  std::string s = buf;
  if (s == "-0.0") s = "0.0";
  return s;
}

std::string attr(const char* name, double v) { return std::string(" ") + name + "=\"" + num(v) + "\""; }

std::string text(double x, double y, const std::string& s, const std::string& extra) {
  return "<text" + attr("x", x) + attr("y", y) + extra + ">" + escape(s) + "</text>\n";
}

std::string dash(Stroke s) {
  switch (s) {
    case Stroke::solid: return "";
    case Stroke::dashed: return " stroke-dasharray=\"9 5\"";
    case Stroke::dotted: return " stroke-dasharray=\"2 4\" stroke-linecap=\"round\"";
  }
  return "";
}

void Range::include(double v) {
  if (!std::isfinite(v)) return;
  if (empty) {
    lo = hi = v;
    empty = false;
  } else {
    lo = std::min(lo, v);
    hi = std::max(hi, v);
  }
}

Ticks axis_ticks(const Axis& a, Range data, int target, bool round_out) {
  const bool quarter = !a.no_quarter_steps;
  if (a.min) data.include(*a.min);
  if (a.max) data.include(*a.max);
  if (data.empty) {
    data.include(0.0);
    data.include(1.0);
  }
  double lo = a.min.value_or(data.lo), hi = a.max.value_or(data.hi);
  if (round_out) {
    // A little air between the curves and a free end, so that no line runs along the frame.
    const double pad = 0.04 * (hi - lo);
    if (!a.min) lo -= pad;
    if (!a.max) hi += pad;
  }
  Ticks t = nice_ticks(lo, hi, target, quarter);
  if (round_out) {
    if (!a.min) lo = t.lo;
    if (!a.max) hi = t.hi;
  }
  if (hi <= lo) hi = lo + t.step;
  std::vector<double> inside;
  for (double v : t.at)
    if (v >= lo - 1e-9 * t.step && v <= hi + 1e-9 * t.step) inside.push_back(v);
  t.at = inside;
  t.lo = lo;
  t.hi = hi;
  return t;
}

std::string polyline_path(const Line& l, const Frame& f) {
  std::vector<double> x = l.x, y = l.y;
  if (y.size() < x.size()) x.resize(y.size());
  std::string d;
  bool pen = false;
  for (std::size_t i = 0; i < x.size(); ++i) {
    if (!std::isfinite(x[i]) || !std::isfinite(y[i])) {
      pen = false;
      continue;
    }
    d += (pen ? " L" : (d.empty() ? "M" : " M")) + num(f.px(x[i])) + " " + num(f.py(y[i]));
    pen = true;
  }
  return d;
}

std::string open_svg(const std::string& id, const std::string& title, double width, double height) {
  return "<svg class=\"plot\" data-plot=\"" + escape(id) + "\" viewBox=\"0 0 " + num(width) + " " + num(height) +
         "\" width=\"100%\" preserveAspectRatio=\"xMidYMid meet\" role=\"img\" aria-labelledby=\"" + escape(id) +
         "-title\" font-family=\"'DejaVu Sans', 'Liberation Sans', Arial, sans-serif\">\n<title id=\"" + escape(id) +
         "-title\">" + escape(title) + "</title>\n<defs>";
}

}  // namespace sortie::report::svg::draw
