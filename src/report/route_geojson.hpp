#pragma once
/// The flown route as GeoJSON (RFC 7946) for any GIS viewer: the route as a LineString, each
/// phase end as a Point with the simulation's prediction there (time, state of charge, loaded
/// cell voltage, energy and charge used), and the turn-home point as a Point.
#include <nlohmann/json.hpp>
#include <vector>

#include "plan/legs.hpp"
#include "sim/mission.hpp"
#include "sim/turn_home.hpp"

namespace sortie::report {

/// `planned[i]` is phase i of `m` with its end point; `start` is the take-off point.
nlohmann::json route_geojson(const geo::LonLat& start, const std::vector<plan::PlannedPhase>& planned,
                             const sim::Mission& m, const sim::MissionResult& r, const sim::TurnHome& th);

}  // namespace sortie::report
