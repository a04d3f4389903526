#include "sim/drive_solve.hpp"

#include <algorithm>
#include <cmath>
#include <numbers>

#include "core/text.hpp"

namespace sortie::sim {

namespace prop = propulsion;

namespace {

void note_current(const Mission& m, const prop::MotorPoint& mp, DriveSolve& out) {
  if (mp.status != prop::MotorStatus::over_current) return;
  const double lim = std::min(m.drive.motor.i_max_A, m.drive.esc.i_max_A);
  out.warnings.push_back("motor_over_current: motor current " + format_fixed(mp.i_motor_A, 1) + " A above the " +
                         format_fixed(lim, 1) + " A limit of the " + (mp.motor_over_current ? "motor" : "ESC"));
}

bool infeasible(const prop::MotorPoint& mp, double thrust, double axial, DriveSolve& out) {
  if (mp.status != prop::MotorStatus::infeasible) return false;
  out.why = "the drive has no operating point for " + format_fixed(thrust, 2) + " N per rotor at " +
            format_fixed(axial, 1) + " m/s axial speed";
  out.field = "kind";
  return true;
}

}  // namespace

DriveSolve solve_drive(const Mission& m, const flight::ThrustNeed& need, double rho) {
  DriveSolve out;
  out.thrust_N = need.thrust_per_rotor_N;
  const auto* rotor = std::get_if<flight::RotorDemand>(&need.demand);
  if (!rotor) {
    // Fixed wing: axial flow at the airspeed, the tables' own condition.
    out.drive_thrust_N = need.thrust_per_rotor_N;
    out.drive_axial_mps = need.axial_mps;
    out.motor = prop::solve_motor(m.drive, out.drive_thrust_N, out.drive_axial_mps, rho);
    if (infeasible(out.motor, out.drive_thrust_N, out.drive_axial_mps, out)) return out;
    if (out.motor.beyond_prop_table && out.motor.rpm > 0.0) {
      const prop::Prop& p = m.drive.prop;
      out.warnings.push_back("prop_table_range: advance ratio J = " + format_fixed(out.motor.advance_ratio, 3) +
                             " at " + format_fixed(need.axial_mps, 1) + " m/s is outside the prop tables (J " +
                             format_fixed(p.j_covered_min(), 3) + " to " + format_fixed(p.j_covered_max(), 3) +
                             "): the coefficients are held at the table's end, an extrapolation");
    }
    note_current(m, out.motor, out);
    out.ok = true;
    return out;
  }
  // Multirotor: the drive's static point at this thrust calibrates the momentum model.
  const auto& frame = std::get<flight::Multirotor>(m.airframe);
  const double T = need.thrust_per_rotor_N;
  const prop::MotorPoint hover = prop::solve_motor(m.drive, T, 0.0, rho);
  if (infeasible(hover, T, 0.0, out)) return out;
  flight::RotorPowerInput in;
  in.thrust_N = T;
  in.axial_mps = rotor->axial_mps;
  in.edgewise_mps = rotor->edgewise_mps;
  in.induced_mps = rotor->induced_mps;
  in.hover_induced_mps = rotor->hover_induced_mps;
  in.hover_shaft_W = hover.shaft_W;
  in.tip_speed_mps = hover.omega * 0.5 * m.drive.prop.diameter_m;  // Ω·R
  in.induced_power_factor = frame.induced_power_factor;
  in.profile_power_k = frame.profile_power_k;
  const flight::RotorPower rp = flight::rotor_shaft_power(in);
  out.rotor_power = rp;
  if (!(rp.shaft_W > 0.0)) {
    out.why = "at axial inflow " + format_fixed(rotor->axial_mps, 2) + " m/s the air would drive the rotors (" +
              format_fixed(rp.shaft_W, 1) + " W of shaft power per rotor, windmill-brake state): the drive has no "
              "powered operating point; descend slower";
    out.field = "rate_mps";
    return out;
  }
  if (rp.factor_lowered)
    out.warnings.push_back("rotor_calibration: the drive's hover power " + format_fixed(hover.shaft_W, 1) +
                           " W per rotor is below " + format_fixed(frame.induced_power_factor, 2) +
                           " × the ideal " + format_fixed(T * rotor->hover_induced_mps, 1) +
                           " W (figure of merit above 1/induced_power_factor): induced factor taken as " +
                           format_fixed(rp.induced_power_factor, 3) + " and no profile power");
  // Static-equivalent thrust: P_s ∝ T^1.5 at J = 0, so T_eq = T·(P/P_s)^(2/3).
  out.drive_thrust_N = T * std::pow(rp.shaft_W / hover.shaft_W, 2.0 / 3.0);
  out.drive_axial_mps = 0.0;
  out.motor = prop::solve_motor(m.drive, out.drive_thrust_N, 0.0, rho);
  if (infeasible(out.motor, out.drive_thrust_N, 0.0, out)) return out;
  note_current(m, out.motor, out);
  out.ok = true;
  return out;
}

}  // namespace sortie::sim
