#pragma once
/// `sortie fly --html`: the verdict and the reserve rules first, then the pack's voltage and
/// charge, current and C-rate, duty and efficiency over the flight (from the trace), energy per
/// phase, the phase table, the setup and the events; the Cautions box last.
#include <string>

#include "sim/mission.hpp"

namespace sortie::report {

/// The plots the fly page draws, by their data-plot id, in page order.
inline constexpr const char* kFlyPlots[] = {"fly-voltage-soc", "fly-current", "fly-duty-efficiency",
                                            "fly-energy-per-phase"};

/// The whole page. `r` should carry a trace (SimOptions::sample_s > 0); without one the time
/// plots say so and draw only the phase bands.
std::string fly_html(const sim::Mission& m, const sim::MissionResult& r, const sim::SpareResult& s);

}  // namespace sortie::report
