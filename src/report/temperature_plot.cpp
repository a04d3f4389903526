#include "report/temperature_plot.hpp"

#include "battery/cell.hpp"
#include "core/text.hpp"

namespace sortie::report {

svg::LinePlot cell_temperature_plot(const std::string& id, const std::string& title, const svg::Axis& x,
                                    std::vector<double> t, std::vector<double> temperature_C, double air_C,
                                    double max_C) {
  svg::LinePlot p;
  p.id = id;
  p.title = title;
  p.right_margin = true;  // lines up with the plots above it, which have a right-hand axis
  p.x = x;
  p.y = {"cell temperature", "°C", {}, {}};
  p.lines = {svg::Line{"cell temperature", std::move(t), std::move(temperature_C), "#a33b20"}};
  p.levels.push_back({air_C, "air " + format_fixed(air_C, 1) + " °C", "#4f6d7a"});
  if (max_C > battery::kCellHotC - 10.0)
    p.levels.push_back({battery::kCellHotC, "usual discharge limit " + format_fixed(battery::kCellHotC, 0) + " °C",
                        "#b23a48"});
  return p;
}

}  // namespace sortie::report
