#include "flight/thrust_need.hpp"

#include <cassert>

namespace sortie::flight {

ThrustNeed thrust_need(const Airframe& airframe, const FlightCondition& c) {
  assert(c.rotors >= 1);
  ThrustNeed n;
  if (const auto* m = std::get_if<Multirotor>(&airframe)) {
    RotorDemand d = multirotor_steady(*m, c.mass_kg, c.density_kg_m3, c.rotors, c.disk_area_m2,
                                      c.airspeed_mps, c.climb_rate_mps);
    n.status = d.status;
    n.detail = d.detail;
    n.thrust_total_N = d.thrust_total_N;
    n.thrust_per_rotor_N = d.thrust_per_rotor_N;
    n.axial_mps = d.axial_mps;
    n.demand = std::move(d);
  } else {
    WingDemand d = fixed_wing_steady(std::get<FixedWing>(airframe), c.mass_kg, c.density_kg_m3,
                                     c.airspeed_mps, c.climb_rate_mps, c.load_factor, c.drag_device);
    n.status = d.status;
    n.detail = d.detail;
    n.thrust_total_N = d.thrust_N;
    n.thrust_per_rotor_N = d.thrust_N / c.rotors;
    n.axial_mps = d.axial_mps;
    n.demand = std::move(d);
  }
  return n;
}

}  // namespace sortie::flight
