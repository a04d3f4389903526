#pragma once
/// `sortie fly --html`: the verdict and the reserve rules first, then the pack's voltage and
/// charge, current and C-rate, cell temperature (with a thermal model), duty and efficiency over
/// the flight (from the trace), energy per phase, the phase table, the setup and the events; the
/// Cautions box last.
#include <string>
#include <iterator>
#include <string>
#include <vector>

#include "sim/mission.hpp"
#include "sim/turn_home.hpp"

namespace sortie::report {

/// The plots the fly page draws, by their data-plot id, in page order.
inline constexpr const char* kFlyPlots[] = {"fly-height", "fly-voltage-soc", "fly-current",
                                            "fly-duty-efficiency", "fly-energy-per-phase"};
/// The plot added after the current plot when the cell has a thermal model.
inline constexpr const char* kFlyThermalPlot = "fly-cell-temperature";
/// The plots of a fly page in order (data-plot ids).
inline std::vector<std::string> fly_plot_ids(bool thermal) {
  std::vector<std::string> ids(std::begin(kFlyPlots), std::end(kFlyPlots));
  if (thermal) ids.insert(ids.begin() + 3, kFlyThermalPlot);
  return ids;
}

/// The whole page. `r` should carry a trace (SimOptions::sample_s > 0); without one the time
/// plots say so and draw only the phase bands.
std::string fly_html(const sim::Mission& m, const sim::MissionResult& r, const sim::SpareResult& s,
                     const sim::TurnHome* home = nullptr, const std::string& overrides_html = "");

}  // namespace sortie::report
