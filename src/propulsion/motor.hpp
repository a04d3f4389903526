#pragma once
/// Brushless DC motor, first-order model (M. Drela, "First-Order DC Electric Motor Model",
/// MIT Aero & Astro, 2007): a back-EMF source ω/Kv behind the winding resistance Rm, and a
/// no-load current I0 that stands for the friction and iron losses.
///   ω = (V_m − I_m·Rm)·Kv          (Kv in rad/s per V)
///   Q = (I_m − I0)/Kv
///   P_shaft = Q·ω,  loss = I_m²·Rm + I0·ω/Kv
/// At a fixed terminal voltage V the efficiency η(I) = (1 − I0/I)·(1 − I·Rm/V) peaks at
/// I* = √(I0·V/Rm), where η* = (1 − √(I0·Rm/V))² (same source).
///
/// I0 is constant unless `i0_speed_exponent` e > 0 asks for a speed-dependent law:
///   I0(ω) = i0_A · (ω/ω_ref)^e,   ω_ref = Kv·(i0_ref_V − i0_A·Rm)
/// ω_ref is the no-load speed at which i0_A was measured (at i0_ref_V). e = 0: loss torque
/// independent of speed (bearing friction and hysteresis); e = 1: loss torque proportional to
/// speed (eddy currents, viscous drag); real motors sit between. The model does not cover
/// saturation of the magnetic circuit or heating of the winding (Rm is taken at one temperature).
namespace sortie::propulsion {

struct Motor {
  double kv_rpm_per_V = 400.0;    ///< speed constant, rpm per volt of back-EMF
  double rm_ohm = 0.1;            ///< winding resistance (phase-to-phase), Ω
  double i0_A = 0.5;              ///< no-load current at i0_ref_V, A
  double i0_ref_V = 10.0;         ///< voltage at which i0_A was measured, V
  double i_max_A = 20.0;          ///< continuous current limit, A
  double mass_kg = 0.0;           ///< informational
  double i0_speed_exponent = 0.0; ///< e in I0(ω) = i0_A·(ω/ω_ref)^e; 0: I0 constant

  /// Kv in rad/s per V: kv_rpm_per_V · 2π/60.
  double kv_rad_per_s_per_V() const;
  /// ω_ref = Kv·(i0_ref_V − i0_A·Rm), rad/s: the no-load speed where i0_A was measured.
  double omega_ref_rad_s() const;
  /// I0 at shaft speed ω (rad/s), A.
  double i0_at(double omega_rad_s) const;
};

/// The electrical side for a shaft speed and torque: I_m = Q·Kv + I0(ω), V_m = ω/Kv + I_m·Rm.
struct MotorInput {
  double i_A = 0.0;  ///< motor current, A
  double v_V = 0.0;  ///< motor terminal voltage (the ESC's output), V
};
MotorInput motor_input(const Motor& m, double omega_rad_s, double torque_Nm);

/// Shaft torque at terminal voltage V and speed ω: I = (V − ω/Kv)/Rm, Q = (I − I0(ω))/Kv, N·m.
double motor_torque_Nm(const Motor& m, double v_V, double omega_rad_s);

/// Losses in the motor at speed ω and current I: I²·Rm + I0(ω)·ω/Kv, W.
double motor_loss_W(const Motor& m, double omega_rad_s, double i_A);

/// Shaft power over electrical power at terminal voltage V and current I (speed from
/// ω = (V − I·Rm)·Kv); 0 where the shaft gives no power. With a constant I0 this is Drela's
/// η = (1 − I0/I)·(1 − I·Rm/V).
double motor_efficiency(const Motor& m, double v_V, double i_A);

}  // namespace sortie::propulsion
