#include "report/route_geojson.hpp"

#include <algorithm>
#include <cmath>

#include "battery/thevenin.hpp"

namespace sortie::report {

namespace {

using nlohmann::json;

json point(const geo::LonLat& p) { return {{"type", "Point"}, {"coordinates", {p.lon_deg, p.lat_deg}}}; }

/// Round for the file: 1e-8° is about 1 mm on the ground.
double deg8(double v) { return std::round(v * 1e8) / 1e8; }

}  // namespace

json route_geojson(const geo::LonLat& start, const std::vector<plan::PlannedPhase>& planned, const sim::Mission& m,
                   const sim::MissionResult& r, const sim::TurnHome& th) {
  json features = json::array();
  json line = json::array();
  line.push_back({deg8(start.lon_deg), deg8(start.lat_deg)});
  for (const auto& p : planned) {
    json c = {deg8(p.end.lon_deg), deg8(p.end.lat_deg)};
    if (c != line.back()) line.push_back(c);
  }
  features.push_back({{"type", "Feature"},
                      {"properties", {{"role", "route"}, {"name", m.name}}},
                      {"geometry", {{"type", "LineString"}, {"coordinates", line}}}});
  const double s = static_cast<double>(m.pack.series);
  for (std::size_t i = 0; i < planned.size() && i < r.phases.size(); ++i) {
    const sim::PhaseSummary& ps = r.phases[i];
    if (!ps.flown) break;
    // The last trace row of the phase: the state at its end.
    const sim::TracePoint* last = nullptr;
    for (const auto& t : r.trace)
      if (t.phase == static_cast<int>(i)) last = &t;
    json props = {{"role", "waypoint"}, {"phase", i + 1}, {"label", ps.label}, {"kind", flight::to_string(ps.kind)},
                  {"time_s", ps.start_s + ps.duration_s}, {"height_m", ps.height_end_m}};
    if (last != nullptr) {
      props["soc"] = last->s.x[battery::kSoc];
      props["v_load_cell_V"] = last->s.term.v_terminal_V / s;
      props["energy_used_Wh"] = last->s.x[battery::kEnergy] / 3600.0;
      props["charge_used_Ah"] = last->s.x[battery::kCharge] / 3600.0;
    }
    features.push_back({{"type", "Feature"}, {"properties", props}, {"geometry", point(planned[i].end)}});
  }
  if (th.point && th.point_phase && *th.point_phase < planned.size()) {
    // Where along its phase: the phase runs from the previous phase's end to its own, at the
    // time fraction into it (a straight leg at a steady ground speed).
    const std::size_t i = *th.point_phase;
    const geo::LonLat a = i == 0 ? start : planned[i - 1].end, b = planned[i].end;
    const double dur = i < r.phases.size() ? r.phases[i].duration_s : 0.0;
    const double into = th.point->t_s - (i < r.phases.size() ? r.phases[i].start_s : 0.0);
    const double f = dur > 0.0 ? std::clamp(into / dur, 0.0, 1.0) : 1.0;
    const geo::Inverse leg = geo::inverse(a, b);
    const geo::LonLat at = leg.distance_m > 0.0 ? geo::direct(a, leg.azi1_deg, f * leg.distance_m) : a;
    features.push_back({{"type", "Feature"},
                        {"properties",
                         {{"role", "turn_home"}, {"phase", i + 1}, {"time_s", th.point->t_s}, {"soc", th.point->soc},
                          {"v_load_cell_V", th.point->v_load_cell_V}, {"binding_rule", th.binding_rule},
                          {"note", "the latest moment to turn home: after it a rule fails on the way back"}}},
                        {"geometry", point(at)}});
  }
  return {{"type", "FeatureCollection"}, {"features", features}};
}

}  // namespace sortie::report
