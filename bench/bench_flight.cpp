// Flight-layer benchmarks: the per-condition work the mission simulator repeats (atmosphere,
// wind triangle, thrust need with Glauert's inflow root).
#include "bench.hpp"
#include "flight/atmosphere.hpp"
#include "flight/thrust_need.hpp"
#include "flight/wind.hpp"

namespace {

using namespace sortie;

flight::Multirotor quad() {
  flight::Multirotor m;
  m.mass_empty_kg = 1.6;
  m.payload_kg = 0.3;
  m.cda_m2 = 0.055;
  m.cda_vertical_m2 = 0.055;
  return m;
}

// 1000 forward-flight conditions from 0 to 20 m/s: one Glauert root each.
const bool reg_mr = bench::add_case("flight_multirotor_forward_x1000", [] {
  static const flight::Airframe a = quad();
  flight::FlightCondition c;
  c.mass_kg = 2.4;
  c.rotors = 4;
  c.disk_area_m2 = flight::disk_area_m2(0.381);
  double sum = 0.0;
  for (int i = 0; i < 1000; ++i) {
    c.airspeed_mps = 0.02 * i;
    sum += flight::thrust_need(a, c).thrust_per_rotor_N;
  }
  bench::keep(sum);
});

// 1000 fixed-wing conditions, 9 to 25 m/s (closed form, no root).
const bool reg_fw = bench::add_case("flight_fixed_wing_x1000", [] {
  static const flight::Airframe a = flight::FixedWing{"", 2.1, 0.2, 0.55, 0.028, 9.0, 0.8, 1.2};
  flight::FlightCondition c;
  c.mass_kg = 2.8;
  double sum = 0.0;
  for (int i = 0; i < 1000; ++i) {
    c.airspeed_mps = 9.0 + 0.016 * i;
    sum += flight::thrust_need(a, c).thrust_total_N;
  }
  bench::keep(sum);
});

// 1000 atmosphere states and wind legs.
const bool reg_env = bench::add_case("flight_atmosphere_and_leg_x1000", [] {
  const flight::Atmosphere atm{400.0, 5.0};
  const flight::Wind w{6.0, 250.0};
  double sum = 0.0;
  for (int i = 0; i < 1000; ++i) {
    sum += atm.at(0.5 * i)->density_kg_m3;
    sum += flight::solve_leg(w, 0.36 * i, 12.0).ground_speed_mps;
  }
  bench::keep(sum);
});

}  // namespace
