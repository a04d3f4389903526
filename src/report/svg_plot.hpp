#pragma once
/// Small plots as inline SVG for the HTML reports: line plots over a shared x axis (with
/// shaded bands, reference levels and an optional right-hand axis) and horizontal bar charts.
/// Output is XML-clean (every element closed, every attribute quoted) and names no external
/// resource, so it can sit inside an HTML page that must stand alone. Axis labels follow
/// the quantity / unit form of ISO 80000-1:2009, section 7.1.
#include <cstddef>
#include <optional>
#include <string>
#include <vector>

namespace sortie::report::svg {

/// Tick marks with "nice" steps: 1, 2, 2.5 or 5 times a power of ten.
struct Ticks {
  double lo = 0.0, hi = 1.0;  ///< axis ends: multiples of step that cover the data
  double step = 0.2;
  int decimals = 1;           ///< enough to print every tick exactly
  std::vector<double> at;     ///< lo, lo + step, ..., hi
};

/// Ticks covering [lo, hi] with about `target` intervals; a zero-width range is widened.
/// Without `quarter_steps` the steps are 1, 2 or 5 times a power of ten (for time axes).
Ticks nice_ticks(double lo, double hi, int target = 6, bool quarter_steps = true);

/// Thin a polyline to at most about `max_points` points for drawing: the first and last points
/// stay, and each bucket keeps the points holding its smallest and largest y, so spikes and
/// steps survive. NaN y values (gaps) are kept where they fall.
void thin(std::vector<double>& x, std::vector<double>& y, std::size_t max_points);

/// A number as SVG text: fixed decimals, no "-0".
std::string tick_label(double v, int decimals);

/// Text for SVG and HTML: & < > " ' escaped.
std::string escape(const std::string& s);

struct Axis {
  std::string quantity;             ///< "pack voltage"
  std::string unit;                 ///< "V"; the label reads "pack voltage / V"
  std::optional<double> min, max;   ///< fixed ends; otherwise from the data, rounded to ticks
  bool no_quarter_steps = false;    ///< ticks every 1, 2 or 5 (never 2.5): time in minutes
  std::string label() const { return unit.empty() ? quantity : quantity + " / " + unit; }
};

enum class Side { left, right };
enum class Stroke { solid, dashed, dotted };

/// One curve. NaN in y breaks the line (a gap).
struct Line {
  std::string label;
  std::vector<double> x, y;
  std::string color = "#0b6e8a";
  Side side = Side::left;
  Stroke stroke = Stroke::solid;
  double width = 2.2;
  bool markers = false;  ///< a dot at each point (always on for a single point)
};

/// A horizontal reference line (a reserve, a cutoff) with its label.
struct Level {
  double value = 0.0;
  std::string label;
  std::string color = "#b23a48";
  Side side = Side::left;
};

/// A shaded stretch of x (a mission phase) with a short label printed at its top.
struct Band {
  double x0 = 0.0, x1 = 0.0;
  std::string label;
};

struct LinePlot {
  std::string id;     ///< unique within the page: the data-plot attribute and internal ids
  std::string title;  ///< accessible title
  Axis x, y;
  std::optional<Axis> y2;          ///< a right-hand axis for Side::right lines and levels
  std::optional<double> y2_per_y;  ///< the right axis is the left one scaled (A and C-rate)
  std::vector<Line> lines;
  std::vector<Level> levels;
  std::vector<Band> bands;
  double width = 1200.0, height = 400.0;  ///< viewBox size; the page scales it to its column
  std::size_t max_points = 1500;          ///< per line, see thin()
  /// Keep a second axis's right margin without one, so that plots stacked on a page line up
  /// their x axes.
  bool right_margin = false;
};

std::string render(const LinePlot& p);

/// One bar of a horizontal bar chart.
struct Bar {
  std::string label;
  std::optional<double> value;  ///< none: no bar, only the text (e.g. "cannot fly")
  std::string value_text;       ///< printed beside the bar end, e.g. "+377 s"
  bool flagged = false;         ///< drawn hatched in the flag colour (a no-go pack)
  std::string flag_text;        ///< printed after the value, e.g. "NO-GO"
};

struct BarPlot {
  std::string id, title;
  Axis value;                 ///< the axis along the bars
  std::vector<Bar> bars;      ///< top to bottom
  std::vector<Level> levels;  ///< vertical reference lines at a value
  std::string color = "#0b6e8a";
  std::string flag_color = "#b23a48";
  double width = 1200.0;
  double row_height = 28.0;
};

std::string render(const BarPlot& p);

}  // namespace sortie::report::svg
