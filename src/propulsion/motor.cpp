#include "propulsion/motor.hpp"

#include <cmath>
#include <numbers>

namespace sortie::propulsion {

double Motor::kv_rad_per_s_per_V() const { return kv_rpm_per_V * 2.0 * std::numbers::pi / 60.0; }

double Motor::omega_ref_rad_s() const { return kv_rad_per_s_per_V() * (i0_ref_V - i0_A * rm_ohm); }

double Motor::i0_at(double omega_rad_s) const {
  if (i0_speed_exponent == 0.0) return i0_A;
  // I0(ω) = i0_A·(ω/ω_ref)^e; a motor at rest has no speed-dependent loss.
  if (omega_rad_s <= 0.0) return 0.0;
  return i0_A * std::pow(omega_rad_s / omega_ref_rad_s(), i0_speed_exponent);
}

MotorInput motor_input(const Motor& m, double omega_rad_s, double torque_Nm) {
  const double kv = m.kv_rad_per_s_per_V();
  MotorInput in;
  in.i_A = torque_Nm * kv + m.i0_at(omega_rad_s);  // Q = (I − I0)/Kv
  in.v_V = omega_rad_s / kv + in.i_A * m.rm_ohm;   // ω = (V − I·Rm)·Kv
  return in;
}

double motor_torque_Nm(const Motor& m, double v_V, double omega_rad_s) {
  const double kv = m.kv_rad_per_s_per_V();
  const double i = (v_V - omega_rad_s / kv) / m.rm_ohm;  // ω = (V − I·Rm)·Kv
  return (i - m.i0_at(omega_rad_s)) / kv;                // Q = (I − I0)/Kv
}

double motor_loss_W(const Motor& m, double omega_rad_s, double i_A) {
  // V·I − Q·ω = I²·Rm + I0·ω/Kv (copper loss plus the no-load loss at the back-EMF)
  return i_A * i_A * m.rm_ohm + m.i0_at(omega_rad_s) * omega_rad_s / m.kv_rad_per_s_per_V();
}

double motor_efficiency(const Motor& m, double v_V, double i_A) {
  if (!(v_V > 0.0) || !(i_A > 0.0)) return 0.0;
  const double kv = m.kv_rad_per_s_per_V();
  const double omega = (v_V - i_A * m.rm_ohm) * kv;
  if (omega <= 0.0) return 0.0;
  const double q = (i_A - m.i0_at(omega)) / kv;
  if (q <= 0.0) return 0.0;
  return q * omega / (v_V * i_A);
}

}  // namespace sortie::propulsion
