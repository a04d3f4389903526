#pragma once
/// `sortie health --html`: the page of a state-of-health estimate. For each log the estimate used,
/// the logged pack voltage against the model's with the fitted factors and that log's start SoC;
/// the factors with their sd (joint, and each log alone when there are several); the logs table.
/// Numbers are marked data-key with their path in the JSON result `j`.
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "battery/pack.hpp"
#include "estimate/health.hpp"

namespace sortie::report {

/// At most this many logs get a voltage plot (the rest are in the tables); said on the page.
inline constexpr std::size_t kHealthPlotsMax = 12;

std::string health_html(const std::string& source, const battery::Pack& pack,
                        const std::vector<estimate::HealthFlight>& flights, const estimate::HealthEstimate& e,
                        const std::vector<estimate::HealthEstimate>& own, const nlohmann::json& j);

}  // namespace sortie::report
