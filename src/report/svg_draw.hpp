#pragma once
/// The drawing pieces the SVG plots share (svg_line_plot, svg_bar_plot): type sizes and
/// colours, numbers and text as SVG, data ranges, axis ticks and the plot frame. Internal to
/// report/; the plots' interface is svg_plot.hpp.
#include <string>

#include "report/svg_plot.hpp"

namespace sortie::report::svg::draw {

// Type sizes in viewBox units. A plot 1200 units wide fills a 1200 px column on screen and
// about 180 mm on paper, where 15 units print at about 6.5 pt.
inline constexpr double kTickFont = 14.0;
inline constexpr double kLabelFont = 15.0;
inline constexpr double kBandFont = 12.5;

inline constexpr const char* kInk = "#1d2733";
inline constexpr const char* kMuted = "#5b6673";
inline constexpr const char* kGrid = "#dde2e7";
inline constexpr const char* kFrame = "#9aa4ae";
inline constexpr const char* kBandFill = "#eef2f5";
/// Readable over lines and fills: a white outline drawn under the glyphs.
inline constexpr const char* kHalo =
    " stroke=\"#ffffff\" stroke-width=\"4\" stroke-linejoin=\"round\" paint-order=\"stroke\"";

/// Width of a text in viewBox units, from a mean glyph advance (no font measuring).
double text_width(const std::string& s, double font);
/// A coordinate with one decimal, no "-0.0".
std::string num(double v);
/// ` name="v"`.
std::string attr(const char* name, double v);
/// A <text> element at (x, y), the text escaped, `extra` attributes as given.
std::string text(double x, double y, const std::string& s, const std::string& extra);
/// The stroke-dasharray attribute of a stroke style ("" for solid).
std::string dash(Stroke s);

/// The finite values seen, lowest and highest.
struct Range {
  double lo = 0.0, hi = 1.0;
  bool empty = true;
  void include(double v);
};

/// Ticks of an axis: fixed ends are kept as given; free ends are rounded out to a tick when
/// `round_out` (with a little air between the data and the frame).
Ticks axis_ticks(const Axis& a, Range data, int target, bool round_out);

/// The plotting area in viewBox units and the data it shows.
struct Frame {
  double left, top, width, height;
  double x0, x1, y0, y1;
  double px(double x) const { return left + (x - x0) / (x1 - x0) * width; }
  double py(double y) const { return top + height - (y - y0) / (y1 - y0) * height; }
};

/// The path data of a polyline on a frame; the pen lifts over non-finite points.
std::string polyline_path(const Line& l, const Frame& f);

/// The opening <svg> element, its <title> and the start of its <defs> (left open).
std::string open_svg(const std::string& id, const std::string& title, double width, double height);

}  // namespace sortie::report::svg::draw
