#include "flight/multirotor.hpp"

#include <cassert>
#include <cmath>
#include <cstdio>
#include <numbers>

#include "core/error.hpp"
#include "core/roots.hpp"
#include "core/text.hpp"
#include "flight/atmosphere.hpp"

namespace sortie::flight {

const char* to_string(RotorFlow f) {
  switch (f) {
    case RotorFlow::normal_working: return "normal_working";
    case RotorFlow::vortex_ring: return "vortex_ring";
    case RotorFlow::windmill_brake: return "windmill_brake";
  }
  return "?";
}

double disk_area_m2(double diameter_m) { return std::numbers::pi * diameter_m * diameter_m / 4.0; }

double hover_induced_velocity(double thrust_N, double density_kg_m3, double disk_area_m2) {
  // Momentum theory in hover: T = 2·ρ·A·v_h²  ⇒  v_h = √(T/(2ρA)).
  return std::sqrt(thrust_N / (2.0 * density_kg_m3 * disk_area_m2));
}

Inflow glauert_inflow(double thrust_N, double density_kg_m3, double disk_area_m2, double axial_mps,
                      double edgewise_mps) {
  assert(thrust_N > 0 && density_kg_m3 > 0 && disk_area_m2 > 0);
  const double vh = hover_induced_velocity(thrust_N, density_kg_m3, disk_area_m2);
  // Glauert: v_i·√(V_e² + (V_n + v_i)²) = T/(2ρA) = v_h². In units of v_h, with x = v_i/v_h,
  // a = V_n/v_h, e = V_e/v_h:  g(x) = x·√(e² + (a + x)²) − 1 = 0.
  const double a = axial_mps / vh, e = edgewise_mps / vh;
  auto g = [a, e](double x) { return x * std::hypot(e, a + x) - 1.0; };
  // Bracket per branch; g(0) = −1 always.
  RotorFlow flow = RotorFlow::normal_working;
  double lo = 0.0, hi = 1.0;  // a ≥ 0: g(1) = √(e² + (a+1)²) − 1 ≥ 0
  if (a <= -2.0) {
    // Windmill brake: g(−a/2) ≥ a²/4 − 1 ≥ 0; this bracket holds the root with V_n + v_i < 0.
    flow = RotorFlow::windmill_brake;
    hi = -a / 2.0;
  } else if (a < 0.0) {
    // Vortex-ring band: take the normal-working root above −a when there is one (the branch that
    // continues from hover); g(1 − a) = (1 − a)·√(e² + 1) − 1 ≥ 0.
    flow = RotorFlow::vortex_ring;
    if (g(-a) < 0.0) {
      lo = -a;
      hi = 1.0 - a;
    } else {
      hi = -a;
    }
  }
  // x to 1e-13: v_i to well under a micrometre per second for any small rotor.
  const auto x = find_root(g, lo, hi, g(lo), g(hi), 1e-13);
  // Each bracket above has a sign change by construction; only a non-finite input lands here.
  if (!x)
    throw LimitError("no induced-velocity root for thrust " + format_number(thrust_N) +
                     " N at axial speed " + format_number(axial_mps) + " m/s");
  return Inflow{*x * vh, flow};
}

bool in_vortex_ring_region(double horizontal_mps, double climb_rate_mps, double hover_induced_mps) {
  // Normalised descent rate z = −V_z/v_h and horizontal speed x = V/v_h (Wolkovitch 1972 box,
  // see the header).
  const double z = -climb_rate_mps / hover_induced_mps, x = horizontal_mps / hover_induced_mps;
  return z >= 0.28 && z <= 2.0 && x < 1.0;
}

RotorDemand multirotor_steady(const Multirotor& frame, double mass_kg, double density_kg_m3,
                              int rotors, double disk_area_m2, double airspeed_mps,
                              double climb_rate_mps) {
  assert(mass_kg > 0 && density_kg_m3 > 0 && rotors >= 1 && disk_area_m2 > 0 && airspeed_mps >= 0);
  RotorDemand d;
  const double rho = density_kg_m3, V = airspeed_mps, Vz = climb_rate_mps;
  d.weight_N = mass_kg * kStandardGravity;
  // Body drag, each direction with its own drag area: D = ½ρV²·CdA (opposes the horizontal
  // motion), D_z = ½ρ·V_z·|V_z|·CdA_v (downward in a climb, upward in a descent).
  d.drag_N = 0.5 * rho * V * V * frame.cda_m2;
  d.drag_vertical_N = 0.5 * rho * Vz * std::fabs(Vz) * frame.cda_vertical_m2;
  const double tx = d.drag_N;
  const double tz_net = d.weight_N + d.drag_vertical_N;
  if (!(tz_net > 0.0)) {
    d.status = FlightStatus::descent_too_fast;
    d.detail = "descent at " + format_fixed(-Vz, 2) + " m/s: vertical drag " + format_fixed(-d.drag_vertical_N, 2) +
               " N is above the weight " + format_fixed(d.weight_N, 2) +
               " N (the frame would fall slower than that)";
    return d;
  }
  // The wake pushes f of the rotors' vertical thrust back down on the frame:
  // T_z·(1 − f) = W + D_z.
  const double tz = tz_net / (1.0 - frame.download_fraction);
  d.download_N = tz - tz_net;
  // Thrust balances weight plus drag: T = √(T_x² + T_z²), tilted forward by α = atan(T_x/T_z).
  d.thrust_total_N = std::hypot(tx, tz);
  d.thrust_per_rotor_N = d.thrust_total_N / rotors;
  d.tilt_rad = std::atan2(tx, tz);
  // Free stream in disk axes (air moves at (−V, −V_z) relative to the frame; the disk normal
  // points up and forward, n = (sin α, cos α)): through the disk V_n = V·sin α + V_z·cos α,
  // along it V_e = V·cos α − V_z·sin α.
  const double sa = std::sin(d.tilt_rad), ca = std::cos(d.tilt_rad);
  d.axial_mps = V * sa + Vz * ca;
  d.edgewise_mps = std::fabs(V * ca - Vz * sa);
  d.hover_induced_mps = hover_induced_velocity(d.thrust_per_rotor_N, rho, disk_area_m2);
  const Inflow in = glauert_inflow(d.thrust_per_rotor_N, rho, disk_area_m2, d.axial_mps, d.edgewise_mps);
  d.induced_mps = in.induced_mps;
  d.flow = in.flow;
  // Ideal power of one rotor, momentum theory: P = T·(V_n + v_i) (Leishman 2006, ch. 2 and 5).
  d.ideal_power_per_rotor_W = d.thrust_per_rotor_N * (d.axial_mps + d.induced_mps);
  if (in_vortex_ring_region(V, Vz, d.hover_induced_mps)) {
    const double vh = d.hover_induced_mps;
    d.status = FlightStatus::vortex_ring;
    d.detail = "descent at " + format_fixed(-Vz, 2) + " m/s with airspeed " + format_fixed(V, 2) +
               " m/s is inside the vortex-ring region (descent " + format_fixed(0.28 * vh, 2) + " to " +
               format_fixed(2.0 * vh, 2) + " m/s below an airspeed of " + format_fixed(vh, 2) +
               " m/s, from the hover induced velocity): momentum theory does not hold, "
               "the power estimate is uncertain and the rotor may lose thrust; descend slower or "
               "with forward speed";
  }
  return d;
}

RotorDemand multirotor_hover(const Multirotor& frame, double mass_kg, double density_kg_m3,
                             int rotors, double disk_area_m2) {
  return multirotor_steady(frame, mass_kg, density_kg_m3, rotors, disk_area_m2, 0.0, 0.0);
}

RotorDemand multirotor_climb(const Multirotor& frame, double mass_kg, double density_kg_m3,
                             int rotors, double disk_area_m2, double rate_mps) {
  return multirotor_steady(frame, mass_kg, density_kg_m3, rotors, disk_area_m2, 0.0, rate_mps);
}

RotorDemand multirotor_descent(const Multirotor& frame, double mass_kg, double density_kg_m3,
                               int rotors, double disk_area_m2, double rate_mps) {
  return multirotor_steady(frame, mass_kg, density_kg_m3, rotors, disk_area_m2, 0.0, -rate_mps);
}

RotorDemand multirotor_forward(const Multirotor& frame, double mass_kg, double density_kg_m3,
                               int rotors, double disk_area_m2, double airspeed_mps) {
  return multirotor_steady(frame, mass_kg, density_kg_m3, rotors, disk_area_m2, airspeed_mps, 0.0);
}

}  // namespace sortie::flight
