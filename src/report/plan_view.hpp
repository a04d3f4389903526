#pragma once
/// An offline plan view of a route (SVG inside an HTML page, no map tiles): the route drawn in
/// the local east/north plane of the take-off point, each stretch coloured by the state of charge
/// at its end, the home point, the turn-home point, the wind arrow and a scale bar.
#include <nlohmann/json.hpp>
#include <string>

#include "sim/mission.hpp"

namespace sortie::report {

/// The SVG of `route` (as report::route_geojson writes it).
std::string plan_view_svg(const nlohmann::json& route, const flight::Wind& wind);

/// The whole page: the plan view, the flight's figures and the cautions.
std::string plan_view_page(const nlohmann::json& route, const sim::Mission& m, const sim::MissionResult& r);

}  // namespace sortie::report
