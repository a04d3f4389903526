#pragma once
/// The best-speed line of `fly`'s text and its JSON object (sim/best_speeds.hpp).
#include <optional>
#include <string>

#include <nlohmann/json.hpp>

#include "sim/best_speeds.hpp"

namespace sortie::report {

/// "endurance 8.4 m/s (212 W), range 12.3 m/s (236 W, 188 m/Wh); into a 5.0 m/s headwind: …"
std::string best_speeds_line(const sim::BestSpeeds& calm, const std::optional<sim::BestSpeeds>& headwind);

/// {"endurance_mps", "endurance_W", "range_mps", "range_W", "range_m_per_Wh", …}
nlohmann::json best_speeds_json(const sim::BestSpeeds& b);

}  // namespace sortie::report
