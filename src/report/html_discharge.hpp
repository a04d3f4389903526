#pragma once
/// `sortie discharge --html`: loaded and open-circuit voltage with the state of charge over the
/// discharge, current and power, the cell temperature (with a thermal model), the summary
/// figures, the Cautions box.
#include <iterator>
#include <string>
#include <vector>

#include "battery/pack.hpp"
#include "sim/discharge.hpp"

namespace sortie::report {

/// The plots the discharge page draws, by their data-plot id, in page order.
inline constexpr const char* kDischargePlots[] = {"discharge-voltage-soc", "discharge-current-power"};
/// Added last when the cell has a thermal model.
inline constexpr const char* kDischargeThermalPlot = "discharge-cell-temperature";
inline std::vector<std::string> discharge_plot_ids(bool thermal) {
  std::vector<std::string> ids(std::begin(kDischargePlots), std::end(kDischargePlots));
  if (thermal) ids.push_back(kDischargeThermalPlot);
  return ids;
}

/// `spec` gives the cutoff and the SoC floor drawn as reference lines; `r` should carry a trace.
std::string discharge_html(const battery::Pack& pack, const std::string& load_label, const sim::DischargeSpec& spec,
                           const sim::DischargeResult& r);

}  // namespace sortie::report
