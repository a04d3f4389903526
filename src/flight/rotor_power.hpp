#pragma once
/// Shaft power of one multirotor rotor in any steady condition (hover, climb, descent, forward
/// flight), by momentum theory with a profile-power term, calibrated to the drive's own hover
/// power at the same thrust (J. G. Leishman, Principles of Helicopter Aerodynamics, 2nd ed.,
/// 2006, ch. 2 for hover and axial flight, ch. 5 for forward flight):
///
///   P = κ·T·v_i + T·V_n + P0·(1 + K·μ²)
///
/// - κ·T·v_i: induced power, v_i Glauert's inflow (flight/multirotor.hpp), κ the induced-power
///   factor;
/// - T·V_n: the power that moves air through the tilted disc, V_n = V·sin α + V_z·cos α. In
///   level flight T·sin α = D, so this is the parasite power D·V of the drag area; in a climb
///   it holds the climb power W·V_z;
/// - P0·(1 + K·μ²): profile power, rising with the advance ratio μ = V_e/(Ω·R), V_e the
///   edgewise speed, Ω·R the tip speed.
///
/// Calibration: the drive's static tables give the hover shaft power P_s(T) at the thrust T.
/// Its hover split is P_s = κ·T·v_h + P0, so P0 = P_s − κ·T·v_h and the model returns P_s
/// exactly in hover: the drive decides hover power, the model only how forward speed, climb and
/// descent change it. If P_s < κ·T·v_h (a figure of merit above 1/κ in the tables) there is no
/// room for profile power: κ is lowered to P_s/(T·v_h), P0 = 0, and the result says so.
///
/// Where this stops being valid: uniform inflow and a small-angle blade-element profile term
/// (μ up to about 0.3–0.4); inside the vortex-ring region the induced velocity is an estimate
/// (flagged by multirotor_steady). A result ≤ 0 means the air would drive the rotor (windmill
/// brake): no powered operating point.
namespace sortie::flight {

struct RotorPowerInput {
  double thrust_N = 0.0;        ///< one rotor, N
  double axial_mps = 0.0;       ///< V_n, m/s (climb positive)
  double edgewise_mps = 0.0;    ///< V_e, m/s
  double induced_mps = 0.0;     ///< Glauert v_i at this condition, m/s
  double hover_induced_mps = 0.0;  ///< v_h at this thrust, m/s
  double hover_shaft_W = 0.0;   ///< P_s(T): the drive's static shaft power at this thrust, W
  double tip_speed_mps = 0.0;   ///< Ω·R at that static point, m/s
  double induced_power_factor = 1.15;  ///< κ
  double profile_power_k = 4.65;       ///< K
};

struct RotorPower {
  double induced_W = 0.0;       ///< κ·T·v_i, W
  double inflow_W = 0.0;        ///< T·V_n (parasite and climb), W
  double profile_hover_W = 0.0; ///< P0, W
  double profile_W = 0.0;       ///< P0·(1 + K·μ²), W
  double shaft_W = 0.0;         ///< the sum, W
  double advance_ratio = 0.0;   ///< μ = V_e/(Ω·R)
  double induced_power_factor = 1.15;  ///< κ as used
  bool factor_lowered = false;  ///< κ lowered to fit the drive's hover power (see above)
};

RotorPower rotor_shaft_power(const RotorPowerInput& in);

}  // namespace sortie::flight
