#pragma once
/// `sortie remaining --html`: the filtered state of charge with its ±1 sd band over the whole log
/// (the cut marked; rows after it are the filter run on, for comparison), the logged voltage
/// against the filter's prediction, and the time left to each reserve rule at the present power.
/// Numbers are marked data-key with their path in the JSON result `j`.
#include <nlohmann/json.hpp>
#include <string>

#include "estimate/soc_filter.hpp"
#include "sim/flight_check.hpp"

namespace sortie::report {

std::string remaining_html(const std::string& log_file, const std::string& profile_file, const sim::MeasuredFlight& log,
                           const estimate::Remaining& r, const estimate::FilterResult& whole, const nlohmann::json& j);

}  // namespace sortie::report
