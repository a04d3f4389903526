#pragma once
/// Electronic speed controller: a PWM stage that presents V_m = d·V_bus to the motor
/// (d ≤ duty_max) and loses
///   loss = P_idle + R_on·I_m² + k_switch·V_bus·I_m
/// (docs/physics.md "Propulsion"). The conduction term is the motor current through the
/// on-resistance of the conducting switches; the switching term grows with the voltage switched
/// and the current carried, not with the duty, while the power delivered does, so ESC
/// efficiency falls at low duty (common practice; the model has no dead-time, gate-drive or
/// temperature terms, and it does not regenerate).
namespace sortie::propulsion {

struct Esc {
  double r_on_ohm = 0.01;   ///< effective on-resistance of the conducting path, Ω
  double k_switch = 0.02;   ///< switching-loss coefficient: W per (V_bus · A), dimensionless
  double p_idle_W = 0.3;    ///< logic, gate drive and BEC draw with the motor stopped, W
  double duty_max = 0.98;   ///< highest duty the controller delivers, 0..1
  double i_max_A = 30.0;    ///< continuous motor-side current limit, A
  double mass_kg = 0.0;     ///< informational
};

/// P_idle + R_on·I_m² + k_switch·V_bus·I_m, W.
double esc_loss_W(const Esc& e, double v_bus_V, double i_motor_A);

}  // namespace sortie::propulsion
