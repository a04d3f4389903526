#pragma once
/// The operating point of one rotor: the thrust it must give, at an axial airspeed and air
/// density, turned into motor speed, current and voltage (bus-independent), then into duty,
/// ESC loss and bus power at a bus voltage (docs/physics.md "Propulsion").
///
/// Motor side (solve_motor): n from T = CT(V/(n·D))·ρ·n²·D⁴ by a bracketed root finder
/// (TOMS 748, core/roots.hpp); then Q = CP·ρ·n²·D⁵/(2π), I_m = Q·Kv + I0(ω),
/// V_m = ω/Kv + I_m·Rm (Drela 2007). Nothing here depends on the bus voltage.
///
/// Bus side (at_bus): d = V_m/V_bus; ESC loss = P_idle + R_on·I_m² + k_sw·V_bus·I_m;
/// P_bus = V_m·I_m + ESC loss; I_bus = P_bus/V_bus. A demand with d > d_max is saturated: the
/// point is still reported at the thrust asked for (never clamped), with the thrust that d_max
/// gives. A motor current above the motor's or the ESC's limit is flagged over_current.
///
/// Everything is per rotor; the drive draws `rotors` times the bus power.
#include <optional>

#include "core/constants.hpp"
#include "propulsion/drive.hpp"

namespace sortie::propulsion {

/// Standard gravity, for grams-force in g/W.
using core::kStandardGravity;

enum class MotorStatus {
  ok,
  over_current,  ///< I_m above motor.i_max_A or esc.i_max_A (the point is still computed)
  infeasible     ///< no operating point: the prop would drive the motor (windmilling), or the
                 ///< thrust is beyond any speed the prop tables reach
};

enum class BusStatus {
  ok,
  saturated,     ///< needs d > duty_max at this bus voltage (see thrust_available_N)
  over_current,  ///< as MotorStatus::over_current (saturation, when both, is reported first)
  infeasible     ///< the motor side has no operating point
};

const char* to_string(MotorStatus s);
const char* to_string(BusStatus s);

/// The motor side of one rotor's operating point; independent of the bus voltage.
struct MotorPoint {
  double thrust_N = 0.0;      ///< thrust of this rotor, N (as asked, or produced by at_duty)
  double v_axial_mps = 0.0;   ///< axial inflow speed, m/s
  double rho_kg_m3 = core::kSeaLevelDensity;  ///< air density, kg/m³
  double advance_ratio = 0.0; ///< J = V/(n·D)
  bool beyond_prop_table = false;  ///< J outside the tables' range: coefficients held at the end
  double rpm = 0.0;           ///< shaft speed, rev/min
  double omega = 0.0;         ///< shaft speed, rad/s
  double torque = 0.0;        ///< shaft torque, N·m
  double shaft_W = 0.0;       ///< shaft power Q·ω, W
  double i_motor_A = 0.0;     ///< motor current, A
  double v_motor_V = 0.0;     ///< motor terminal voltage (mean ESC output), V
  double motor_loss_W = 0.0;  ///< I_m²·Rm + I0·ω/Kv, W
  double eta_motor = 0.0;     ///< shaft_W / (V_m·I_m); 0 with the motor off
  MotorStatus status = MotorStatus::ok;
  bool motor_over_current = false;  ///< I_m > motor.i_max_A
  bool esc_over_current = false;    ///< I_m > esc.i_max_A
  /// When over current: the thrust at which I_m reaches the lower of the two limits, N.
  std::optional<double> thrust_at_current_limit_N;
};

/// The bus side at one bus voltage.
struct BusPoint {
  double v_bus_V = 0.0;     ///< bus voltage, V
  double duty = 0.0;        ///< d = V_m/V_bus (above duty_max when saturated)
  double esc_loss_W = 0.0;  ///< P_idle + R_on·I_m² + k_sw·V_bus·I_m, W
  double bus_W = 0.0;       ///< V_m·I_m + ESC loss, W
  double bus_A = 0.0;       ///< bus_W / V_bus, A
  double eta_motor = 0.0;   ///< shaft / (V_m·I_m)
  double eta_esc = 0.0;     ///< V_m·I_m / bus_W
  double eta_system = 0.0;  ///< shaft / bus_W = eta_motor·eta_esc
  double g_per_W = 0.0;     ///< thrust in grams-force per bus watt
  BusStatus status = BusStatus::ok;
  bool saturated = false;
  bool over_current = false;
  /// When saturated: the thrust this rotor gives at duty_max at this bus voltage, N.
  std::optional<double> thrust_available_N;
};

struct OperatingPoint {
  MotorPoint motor;
  BusPoint bus;
};

/// Motor-side solve for a thrust per rotor (N; ≤ 0 means the motor is off: everything 0),
/// axial airspeed (m/s, ≥ 0) and air density (kg/m³, > 0). Never throws for a valid drive;
/// an impossible point is status infeasible.
MotorPoint solve_motor(const Drive& d, double thrust_N_per_rotor, double v_axial_mps,
                       double rho_kg_m3);

/// Bus-side step at bus voltage v_bus_V (> 0). A point solved at exactly duty_max is not
/// saturated (the comparison allows 1e-9 relative, for rounding and root-finder tolerance).
BusPoint at_bus(const Drive& d, const MotorPoint& m, double v_bus_V);

/// Both sides at once.
OperatingPoint solve(const Drive& d, double thrust_N_per_rotor, double v_axial_mps,
                     double rho_kg_m3, double v_bus_V);

/// The inverse: duty d (0..1; above duty_max is computed and reported saturated) at bus voltage
/// V_bus. With V_m = d·V_bus, ω solves Q_motor(V_m, ω) = Q_prop(ω), Q_motor = ((V_m − ω/Kv)/Rm −
/// I0(ω))/Kv, by TOMS 748 on [0, Kv·V_m]; then I_m = (V_m − ω/Kv)/Rm and T = CT·ρ·n²·D⁴.
/// A duty too low to overcome the no-load torque leaves the motor stalled (ω = 0, T = 0).
OperatingPoint at_duty(const Drive& d, double duty, double v_axial_mps, double rho_kg_m3,
                       double v_bus_V);

/// The thrust per rotor at duty_max at this bus voltage, N (0 when infeasible).
double thrust_available(const Drive& d, double v_axial_mps, double rho_kg_m3, double v_bus_V);

/// Per-rotor bus power as an exact linear function of the bus voltage for a motor point:
///   P_bus(V) = V_m·I_m + P_idle + R_on·I_m² + k_sw·V·I_m = a_W + b_W_per_V·V
/// with a = V_m·I_m + P_idle + R_on·I_m² and b = k_sw·I_m (battery::Demand::power takes
/// rotors·a + avionics and rotors·b). The drive draws rotors·(a + b·V).
struct BusLoad {
  double a_W = 0.0;
  double b_W_per_V = 0.0;
  double power_W(double v_bus_V) const { return a_W + b_W_per_V * v_bus_V; }
};
BusLoad bus_load(const Drive& d, const MotorPoint& m);

}  // namespace sortie::propulsion
