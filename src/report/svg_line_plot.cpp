// The line plot: a legend across the top, shaded phase bands, grid and ticks, reference levels
// with their labels placed clear of the curves, the curves, an optional right-hand axis.
#include <algorithm>
#include <cmath>

#include "report/svg_draw.hpp"
#include "report/svg_plot.hpp"

namespace sortie::report::svg {

namespace {

using namespace draw;

struct LegendEntry {
  const Line* line;
  double x, row;
};

// Legend entries in rows across the top, between the side margins.
std::vector<LegendEntry> lay_out_legend(const LinePlot& p, double ml, double mr) {
  std::vector<LegendEntry> legend;
  double x = ml, row = 0;
  for (const auto& l : p.lines) {
    if (l.label.empty()) continue;
    const double w = 34.0 + text_width(l.label, kLabelFont) + 26.0;
    if (x + w > p.width - mr && x > ml) {
      x = ml;
      ++row;
    }
    legend.push_back({&l, x, row});
    x += w;
  }
  return legend;
}

// The frame, its ticks and the right-hand axis's mapping onto the left one.
struct Scales {
  Frame f;
  Ticks tx, ty;
  std::optional<Ticks> ty2;
  std::optional<double> y2_per_y;
  double y2_to_left = 1.0;  // right-axis value × this = left-axis value
  // A right-axis value drawn on the left axis's scale.
  double right_to_left(double v) const {
    if (y2_per_y) return v * y2_to_left;
    return ty2 ? f.y0 + (v - ty2->lo) * y2_to_left : v;
  }
  double py(Side side, double v) const { return f.py(side == Side::left ? v : right_to_left(v)); }
};

// The data's extent on x, the left axis and the right axis (a right-axis curve with a fixed
// ratio to the left axis counts on the left).
void data_ranges(const LinePlot& p, Range& xr, Range& yl, Range& yr) {
  auto on_y = [&](Side side, double v) {
    if (side == Side::left) yl.include(v);
    else if (p.y2_per_y) yl.include(v / *p.y2_per_y);
    else yr.include(v);
  };
  for (const auto& l : p.lines)
    for (std::size_t i = 0; i < l.x.size() && i < l.y.size(); ++i) {
      if (!std::isfinite(l.y[i])) continue;
      xr.include(l.x[i]);
      on_y(l.side, l.y[i]);
    }
  for (const auto& b : p.bands) {
    xr.include(b.x0);
    xr.include(b.x1);
  }
  for (const auto& lv : p.levels) on_y(lv.side, lv.value);
}

Scales make_scales(const LinePlot& p, double ml, double mr, double mt, double mb) {
  Range xr, yl, yr;
  data_ranges(p, xr, yl, yr);
  Scales s;
  s.f = Frame{ml, mt, p.width - ml - mr, p.height - mt - mb, 0, 1, 0, 1};
  const int y_target = std::max(2, static_cast<int>(s.f.height / 55.0));
  s.tx = axis_ticks(p.x, xr, std::max(4, static_cast<int>(s.f.width / 110.0)), false);
  s.ty = axis_ticks(p.y, yl, y_target, true);
  s.f.x0 = s.tx.lo;
  s.f.x1 = s.tx.hi;
  s.f.y0 = s.ty.lo;
  s.f.y1 = s.ty.hi;
  s.y2_per_y = p.y2_per_y;
  if (p.y2 && p.y2_per_y) {
    Axis a = *p.y2;
    a.min = s.f.y0 * *p.y2_per_y;
    a.max = s.f.y1 * *p.y2_per_y;
    s.ty2 = axis_ticks(a, {}, y_target, false);
    s.y2_to_left = 1.0 / *p.y2_per_y;
  } else if (p.y2) {
    s.ty2 = axis_ticks(*p.y2, yr, y_target, true);
    s.y2_to_left = (s.f.y1 - s.f.y0) / (s.ty2->hi - s.ty2->lo);
  }
  return s;
}

std::string frame_rect(const Frame& f, const std::string& paint) {
  return "<rect" + attr("x", f.left) + attr("y", f.top) + attr("width", f.width) + attr("height", f.height) + paint +
         "/>\n";
}

// Bands: every other one shaded; a thin line at each boundary; the label at the top.
std::string draw_bands(const LinePlot& p, const Frame& f) {
  std::string o = "<g class=\"bands\">\n";
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
  return o + "</g>\n";
}

// Grid lines, tick labels on both axes (and the right one), the axis labels.
std::string draw_axes(const LinePlot& p, const Scales& s) {
  const Frame& f = s.f;
  std::string o = "<g class=\"grid\" stroke=\"" + std::string(kGrid) + "\" stroke-width=\"1\">\n";
  for (double v : s.ty.at)
    o += "<line" + attr("x1", f.left) + attr("y1", f.py(v)) + attr("x2", f.left + f.width) + attr("y2", f.py(v)) + "/>\n";
  for (double v : s.tx.at)
    o += "<line" + attr("x1", f.px(v)) + attr("y1", f.top) + attr("x2", f.px(v)) + attr("y2", f.top + f.height) +
         " stroke-dasharray=\"2 3\"/>\n";
  o += "</g>\n<g class=\"ticks\" font-size=\"" + num(kTickFont) + "\" fill=\"" + kInk + "\">\n";
  for (double v : s.ty.at) o += text(f.left - 8, f.py(v) + 5, tick_label(v, s.ty.decimals), " text-anchor=\"end\"");
  for (double v : s.tx.at)
    o += text(f.px(v), f.top + f.height + 21, tick_label(v, s.tx.decimals), " text-anchor=\"middle\"");
  if (s.ty2)
    for (double v : s.ty2->at)
      o += text(f.left + f.width + 8, f.py(s.right_to_left(v)) + 5, tick_label(v, s.ty2->decimals),
                " text-anchor=\"start\"");
  o += "</g>\n<g class=\"axis-labels\" font-size=\"" + num(kLabelFont) + "\" fill=\"" + kInk + "\">\n";
  o += text(f.left + 0.5 * f.width, p.height - 12, p.x.label(), " text-anchor=\"middle\"");
  const double yc = f.top + 0.5 * f.height;
  o += "<text" + attr("x", 20.0) + attr("y", yc) + " text-anchor=\"middle\" transform=\"rotate(-90 20.0 " + num(yc) +
       ")\">" + escape(p.y.label()) + "</text>\n";
  if (p.y2)
    o += "<text" + attr("x", p.width - 18) + attr("y", yc) + " text-anchor=\"middle\" transform=\"rotate(90 " +
         num(p.width - 18) + " " + num(yc) + ")\">" + escape(p.y2->label()) + "</text>\n";
  return o + "</g>\n";
}

struct Box {
  double x0, x1, y0, y1;
  bool overlaps(const Box& o) const { return x0 < o.x1 && o.x0 < x1 && y0 < o.y1 && o.y0 < y1; }
};

// Four places for a level's label: either end, above or below its line. It takes the one that
// overlaps no label already placed and leaves the curves the most room.
Box place_level_label(const LinePlot& p, const Scales& s, const Level& lv, double y, std::vector<Box>& placed,
                      bool& at_right, bool& above) {
  const Frame& f = s.f;
  const double label_w = text_width(lv.label, kTickFont) + 16;
  auto box_of = [&](bool right, bool up) {
    const double x0 = right ? f.left + f.width - label_w : f.left;
    return Box{x0, x0 + label_w, up ? y - 20 : y + 1, up ? y - 1 : y + 20};
  };
  auto score = [&](bool right, bool up) {
    const Box b = box_of(right, up);
    double room = 40.0;  // enough: beyond this, more room does not read better
    for (const auto& l : p.lines)
      for (std::size_t k = 0; k < l.x.size() && k < l.y.size(); ++k) {
        if (!std::isfinite(l.y[k])) continue;
        const double px = f.px(l.x[k]);
        if (px < b.x0 || px > b.x1) continue;
        const double py = s.py(l.side, l.y[k]);
        room = std::min(room, py < b.y0 ? b.y0 - py : (py > b.y1 ? py - b.y1 : 0.0));
      }
    if (b.y0 < f.top || b.y1 > f.top + f.height) room -= 1e5;
    for (const auto& q : placed)
      if (b.overlaps(q)) room -= 1e6;
    return room;
  };
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
  return box_of(at_right, above);
}

// Reference levels: their lines first, then each label where it reads best.
std::string draw_levels(const LinePlot& p, const Scales& s) {
  const Frame& f = s.f;
  std::string o = "<g class=\"levels\" font-size=\"" + num(kTickFont) + "\">\n";
  std::vector<Box> placed;
  if (!p.bands.empty()) placed.push_back({f.left, f.left + f.width, f.top, f.top + 18});  // the band numbers
  auto inside = [&](double y) { return y >= f.top - 0.5 && y <= f.top + f.height + 0.5; };
  for (const auto& lv : p.levels) {
    const double y = s.py(lv.side, lv.value);
    if (inside(y))
      o += "<line" + attr("x1", f.left) + attr("y1", y) + attr("x2", f.left + f.width) + attr("y2", y) +
           " stroke=\"" + escape(lv.color) + "\" stroke-width=\"1.8\" stroke-dasharray=\"10 4 2 4\"/>\n";
  }
  for (const auto& lv : p.levels) {
    const double y = s.py(lv.side, lv.value);
    if (!inside(y)) continue;
    bool at_right = true, above = true;
    placed.push_back(place_level_label(p, s, lv, y, placed, at_right, above));
    o += text(at_right ? f.left + f.width - 8 : f.left + 8, above ? y - 6 : y + 16, lv.label,
              std::string(" text-anchor=\"") + (at_right ? "end" : "start") + "\" fill=\"" + escape(lv.color) + "\"" +
                  kHalo);
  }
  return o + "</g>\n";
}

// The curves, thinned for drawing, clipped to the frame; markers where asked or for a lone point.
std::string draw_lines(const LinePlot& p, const Scales& s) {
  std::string o = "<g class=\"lines\" clip-path=\"url(#" + escape(p.id) + "-clip)\" fill=\"none\">\n";
  for (const auto& l : p.lines) {
    Line on_left = l;
    thin(on_left.x, on_left.y, p.max_points);
    if (l.side == Side::right)
      for (auto& v : on_left.y) v = std::isfinite(v) ? s.right_to_left(v) : v;
    const std::string d = polyline_path(on_left, s.f);
    if (!d.empty())
      o += "<path d=\"" + d + "\" stroke=\"" + escape(l.color) + "\"" + attr("stroke-width", l.width) +
           " stroke-linejoin=\"round\"" + dash(l.stroke) + "/>\n";
    const std::size_t n = std::min(on_left.x.size(), on_left.y.size());
    std::size_t finite = 0;
    for (std::size_t i = 0; i < n; ++i) finite += std::isfinite(on_left.y[i]);
    if (l.markers || finite == 1)
      for (std::size_t i = 0; i < n; ++i)
        if (std::isfinite(on_left.y[i]))
          o += "<circle" + attr("cx", s.f.px(on_left.x[i])) + attr("cy", s.f.py(on_left.y[i])) + " r=\"4\" fill=\"" +
               escape(l.color) + "\" stroke=\"#ffffff\" stroke-width=\"1\"/>\n";
  }
  return o + "</g>\n";
}

std::string draw_legend(const std::vector<LegendEntry>& legend) {
  std::string o = "<g class=\"legend\" font-size=\"" + num(kLabelFont) + "\" fill=\"" + kInk + "\">\n";
  for (const auto& e : legend) {
    const double y = 12.0 + e.row * 24.0 + 10.0;
    o += "<line" + attr("x1", e.x) + attr("y1", y) + attr("x2", e.x + 28) + attr("y2", y) + " stroke=\"" +
         escape(e.line->color) + "\"" + attr("stroke-width", std::max(e.line->width, 2.5)) + dash(e.line->stroke) +
         "/>\n";
    if (e.line->markers)
      o += "<circle" + attr("cx", e.x + 14) + attr("cy", y) + " r=\"4\" fill=\"" + escape(e.line->color) + "\"/>\n";
    o += text(e.x + 34, y + 5, e.line->label, "");
  }
  return o + "</g>\n";
}

}  // namespace

std::string render(const LinePlot& p) {
  const double ml = 86.0, mr = p.y2 || p.right_margin ? 86.0 : 30.0;
  const auto legend = lay_out_legend(p, ml, mr);
  const double legend_rows = legend.empty() ? 0.0 : legend.back().row + 1;
  const Scales s = make_scales(p, ml, mr, 12.0 + legend_rows * 24.0 + 6.0, 60.0);
  std::string o = open_svg(p.id, p.title, p.width, p.height);
  o += "<clipPath id=\"" + escape(p.id) + "-clip\">" + frame_rect(s.f, "") + "</clipPath></defs>\n";
  o += frame_rect(s.f, " fill=\"#ffffff\"");
  o += draw_bands(p, s.f);
  o += draw_axes(p, s);
  o += draw_levels(p, s);
  o += draw_lines(p, s);
  o += frame_rect(s.f, " fill=\"none\" stroke=\"" + std::string(kFrame) + "\" stroke-width=\"1\"");
  o += draw_legend(legend);
  return o + "</svg>\n";
}

}  // namespace sortie::report::svg
