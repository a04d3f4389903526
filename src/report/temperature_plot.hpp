#pragma once
/// The cell temperature plot shared by the fly and discharge pages: one curve over time, the air
/// temperature as a level, and the usual 60 °C discharge limit when the run comes within 10 K of it.
#include <string>
#include <vector>

#include "report/svg_plot.hpp"

namespace sortie::report {

/// `x` is the page's time axis; `t` in that axis's unit, `temperature_C` per point.
svg::LinePlot cell_temperature_plot(const std::string& id, const std::string& title, const svg::Axis& x,
                                    std::vector<double> t, std::vector<double> temperature_C, double air_C,
                                    double max_C);

}  // namespace sortie::report
