#pragma once
/// How a steady flight condition came out: fine, fine with a warning, or refused. These are
/// results (docs/style.md rule 7): the caller decides whether a refused condition ends a mission.
namespace sortie::flight {

enum class FlightStatus {
  ok,
  /// Warning: a multirotor descending into its own wake (the descent rate and horizontal speed
  /// of flight::in_vortex_ring_region). Momentum theory does not hold there; the induced
  /// velocity is an estimate, the real flow unsteady.
  vortex_ring,
  /// Note: a fixed wing descending more steeply than it glides at idle, with a drag device (the
  /// phase says "drag_device": true) taking the excess; the thrust is 0 (idle).
  no_thrust_needed,
  /// Refused: a fixed wing asked to descend more steeply than its idle glide at this airspeed,
  /// with no drag device; the energy would have to go somewhere the model does not have.
  steeper_than_glide,
  /// Refused: the airspeed is below the stall-speed margin (kStallMargin × the stall speed in
  /// the turn, V_s·√n).
  stall_margin,
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
         s == FlightStatus::descent_too_fast || s == FlightStatus::steeper_than_glide ||
         s == FlightStatus::stall_margin;
}

constexpr const char* to_string(FlightStatus s) {
  switch (s) {
    case FlightStatus::ok: return "ok";
    case FlightStatus::vortex_ring: return "vortex_ring";
    case FlightStatus::no_thrust_needed: return "no_thrust_needed";
    case FlightStatus::below_stall: return "below_stall";
    case FlightStatus::climb_too_steep: return "climb_too_steep";
    case FlightStatus::descent_too_fast: return "descent_too_fast";
    case FlightStatus::steeper_than_glide: return "steeper_than_glide";
    case FlightStatus::stall_margin: return "stall_margin";
  }
  return "?";
}

}  // namespace sortie::flight
