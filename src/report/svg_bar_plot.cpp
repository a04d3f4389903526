// The horizontal bar chart: labels | bars with their values beside them | flags (e.g. NO-GO and
// why), reference levels across the bars, the value axis below.
#include <algorithm>
#include <cmath>

#include "report/svg_draw.hpp"
#include "report/svg_plot.hpp"

namespace sortie::report::svg {

namespace {

using namespace draw;

struct BarLayout {
  Frame f;
  Ticks t;
  double height = 0.0;
  double px(double v) const { return f.left + (v - f.x0) / (f.x1 - f.x0) * f.width; }
};

// Column widths from the texts, the value axis with room beyond the longest bars for their
// value text.
BarLayout lay_out_bars(const BarPlot& p) {
  const double W = p.width;
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
  BarLayout L{Frame{ml, mt, W - ml - mr, rows_h, 0, 1, 0, 1}, {}, mt + rows_h + mb};
  const int target = std::max(2, static_cast<int>(L.f.width / 110.0));
  const double room = value_w / L.f.width;
  const double extra = std::min(room, 0.45) * (vr.hi - vr.lo) / std::max(1e-9, 1.0 - room);
  Range wider = vr;
  if (negative && !p.value.min) wider.include(vr.lo - extra);
  if ((positive || !negative) && !p.value.max) wider.include(vr.hi + extra);
  L.t = axis_ticks(p.value, wider, target, true);
  L.f.x0 = L.t.lo;
  L.f.x1 = L.t.hi;
  return L;
}

// One row: the stripe, the label, the flag, the bar (hatched when flagged) and its value text.
std::string draw_bar(const BarPlot& p, const BarLayout& L, std::size_t i) {
  const auto& b = p.bars[i];
  const Frame& f = L.f;
  const double y = f.top + static_cast<double>(i) * p.row_height;
  const double yc = y + 0.5 * p.row_height;
  std::string o;
  if (i % 2 == 1)
    o += "<rect" + attr("x", 0.0) + attr("y", y) + attr("width", f.left + f.width) + attr("height", p.row_height) +
         " fill=\"#f3f5f7\"/>\n";
  o += text(f.left - 10, yc + 5, b.label, " text-anchor=\"end\"");
  const std::string flag_fill = " fill=\"" + escape(p.flag_color) + "\" font-weight=\"bold\"";
  const std::string note_fill = b.flagged ? flag_fill : "";
  const std::string& note = b.value_text;
  if (!b.flag_text.empty()) o += text(f.left + f.width + 12, yc + 5, b.flag_text, flag_fill);
  if (!b.value) return note.empty() ? o : o + text(L.px(0.0) + 8, yc + 5, note, note_fill);
  const double a = L.px(std::min(0.0, *b.value)), e = L.px(std::max(0.0, *b.value));
  const std::string fill = b.flagged ? "url(#" + escape(p.id) + "-hatch)" : escape(p.color);
  o += "<rect" + attr("x", a) + attr("y", y + 5) + attr("width", std::max(e - a, 1.0)) +
       attr("height", p.row_height - 10) + " fill=\"" + fill + "\"/>\n";
  if (*b.value >= 0) return o + text(e + 7, yc + 5, note, note_fill);
  return o + text(a - 7, yc + 5, note, " text-anchor=\"end\"" + note_fill);
}

// The zero line, the reference levels, the frame, the ticks and the value axis's label.
std::string draw_value_axis(const BarPlot& p, const BarLayout& L) {
  const Frame& f = L.f;
  std::string o = "<line" + attr("x1", L.px(0.0)) + attr("y1", f.top) + attr("x2", L.px(0.0)) +
                  attr("y2", f.top + f.height) + " stroke=\"" + kInk + "\" stroke-width=\"1.5\"/>\n";
  o += "<g class=\"levels\" font-size=\"" + num(kTickFont) + "\">\n";
  for (const auto& lv : p.levels) {
    const double x = L.px(lv.value);
    o += "<line" + attr("x1", x) + attr("y1", f.top - 4) + attr("x2", x) + attr("y2", f.top + f.height) + " stroke=\"" +
         escape(lv.color) + "\" stroke-width=\"1.8\" stroke-dasharray=\"10 4 2 4\"/>\n";
    o += text(x, f.top - 10, lv.label, " text-anchor=\"middle\" fill=\"" + escape(lv.color) + "\"" + kHalo);
  }
  o += "</g>\n";
  o += "<rect" + attr("x", f.left) + attr("y", f.top) + attr("width", f.width) + attr("height", f.height) +
       " fill=\"none\" stroke=\"" + kFrame + "\" stroke-width=\"1\"/>\n";
  o += "<g class=\"ticks\" font-size=\"" + num(kTickFont) + "\" fill=\"" + kInk + "\">\n";
  for (double v : L.t.at)
    o += text(L.px(v), f.top + f.height + 21, tick_label(v, L.t.decimals), " text-anchor=\"middle\"");
  o += "</g>\n";
  return o + text(f.left + 0.5 * f.width, L.height - 12, p.value.label(),
                  " text-anchor=\"middle\" font-size=\"" + num(kLabelFont) + "\" fill=\"" + kInk + "\"");
}

}  // namespace

std::string render(const BarPlot& p) {
  const BarLayout L = lay_out_bars(p);
  std::string o = open_svg(p.id, p.title, p.width, L.height);
  o += "<pattern id=\"" + escape(p.id) +
       "-hatch\" patternUnits=\"userSpaceOnUse\" width=\"8\" height=\"8\" patternTransform=\"rotate(45)\"><rect "
       "width=\"8\" height=\"8\" fill=\"" + escape(p.flag_color) + "\"/><line x1=\"0\" y1=\"0\" x2=\"0\" y2=\"8\" "
       "stroke=\"#ffffff\" stroke-width=\"3\" stroke-opacity=\"0.55\"/></pattern></defs>\n";
  o += "<g class=\"grid\" stroke=\"" + std::string(kGrid) + "\" stroke-width=\"1\">\n";
  for (double v : L.t.at)
    o += "<line" + attr("x1", L.px(v)) + attr("y1", L.f.top) + attr("x2", L.px(v)) + attr("y2", L.f.top + L.f.height) +
         "/>\n";
  o += "</g>\n<g class=\"bars\" font-size=\"" + num(kLabelFont) + "\" fill=\"" + kInk + "\">\n";
  for (std::size_t i = 0; i < p.bars.size(); ++i) o += draw_bar(p, L, i);
  o += "</g>\n";
  return o + draw_value_axis(p, L) + "</svg>\n";
}

}  // namespace sortie::report::svg
