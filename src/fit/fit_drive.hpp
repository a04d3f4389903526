#pragma once
/// `fit drive`: a drive model (propulsion::Drive) from a static throttle-step bench test of one
/// rotor: motor Kv, Rm and I0, the ESC losses (idle, on-resistance, switching) and the static
/// CT and CP of the prop, by bounded Levenberg–Marquardt (fit/levenberg_marquardt).
///
/// The model is the one `sortie drive` and `sortie fly` run (docs/physics.md "Propulsion"),
/// at J = 0 with a constant I0, and with the ESC's duty following the throttle command as
/// `sortie drive` reads it, d = duty_max·throttle/100 (a linear throttle response, common
/// practice on a bench with the ESC's throttle curve left linear; duty_max 1 unless given):
///   V_m = d·V_bus;  Q = CP·ρ·n²·D⁵/(2π);  I_m = I0 + Kv·Q;  ω = (V_m − I_m·Rm)·Kv
///   so ω solves Kv²·Rm·c·ω² + ω − Kv·(V_m − Rm·I0) = 0, c = CP·ρ·D⁵/(2π)³   (a stalled motor
///   below V_m = Rm·I0: ω = 0, I_m = V_m/Rm)
///   T = CT·ρ·n²·D⁴;  P_bus = V_m·I_m + P_idle + R_on·I_m² + k_sw·V_bus·I_m
/// (M. Drela, "First-Order DC Electric Motor Model", MIT, 2007, for the motor; the ESC loss law
/// is docs/physics.md's). Residuals are relative, in per cent of each measured value: rpm, thrust and
/// bus power at every row (bus power alone at rows where the motor stands), and shaft torque
/// when the bench measures it.
#include <optional>
#include <string>
#include <vector>

#include "fit/levenberg_marquardt.hpp"
#include "propulsion/bench_map.hpp"
#include "propulsion/drive.hpp"

namespace sortie::fit {

struct DriveFitOptions {
  double diameter_m = 0.0;      ///< prop diameter, m (needed for CT and CP)
  int rotors = 1;               ///< rotors of the drive written
  /// Air density on the bench, kg/m³; none: ISA sea level, and the notes say it was assumed.
  std::optional<double> rho_kg_m3;
  std::string name;             ///< default: "drive fitted from <file>"
  std::string file;             ///< the bench file, for names and messages
  std::optional<double> motor_i_max_A;
  std::optional<double> esc_i_max_A;
  std::optional<double> duty_max;  ///< the ESC's highest duty (default 1: throttle 100 % = full duty)
  int max_iterations = 400;
};

/// One bench row beside what the fitted drive gives at its throttle and bus voltage.
struct DrivePointFit {
  propulsion::BenchRow measured;
  double rpm = 0.0;
  double thrust_N = 0.0;
  double bus_W = 0.0;
  double bus_A = 0.0;
  double torque_Nm = 0.0;
  double eta_model = 0.0;     ///< shaft over bus power (model)
  double eta_measured = 0.0;  ///< Q·ω / P_bus (NaN without torque)
  double g_per_W_model = 0.0;
  double g_per_W_measured = 0.0;
  bool running = true;        ///< the motor turns in the measurement
  double err_rpm_pct = 0.0;   ///< (model − measured)/measured, %
  double err_thrust_pct = 0.0;
  double err_power_pct = 0.0;
  double err_torque_pct = 0.0;  ///< NaN without torque
};

/// One fitted parameter with its standard error (Gauss–Newton covariance σ²·(JᵀJ)⁻¹ of the log
/// parameters, so relative).
struct DriveParameter {
  std::string name;   ///< "Kv", "Rm", "I0", "P_idle", "R_on", "k_switch", "CT", "CP"
  std::string unit;   ///< as shown: "rpm/V", "ohm", "A", "W", "ohm", "", "", ""
  double value = 0.0; ///< in that unit
  double se_rel = 0.0;
  bool at_bound = false;
};

struct DriveFitResult {
  propulsion::Drive drive;
  std::vector<DriveParameter> parameters;
  std::string note;
  std::vector<DrivePointFit> points;
  bool has_torque = false;
  double rms_rpm_pct = 0.0, rms_thrust_pct = 0.0, rms_power_pct = 0.0, rms_torque_pct = 0.0;
  double max_power_pct = 0.0;   ///< largest |bus power error|, %
  int iterations = 0;
  LmStatus status = LmStatus::converged;
  std::vector<std::string> notes;
  std::vector<std::string> warnings;
};

/// Throws InputError for a bench that cannot give a drive (fewer than four running rows, or
/// rows that do not spread over throttle).
DriveFitResult fit_drive(const propulsion::BenchMap& bench, const DriveFitOptions& opts);

}  // namespace sortie::fit
