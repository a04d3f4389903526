#pragma once
/// How a steady flight condition came out: fine, fine with a warning, or refused. These are
/// results (STYLE.md rule 7): the caller decides whether a refused condition ends a mission.
namespace sortie::flight {

enum class FlightStatus {
  ok,
  /// Warning: a multirotor descending through its own wake (−2·v_h < axial speed < 0). Momentum
  /// theory does not hold there; the induced velocity is an estimate, the real flow unsteady.
  vortex_ring,
  /// Note: a fixed wing descending more steeply than it glides at this airspeed; the thrust
  /// needed came out ≤ 0 and is reported as 0 (idle).
  no_thrust_needed,
  /// Refused: the lift coefficient needed is above cl_max (or the airspeed is 0).
  below_stall,
  /// Refused: a fixed wing asked to climb or sink at least as fast as it flies.
  climb_too_steep,
  /// Refused: a multirotor's vertical drag alone exceeds its weight at this descent rate.
  descent_too_fast,
};

/// True for the statuses that give no usable flight condition.
constexpr bool refused(FlightStatus s) {
  return s == FlightStatus::below_stall || s == FlightStatus::climb_too_steep ||
         s == FlightStatus::descent_too_fast;
}

constexpr const char* to_string(FlightStatus s) {
  switch (s) {
    case FlightStatus::ok: return "ok";
    case FlightStatus::vortex_ring: return "vortex_ring";
    case FlightStatus::no_thrust_needed: return "no_thrust_needed";
    case FlightStatus::below_stall: return "below_stall";
    case FlightStatus::climb_too_steep: return "climb_too_steep";
    case FlightStatus::descent_too_fast: return "descent_too_fast";
  }
  return "?";
}

}  // namespace sortie::flight
