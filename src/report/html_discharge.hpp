#pragma once
/// `sortie discharge --html`: loaded and open-circuit voltage with the state of charge over the
/// discharge, current and power, the summary figures, the Cautions box.
#include <string>

#include "battery/pack.hpp"
#include "sim/discharge.hpp"

namespace sortie::report {

/// The plots the discharge page draws, by their data-plot id, in page order.
inline constexpr const char* kDischargePlots[] = {"discharge-voltage-soc", "discharge-current-power"};

/// `spec` gives the cutoff and the SoC floor drawn as reference lines; `r` should carry a trace.
std::string discharge_html(const battery::Pack& pack, const std::string& load_label, const sim::DischargeSpec& spec,
                           const sim::DischargeResult& r);

}  // namespace sortie::report
