#pragma once
/// Thrust a fixed wing needs in steady flight, and its characteristic airspeeds, from the
/// parabolic drag polar (J. D. Anderson Jr., Aircraft Performance and Design, 1999, ch. 5):
///   q = ½·ρ·V²,  L = W·cos γ,  CL = L/(q·S),  CD = CD0 + K·CL²,  K = 1/(π·e·AR),
///   D = q·S·CD,  T = D + W·sin γ
/// Thrust is taken along the flight path (thrust line aligned with the velocity, small angle of
/// attack), so the propeller's axial speed is the airspeed. Valid below stall only; a polar
/// fitted for cruise is less accurate near cl_max, and the wing's own induced drag is the only
/// lift-dependent drag (no trim or propeller-wash terms).
#include <string>

#include "flight/airframe.hpp"
#include "flight/flight_status.hpp"

namespace sortie::flight {

/// The stall-speed margin: a phase must fly at least this many times the stall speed in its
/// condition (V_s·√n in a turn). 1.2·V_s is common practice for planning (approach and loiter
/// margins of 1.2–1.3·V_s); below it a gust or a steeper bank stalls the wing.
inline constexpr double kStallMargin = 1.2;

/// Induced-drag factor K = 1/(π·e·AR).
double induced_drag_factor(const FixedWing& wing);

/// Level-flight stall speed V_s = √(2·W/(ρ·S·CL_max)), m/s.
double stall_speed_mps(const FixedWing& wing, double mass_kg, double density_kg_m3);

/// The airspeeds that matter for endurance and range, in level flight at one mass and density.
struct WingSpeeds {
  double stall_mps = 0.0;      ///< V_s
  /// Minimum power required (best endurance for a propeller aircraft at constant efficiency):
  ///   V_mp = √(2W/(ρS))·(K/(3·CD0))^(1/4),  CL = √(3·CD0/K)
  double min_power_mps = 0.0;
  /// Minimum drag, maximum L/D (best glide and, for an electric propeller aircraft, best range):
  ///   V_md = √(2W/(ρS))·(K/CD0)^(1/4),  CL = √(CD0/K)
  double min_drag_mps = 0.0;
  double cl_min_power = 0.0;
  double cl_min_drag = 0.0;
  double ld_max = 0.0;         ///< (L/D)max = 1/(2·√(K·CD0)) = ½·√(π·e·AR/CD0)
  double power_min_W = 0.0;    ///< D·V at V_mp, W
  double drag_min_N = 0.0;     ///< D at V_md, N
  /// These speeds come from the polar alone; for a lightly loaded wing they can lie below stall,
  /// where the aircraft cannot fly them. The flags say so; the caller picks a margin over V_s.
  bool min_power_below_stall = false;
  bool min_drag_below_stall = false;
};
WingSpeeds wing_speeds(const FixedWing& wing, double mass_kg, double density_kg_m3);

/// What a fixed wing needs at one steady condition.
struct WingDemand {
  FlightStatus status = FlightStatus::ok;
  std::string detail;              ///< the refusal or note with numbers; empty when ok
  double weight_N = 0.0;
  double q_Pa = 0.0;               ///< dynamic pressure, Pa
  double gamma_rad = 0.0;          ///< flight-path angle, sin γ = V_z/V
  double cl = 0.0;
  double cd = 0.0;
  double lift_N = 0.0;
  double drag_N = 0.0;
  double thrust_N = 0.0;           ///< D + W·sin γ, or 0 when that is ≤ 0 with a drag device (no_thrust_needed)
  double power_required_W = 0.0;   ///< T·V, W
  double lift_to_drag = 0.0;
  double stall_speed_mps = 0.0;    ///< level-flight V_s at this mass and density
  double load_factor = 1.0;        ///< n = 1/cos φ in a coordinated turn
  double stall_speed_turn_mps = 0.0;  ///< V_s·√n
  double glide_angle_rad = 0.0;    ///< idle glide angle at this airspeed (set when it matters)
  double axial_mps = 0.0;          ///< the propeller's axial speed: the airspeed V, m/s
};

/// Steady flight at true airspeed V along a path climbing at `climb_rate_mps` (negative sinks),
/// in a coordinated turn of load factor n = 1/cos φ (1: straight):
///   L = n·W·cos γ, so the induced drag grows with n² at the same airspeed.
/// Refused: V ≤ 0 or CL > cl_max (below_stall, naming the stall speed), V below kStallMargin ×
/// V_s·√n (stall_margin), |V_z| ≥ V (climb_too_steep), a descent steeper than the idle glide
/// (steeper_than_glide, naming both angles) unless `drag_device`, when the thrust is 0 and the
/// status no_thrust_needed. The thrust, and so the shaft power, is never negative.
WingDemand fixed_wing_steady(const FixedWing& wing, double mass_kg, double density_kg_m3,
                             double airspeed_mps, double climb_rate_mps, double load_factor = 1.0,
                             bool drag_device = false);

/// Idle glide angle at airspeed V and load factor n: γ_g > 0 with W·sin γ_g = D(L = n·W·cos γ_g),
/// by fixed-point iteration (a contraction: D changes little with cos γ), rad.
double glide_angle_rad(const FixedWing& wing, double mass_kg, double density_kg_m3, double airspeed_mps,
                       double load_factor = 1.0);

/// Turn radius of a coordinated level turn r = V²/(g·tan φ), m, and its inverse
/// φ = atan(V²/(g·r)), rad.
double turn_radius_m(double airspeed_mps, double bank_rad);
double bank_for_radius_rad(double airspeed_mps, double radius_m);

}  // namespace sortie::flight
