#include "report/svg_plot.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>

namespace sortie::report::svg {

namespace {

// Type sizes in viewBox units. A plot 1200 units wide fills a 1200 px column on screen and
// about 180 mm on paper, where 15 units print at about 6.5 pt.
constexpr double kTickFont = 14.0;
constexpr double kLabelFont = 15.0;
constexpr double kBandFont = 12.5;
// Mean advance of a sans-serif glyph, as a fraction of the font size: enough to keep labels
// from colliding without measuring text (DejaVu Sans averages about 0.55 em on mixed text).
constexpr double kGlyphEm = 0.6;

const char* kInk = "#1d2733";
const char* kMuted = "#5b6673";
const char* kGrid = "#dde2e7";
const char* kFrame = "#9aa4ae";
const char* kBandFill = "#eef2f5";

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

// Readable over lines and fills: a white outline drawn under the glyphs.
const std::string kHalo = " stroke=\"#ffffff\" stroke-width=\"4\" stroke-linejoin=\"round\" paint-order=\"stroke\"";

std::string dash(Stroke s) {
  switch (s) {
    case Stroke::solid: return "";
    case Stroke::dashed: return " stroke-dasharray=\"9 5\"";
    case Stroke::dotted: return " stroke-dasharray=\"2 4\" stroke-linecap=\"round\"";
  }
  return "";
}

struct Range {
  double lo = 0.0, hi = 1.0;
  void include(double v) {
    if (!std::isfinite(v)) return;
    if (empty) {
      lo = hi = v;
      empty = false;
    } else {
      lo = std::min(lo, v);
      hi = std::max(hi, v);
    }
  }
  bool empty = true;
};

// Ticks of an axis: fixed ends are kept as given; free ends are rounded out to a tick.
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

struct Frame {
  double left, top, width, height;
  double x0, x1, y0, y1;
  double px(double x) const { return left + (x - x0) / (x1 - x0) * width; }
  double py(double y) const { return top + height - (y - y0) / (y1 - y0) * height; }
};

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

}  // namespace

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

std::string render(const LinePlot& p) {
  const double W = p.width, H = p.height;
  // Legend entries in rows across the top.
  struct Entry {
    const Line* line;
    double x, row;
  };
  std::vector<Entry> legend;
  const double ml = 86.0, mr = p.y2 || p.right_margin ? 86.0 : 30.0;
  {
    double x = ml, row = 0;
    for (const auto& l : p.lines) {
      if (l.label.empty()) continue;
      const double w = 34.0 + text_width(l.label, kLabelFont) + 26.0;
      if (x + w > W - mr && x > ml) {
        x = ml;
        ++row;
      }
      legend.push_back({&l, x, row});
      x += w;
    }
  }
  const double legend_rows = legend.empty() ? 0.0 : legend.back().row + 1;
  const double mt = 12.0 + legend_rows * 24.0 + 6.0, mb = 60.0;

  Range xr, yl, yr;
  for (const auto& l : p.lines) {
    for (std::size_t i = 0; i < l.x.size() && i < l.y.size(); ++i) {
      if (!std::isfinite(l.y[i])) continue;
      xr.include(l.x[i]);
      if (l.side == Side::left) yl.include(l.y[i]);
      else if (p.y2_per_y) yl.include(l.y[i] / *p.y2_per_y);
      else yr.include(l.y[i]);
    }
  }
  for (const auto& b : p.bands) {
    xr.include(b.x0);
    xr.include(b.x1);
  }
  for (const auto& lv : p.levels) {
    if (lv.side == Side::left) yl.include(lv.value);
    else if (p.y2_per_y) yl.include(lv.value / *p.y2_per_y);
    else yr.include(lv.value);
  }
  Frame f{ml, mt, W - ml - mr, H - mt - mb, 0, 1, 0, 1};
  const Ticks tx = axis_ticks(p.x, xr, std::max(4, static_cast<int>(f.width / 110.0)), false);
  const Ticks ty = axis_ticks(p.y, yl, std::max(2, static_cast<int>(f.height / 55.0)), true);
  f.x0 = tx.lo;
  f.x1 = tx.hi;
  f.y0 = ty.lo;
  f.y1 = ty.hi;
  std::optional<Ticks> ty2;
  double y2_to_left = 1.0;  // right-axis value × this = left-axis value
  if (p.y2) {
    if (p.y2_per_y) {
      Axis a = *p.y2;
      a.min = f.y0 * *p.y2_per_y;
      a.max = f.y1 * *p.y2_per_y;
      ty2 = axis_ticks(a, {}, std::max(2, static_cast<int>(f.height / 55.0)), false);
      y2_to_left = 1.0 / *p.y2_per_y;
    } else {
      ty2 = axis_ticks(*p.y2, yr, std::max(2, static_cast<int>(f.height / 55.0)), true);
      y2_to_left = (f.y1 - f.y0) / (ty2->hi - ty2->lo);
    }
  }
  // A right-axis value drawn on the left axis's scale.
  auto right_to_left = [&](double v) {
    if (p.y2_per_y) return v * y2_to_left;
    return ty2 ? f.y0 + (v - ty2->lo) * y2_to_left : v;
  };

  std::string o;
  o += "<svg class=\"plot\" data-plot=\"" + escape(p.id) + "\" viewBox=\"0 0 " + num(W) + " " + num(H) +
       "\" width=\"100%\" preserveAspectRatio=\"xMidYMid meet\" role=\"img\" aria-labelledby=\"" + escape(p.id) +
       "-title\" font-family=\"'DejaVu Sans', 'Liberation Sans', Arial, sans-serif\">\n";
  o += "<title id=\"" + escape(p.id) + "-title\">" + escape(p.title) + "</title>\n";
  o += "<defs><clipPath id=\"" + escape(p.id) + "-clip\"><rect" + attr("x", f.left) + attr("y", f.top) +
       attr("width", f.width) + attr("height", f.height) + "/></clipPath></defs>\n";
  o += "<rect" + attr("x", f.left) + attr("y", f.top) + attr("width", f.width) + attr("height", f.height) +
       " fill=\"#ffffff\"/>\n";

  // Bands: every other one shaded; a thin line at each boundary; the label at the top.
  o += "<g class=\"bands\">\n";
  for (std::size_t i = 0; i < p.bands.size(); ++i) {
    const auto& b = p.bands[i];
    const double a = std::clamp(f.px(b.x0), f.left, f.left + f.width);
    const double e = std::clamp(f.px(b.x1), f.left, f.left + f.width);
    if (e <= a) continue;
    if (i % 2 == 0)
      o += "<rect" + attr("x", a) + attr("y", f.top) + attr("width", e - a) + attr("height", f.height) + " fill=\"" +
           kBandFill + "\"/>\n";
    if (i > 0)
      o += "<line" + attr("x1", a) + attr("y1", f.top) + attr("x2", a) + attr("y2", f.top + f.height) +
           " stroke=\"#c3ccd4\" stroke-width=\"1\"/>\n";
    if (!b.label.empty() && e - a >= text_width(b.label, kBandFont) + 4)
      o += text(0.5 * (a + e), f.top + 15, b.label,
                " text-anchor=\"middle\" font-size=\"" + num(kBandFont) + "\" fill=\"" + kMuted + "\"");
  }
  o += "</g>\n";

  // Grid and tick labels.
  o += "<g class=\"grid\" stroke=\"" + std::string(kGrid) + "\" stroke-width=\"1\">\n";
  for (double v : ty.at)
    o += "<line" + attr("x1", f.left) + attr("y1", f.py(v)) + attr("x2", f.left + f.width) + attr("y2", f.py(v)) + "/>\n";
  for (double v : tx.at)
    o += "<line" + attr("x1", f.px(v)) + attr("y1", f.top) + attr("x2", f.px(v)) + attr("y2", f.top + f.height) +
         " stroke-dasharray=\"2 3\"/>\n";
  o += "</g>\n";
  o += "<g class=\"ticks\" font-size=\"" + num(kTickFont) + "\" fill=\"" + kInk + "\">\n";
  for (double v : ty.at) o += text(f.left - 8, f.py(v) + 5, tick_label(v, ty.decimals), " text-anchor=\"end\"");
  for (double v : tx.at)
    o += text(f.px(v), f.top + f.height + 21, tick_label(v, tx.decimals), " text-anchor=\"middle\"");
  if (ty2)
    for (double v : ty2->at)
      o += text(f.left + f.width + 8, f.py(right_to_left(v)) + 5, tick_label(v, ty2->decimals), " text-anchor=\"start\"");
  o += "</g>\n";
  o += "<g class=\"axis-labels\" font-size=\"" + num(kLabelFont) + "\" fill=\"" + kInk + "\">\n";
  o += text(f.left + 0.5 * f.width, H - 12, p.x.label(), " text-anchor=\"middle\"");
  const double yc = f.top + 0.5 * f.height;
  o += "<text" + attr("x", 20.0) + attr("y", yc) + " text-anchor=\"middle\" transform=\"rotate(-90 20.0 " + num(yc) +
       ")\">" + escape(p.y.label()) + "</text>\n";
  if (p.y2)
    o += "<text" + attr("x", W - 18) + attr("y", yc) + " text-anchor=\"middle\" transform=\"rotate(90 " + num(W - 18) +
         " " + num(yc) + ")\">" + escape(p.y2->label()) + "</text>\n";
  o += "</g>\n";

  // Reference levels, then the curves over them.
  o += "<g class=\"levels\" font-size=\"" + num(kTickFont) + "\">\n";
  struct Box {
    double x0, x1, y0, y1;
    bool overlaps(const Box& o) const { return x0 < o.x1 && o.x0 < x1 && y0 < o.y1 && o.y0 < y1; }
  };
  std::vector<Box> placed;
  if (!p.bands.empty()) placed.push_back({f.left, f.left + f.width, f.top, f.top + 18});  // the band numbers
  std::vector<double> level_y;
  for (const auto& lv : p.levels) {
    const double y = f.py(lv.side == Side::left ? lv.value : right_to_left(lv.value));
    level_y.push_back(y);
    if (y < f.top - 0.5 || y > f.top + f.height + 0.5) continue;
    o += "<line" + attr("x1", f.left) + attr("y1", y) + attr("x2", f.left + f.width) + attr("y2", y) + " stroke=\"" +
         escape(lv.color) + "\" stroke-width=\"1.8\" stroke-dasharray=\"10 4 2 4\"/>\n";
  }
  for (std::size_t i = 0; i < p.levels.size(); ++i) {
    const auto& lv = p.levels[i];
    const double y = level_y[i];
    if (y < f.top - 0.5 || y > f.top + f.height + 0.5) continue;
    // Four places for the label: either end, above or below its line. It takes the one that
    // overlaps no label already placed and leaves the curves the most room.
    const double label_w = text_width(lv.label, kTickFont) + 16;
    auto box_of = [&](bool right, bool above) {
      const double x0 = right ? f.left + f.width - label_w : f.left;
      return Box{x0, x0 + label_w, above ? y - 20 : y + 1, above ? y - 1 : y + 20};
    };
    auto score = [&](bool right, bool above) {
      const Box b = box_of(right, above);
      double room = 40.0;  // enough: beyond this, more room does not read better
      for (const auto& l : p.lines)
        for (std::size_t k = 0; k < l.x.size() && k < l.y.size(); ++k) {
          if (!std::isfinite(l.y[k])) continue;
          const double px = f.px(l.x[k]);
          if (px < b.x0 || px > b.x1) continue;
          const double py = f.py(l.side == Side::left ? l.y[k] : right_to_left(l.y[k]));
          room = std::min(room, py < b.y0 ? b.y0 - py : (py > b.y1 ? py - b.y1 : 0.0));
        }
      if (b.y0 < f.top || b.y1 > f.top + f.height) room -= 1e5;
      for (const auto& q : placed)
        if (b.overlaps(q)) room -= 1e6;
      return room;
    };
    bool at_right = true, above = true;
    double best = -1e300;
    for (bool r_side : {true, false})
      for (bool a_side : {true, false}) {
        const double c = score(r_side, a_side);
        if (c > best + 1e-9) {
          best = c;
          at_right = r_side;
          above = a_side;
        }
      }
    placed.push_back(box_of(at_right, above));
    const double ty_text = above ? y - 6 : y + 16;
    o += text(at_right ? f.left + f.width - 8 : f.left + 8, ty_text, lv.label,
              std::string(" text-anchor=\"") + (at_right ? "end" : "start") + "\" fill=\"" + escape(lv.color) + "\"" +
                  kHalo);
  }
  o += "</g>\n";
  o += "<g class=\"lines\" clip-path=\"url(#" + escape(p.id) + "-clip)\" fill=\"none\">\n";
  for (const auto& l : p.lines) {
    Line shown = l;
    thin(shown.x, shown.y, p.max_points);
    Line on_left = shown;
    if (l.side == Side::right)
      for (auto& v : on_left.y) v = std::isfinite(v) ? right_to_left(v) : v;
    const std::string d = polyline_path(on_left, f);
    if (!d.empty())
      o += "<path d=\"" + d + "\" stroke=\"" + escape(l.color) + "\"" + attr("stroke-width", l.width) +
           " stroke-linejoin=\"round\"" + dash(l.stroke) + "/>\n";
    std::size_t finite = 0;
    for (std::size_t i = 0; i < on_left.x.size() && i < on_left.y.size(); ++i) finite += std::isfinite(on_left.y[i]);
    if (l.markers || finite == 1)
      for (std::size_t i = 0; i < on_left.x.size() && i < on_left.y.size(); ++i)
        if (std::isfinite(on_left.y[i]))
          o += "<circle" + attr("cx", f.px(on_left.x[i])) + attr("cy", f.py(on_left.y[i])) + " r=\"4\" fill=\"" +
               escape(l.color) + "\" stroke=\"#ffffff\" stroke-width=\"1\"/>\n";
  }
  o += "</g>\n";
  o += "<rect" + attr("x", f.left) + attr("y", f.top) + attr("width", f.width) + attr("height", f.height) +
       " fill=\"none\" stroke=\"" + kFrame + "\" stroke-width=\"1\"/>\n";

  // Legend.
  o += "<g class=\"legend\" font-size=\"" + num(kLabelFont) + "\" fill=\"" + kInk + "\">\n";
  for (const auto& e : legend) {
    const double y = 12.0 + e.row * 24.0 + 10.0;
    o += "<line" + attr("x1", e.x) + attr("y1", y) + attr("x2", e.x + 28) + attr("y2", y) + " stroke=\"" +
         escape(e.line->color) + "\"" + attr("stroke-width", std::max(e.line->width, 2.5)) + dash(e.line->stroke) + "/>\n";
    if (e.line->markers) o += "<circle" + attr("cx", e.x + 14) + attr("cy", y) + " r=\"4\" fill=\"" + escape(e.line->color) + "\"/>\n";
    o += text(e.x + 34, y + 5, e.line->label, "");
  }
  o += "</g>\n</svg>\n";
  return o;
}

std::string render(const BarPlot& p) {
  const double W = p.width;
  // Columns: labels | bars with their values beside them | flags (e.g. NO-GO and why).
  double label_w = 0.0, value_w = 0.0, flag_w = 0.0;
  for (const auto& b : p.bars) {
    label_w = std::max(label_w, text_width(b.label, kLabelFont));
    value_w = std::max(value_w, text_width(b.value_text, kLabelFont) + 14.0);
    if (!b.flag_text.empty()) flag_w = std::max(flag_w, text_width(b.flag_text, kLabelFont) + 10.0);
  }
  const double ml = std::clamp(label_w + 22.0, 110.0, 0.4 * W);
  const double mr = flag_w > 0 ? std::clamp(flag_w + 14.0, 40.0, 0.4 * W) : 24.0;
  const double mt = p.levels.empty() ? 10.0 : 30.0, mb = 58.0;
  const double rows_h = p.row_height * static_cast<double>(std::max<std::size_t>(p.bars.size(), 1));
  const double H = mt + rows_h + mb;

  Range vr;
  vr.include(0.0);
  bool negative = false, positive = false;
  for (const auto& b : p.bars)
    if (b.value) {
      vr.include(*b.value);
      negative = negative || *b.value < 0;
      positive = positive || *b.value > 0;
    }
  for (const auto& lv : p.levels) vr.include(lv.value);
  Frame f{ml, mt, W - ml - mr, rows_h, 0, 1, 0, 1};
  const int target = std::max(2, static_cast<int>(f.width / 110.0));
  Ticks t = axis_ticks(p.value, vr, target, true);
  // Room inside the frame beyond the longest bars for their value text.
  const double extra = std::min(value_w / f.width, 0.45) * (vr.hi - vr.lo) / std::max(1e-9, 1.0 - value_w / f.width);
  Range wider = vr;
  if (negative && !p.value.min) wider.include(vr.lo - extra);
  if ((positive || !negative) && !p.value.max) wider.include(vr.hi + extra);
  t = axis_ticks(p.value, wider, target, true);
  f.x0 = t.lo;
  f.x1 = t.hi;
  auto px = [&](double v) { return f.left + (v - f.x0) / (f.x1 - f.x0) * f.width; };

  std::string o;
  o += "<svg class=\"plot\" data-plot=\"" + escape(p.id) + "\" viewBox=\"0 0 " + num(W) + " " + num(H) +
       "\" width=\"100%\" preserveAspectRatio=\"xMidYMid meet\" role=\"img\" aria-labelledby=\"" + escape(p.id) +
       "-title\" font-family=\"'DejaVu Sans', 'Liberation Sans', Arial, sans-serif\">\n";
  o += "<title id=\"" + escape(p.id) + "-title\">" + escape(p.title) + "</title>\n";
  o += "<defs><pattern id=\"" + escape(p.id) +
       "-hatch\" patternUnits=\"userSpaceOnUse\" width=\"8\" height=\"8\" patternTransform=\"rotate(45)\"><rect "
       "width=\"8\" height=\"8\" fill=\"" + escape(p.flag_color) + "\"/><line x1=\"0\" y1=\"0\" x2=\"0\" y2=\"8\" "
       "stroke=\"#ffffff\" stroke-width=\"3\" stroke-opacity=\"0.55\"/></pattern></defs>\n";
  o += "<g class=\"grid\" stroke=\"" + std::string(kGrid) + "\" stroke-width=\"1\">\n";
  for (double v : t.at)
    o += "<line" + attr("x1", px(v)) + attr("y1", f.top) + attr("x2", px(v)) + attr("y2", f.top + f.height) + "/>\n";
  o += "</g>\n";
  o += "<g class=\"bars\" font-size=\"" + num(kLabelFont) + "\" fill=\"" + kInk + "\">\n";
  for (std::size_t i = 0; i < p.bars.size(); ++i) {
    const auto& b = p.bars[i];
    const double y = f.top + static_cast<double>(i) * p.row_height;
    const double yc = y + 0.5 * p.row_height;
    if (i % 2 == 1)
      o += "<rect" + attr("x", 0.0) + attr("y", y) + attr("width", f.left + f.width) + attr("height", p.row_height) +
           " fill=\"#f3f5f7\"/>\n";
    o += text(f.left - 10, yc + 5, b.label, " text-anchor=\"end\"");
    const std::string flag_fill = " fill=\"" + escape(p.flag_color) + "\" font-weight=\"bold\"";
    const std::string note_fill = b.flagged ? flag_fill : "";
    const std::string& note = b.value_text;
    if (!b.flag_text.empty()) o += text(f.left + f.width + 12, yc + 5, b.flag_text, flag_fill);
    if (!b.value) {
      if (!note.empty()) o += text(px(0.0) + 8, yc + 5, note, note_fill);
      continue;
    }
    const double a = px(std::min(0.0, *b.value)), e = px(std::max(0.0, *b.value));
    const std::string fill = b.flagged ? "url(#" + escape(p.id) + "-hatch)" : escape(p.color);
    o += "<rect" + attr("x", a) + attr("y", y + 5) + attr("width", std::max(e - a, 1.0)) +
         attr("height", p.row_height - 10) + " fill=\"" + fill + "\"/>\n";
    if (*b.value >= 0) o += text(e + 7, yc + 5, note, note_fill);
    else o += text(a - 7, yc + 5, note, " text-anchor=\"end\"" + note_fill);
  }
  o += "</g>\n";
  o += "<line" + attr("x1", px(0.0)) + attr("y1", f.top) + attr("x2", px(0.0)) + attr("y2", f.top + f.height) +
       " stroke=\"" + kInk + "\" stroke-width=\"1.5\"/>\n";
  o += "<g class=\"levels\" font-size=\"" + num(kTickFont) + "\">\n";
  for (const auto& lv : p.levels) {
    const double x = px(lv.value);
    o += "<line" + attr("x1", x) + attr("y1", f.top - 4) + attr("x2", x) + attr("y2", f.top + f.height) + " stroke=\"" +
         escape(lv.color) + "\" stroke-width=\"1.8\" stroke-dasharray=\"10 4 2 4\"/>\n";
    o += text(x, f.top - 10, lv.label, " text-anchor=\"middle\" fill=\"" + escape(lv.color) + "\"" + kHalo);
  }
  o += "</g>\n";
  o += "<rect" + attr("x", f.left) + attr("y", f.top) + attr("width", f.width) + attr("height", f.height) +
       " fill=\"none\" stroke=\"" + kFrame + "\" stroke-width=\"1\"/>\n";
  o += "<g class=\"ticks\" font-size=\"" + num(kTickFont) + "\" fill=\"" + kInk + "\">\n";
  for (double v : t.at)
    o += text(px(v), f.top + f.height + 21, tick_label(v, t.decimals), " text-anchor=\"middle\"");
  o += "</g>\n";
  o += text(f.left + 0.5 * f.width, H - 12, p.value.label(),
            " text-anchor=\"middle\" font-size=\"" + num(kLabelFont) + "\" fill=\"" + kInk + "\"");
  o += "</svg>\n";
  return o;
}

}  // namespace sortie::report::svg
