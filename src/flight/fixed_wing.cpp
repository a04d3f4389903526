#include "flight/fixed_wing.hpp"

#include <cassert>
#include <cmath>
#include <cstdio>
#include <numbers>

#include "core/text.hpp"
#include "flight/atmosphere.hpp"

namespace sortie::flight {

double induced_drag_factor(const FixedWing& wing) {
  return 1.0 / (std::numbers::pi * wing.oswald_e * wing.aspect_ratio);
}

double stall_speed_mps(const FixedWing& wing, double mass_kg, double density_kg_m3) {
  // L = W at CL_max: ½ρV_s²·S·CL_max = W.
  return std::sqrt(2.0 * mass_kg * kStandardGravity / (density_kg_m3 * wing.wing_area_m2 * wing.cl_max));
}

WingSpeeds wing_speeds(const FixedWing& wing, double mass_kg, double density_kg_m3) {
  assert(mass_kg > 0 && density_kg_m3 > 0);
  WingSpeeds s;
  const double W = mass_kg * kStandardGravity, S = wing.wing_area_m2, rho = density_kg_m3;
  const double K = induced_drag_factor(wing), cd0 = wing.cd0;
  // Level flight, L = W: D(V) = ½ρV²S·CD0 + 2K·W²/(ρSV²), P(V) = D·V.
  // dD/dV = 0 ⇒ V⁴ = 4K·W²/(ρ²S²·CD0); dP/dV = 0 ⇒ V⁴ = 4K·W²/(3ρ²S²·CD0)  (Anderson 1999, ch. 5).
  const double v_ref = std::sqrt(2.0 * W / (rho * S));  // √(2W/(ρS)), the speed at CL = 1
  s.stall_mps = stall_speed_mps(wing, mass_kg, rho);
  s.min_drag_mps = v_ref * std::pow(K / cd0, 0.25);
  s.min_power_mps = v_ref * std::pow(K / (3.0 * cd0), 0.25);
  s.cl_min_drag = std::sqrt(cd0 / K);
  s.cl_min_power = std::sqrt(3.0 * cd0 / K);
  s.ld_max = 1.0 / (2.0 * std::sqrt(K * cd0));
  s.drag_min_N = W / s.ld_max;
  // At V_mp, CD = CD0 + K·3CD0/K = 4·CD0, so D = W·4CD0/CL.
  s.power_min_W = W * (4.0 * cd0 / s.cl_min_power) * s.min_power_mps;
  s.min_power_below_stall = s.cl_min_power > wing.cl_max;
  s.min_drag_below_stall = s.cl_min_drag > wing.cl_max;
  return s;
}

double glide_angle_rad(const FixedWing& wing, double mass_kg, double density_kg_m3, double airspeed_mps,
                       double load_factor) {
  const double W = mass_kg * kStandardGravity, q = 0.5 * density_kg_m3 * airspeed_mps * airspeed_mps;
  const double S = wing.wing_area_m2, K = induced_drag_factor(wing);
  // γ ← asin(D(γ)/W), D = q·S·(CD0 + K·CL²), CL = n·W·cos γ/(q·S); 60 iterations reach
  // machine precision for any glide shallower than 60°, and a steeper one is no glide.
  double gamma = 0.0;
  for (int k = 0; k < 60; ++k) {
    const double cl = load_factor * W * std::cos(gamma) / (q * S);
    const double s = q * S * (wing.cd0 + K * cl * cl) / W;
    if (!(s < 1.0)) return std::numbers::pi / 2.0;
    gamma = std::asin(s);
  }
  return gamma;
}

double turn_radius_m(double airspeed_mps, double bank_rad) {
  return airspeed_mps * airspeed_mps / (kStandardGravity * std::tan(bank_rad));
}

double bank_for_radius_rad(double airspeed_mps, double radius_m) {
  return std::atan(airspeed_mps * airspeed_mps / (kStandardGravity * radius_m));
}

WingDemand fixed_wing_steady(const FixedWing& wing, double mass_kg, double density_kg_m3,
                             double airspeed_mps, double climb_rate_mps, double load_factor,
                             bool drag_device) {
  assert(mass_kg > 0 && density_kg_m3 > 0);
  WingDemand d;
  const double rho = density_kg_m3, V = airspeed_mps, Vz = climb_rate_mps, S = wing.wing_area_m2;
  d.weight_N = mass_kg * kStandardGravity;
  d.stall_speed_mps = stall_speed_mps(wing, mass_kg, rho);
  d.load_factor = load_factor;
  d.stall_speed_turn_mps = d.stall_speed_mps * std::sqrt(load_factor);  // V_s·√n
  d.axial_mps = V;
  if (!(V > 0.0)) {
    d.status = FlightStatus::below_stall;
    d.detail = "a fixed wing cannot fly at airspeed " + format_fixed(V, 2) + " m/s (stall speed " +
               format_fixed(d.stall_speed_mps, 2) + " m/s)";
    return d;
  }
  if (!(std::fabs(Vz) < V)) {
    d.status = FlightStatus::climb_too_steep;
    d.detail = "vertical rate " + format_fixed(Vz, 2) + " m/s is not below the airspeed " + format_fixed(V, 2) +
               " m/s: no flight path has that slope";
    return d;
  }
  d.gamma_rad = std::asin(Vz / V);
  d.q_Pa = 0.5 * rho * V * V;
  d.lift_N = load_factor * d.weight_N * std::cos(d.gamma_rad);  // L = n·W·cos γ
  d.cl = d.lift_N / (d.q_Pa * S);                 // CL = L/(qS)
  if (d.cl > wing.cl_max) {
    d.status = FlightStatus::below_stall;
    d.detail = "airspeed " + format_fixed(V, 2) + " m/s is below the stall speed " +
               format_fixed(d.stall_speed_turn_mps, 2) + " m/s" +
               (load_factor > 1.0 ? " in the turn (load factor " + format_fixed(load_factor, 2) + ")" : "") +
               " (needs CL " + format_fixed(d.cl, 2) + ", cl_max " + format_fixed(wing.cl_max, 2) + ")";
    return d;
  }
  // The margin over stall, V ≥ kStallMargin·V_s·√n (a hair of rounding allowed, so that a
  // phase flown at exactly the margin passes).
  if (V < kStallMargin * d.stall_speed_turn_mps * (1.0 - 1e-12)) {
    d.status = FlightStatus::stall_margin;
    d.detail = "airspeed " + format_fixed(V, 2) + " m/s is below " + format_fixed(kStallMargin, 1) +
               " × the stall speed " + format_fixed(d.stall_speed_turn_mps, 2) + " m/s" +
               (load_factor > 1.0 ? " in the turn (load factor " + format_fixed(load_factor, 2) + ")" : "") +
               ", the planning margin over stall (needs at least " +
               format_fixed(kStallMargin * d.stall_speed_turn_mps, 2) + " m/s)";
    return d;
  }
  d.cd = wing.cd0 + induced_drag_factor(wing) * d.cl * d.cl;  // CD = CD0 + CL²/(π·e·AR)
  d.drag_N = d.q_Pa * S * d.cd;                               // D = q·S·CD
  d.lift_to_drag = d.lift_N / d.drag_N;
  const double thrust = d.drag_N + d.weight_N * std::sin(d.gamma_rad);  // T = D + W·sin γ
  if (thrust <= 0.0) {
    // Steeper than the idle glide: W·sin|γ| > D, the excess energy has to go into a drag device.
    constexpr double kDeg = 180.0 / std::numbers::pi;
    d.glide_angle_rad = glide_angle_rad(wing, mass_kg, rho, V, load_factor);
    const std::string angles = "descent angle " + format_fixed(-d.gamma_rad * kDeg, 1) + " deg (" +
                               format_fixed(-Vz, 2) + " m/s at " + format_fixed(V, 2) +
                               " m/s) is steeper than the idle glide angle " +
                               format_fixed(d.glide_angle_rad * kDeg, 1) + " deg at that airspeed";
    if (!drag_device) {
      d.status = FlightStatus::steeper_than_glide;
      d.detail = angles + " (L/D " + format_fixed(d.lift_to_drag, 1) +
                 "): descend slower, fly faster, or mark the phase \"drag_device\": true";
      return d;
    }
    d.status = FlightStatus::no_thrust_needed;
    d.detail = angles + ": the drag device takes the excess " + format_fixed(-thrust, 2) +
               " N; thrust taken as 0 (idle)";
    d.thrust_N = 0.0;
  } else {
    d.thrust_N = thrust;
  }
  d.power_required_W = d.thrust_N * V;
  return d;
}

}  // namespace sortie::flight
