#pragma once
/// The drive's operating point for one steady flight condition: how the airframe's need is
/// handed to the propeller → motor → ESC chain (propulsion/operating_point.hpp).
///
/// Fixed wing: the propeller works in axial flow at the airspeed, which its CT(J), CP(J) tables
/// describe, so the drive is solved at the thrust needed and that axial speed.
///
/// Multirotor: the rotors work edgewise, which axial tables do not describe. The shaft power
/// comes from the momentum model of flight/rotor_power.hpp, calibrated to the drive's static
/// point at the same thrust (P_s(T), Ω·R). The drive is then solved at the static-equivalent
/// thrust T_eq whose static shaft power equals that power. With static coefficients
/// (T = CT0·ρn²D⁴, P = CP0·ρn³D⁵, J = 0) P_s ∝ T^1.5, so
///   T_eq = T·(P/P_s(T))^(2/3)
/// and the motor sees the shaft power P at the speed and torque the prop's static curve gives
/// for it: the drive chain, not the flight model, decides the motor current, the duty, the ESC
/// loss and the bus power. The speed is the static one for that power; the real rotor in
/// forward flight turns at a slightly different speed for the same power, which moves the
/// motor's efficiency a little (a first-order DC motor's efficiency is flat near its best
/// point), not the power.
#include <optional>
#include <string>
#include <vector>

#include "flight/rotor_power.hpp"
#include "flight/thrust_need.hpp"
#include "propulsion/operating_point.hpp"
#include "sim/mission.hpp"

namespace sortie::sim {

struct DriveSolve {
  bool ok = false;
  std::string why;                    ///< the refusal, with numbers, when not ok
  std::string field;                  ///< the phase field at fault when not ok
  std::vector<std::string> warnings;  ///< "kind: text" lines for the mission's events
  propulsion::MotorPoint motor;       ///< the point the drive was solved at
  double thrust_N = 0.0;              ///< per rotor, as the airframe needs it, N
  double drive_thrust_N = 0.0;        ///< per rotor, as the drive was solved (T_eq for a multirotor), N
  double drive_axial_mps = 0.0;       ///< axial speed the drive was solved at, m/s
  std::optional<flight::RotorPower> rotor_power;  ///< multirotor only
};

/// Solve the drive for `need` (from flight::thrust_need) in air of density `rho`.
DriveSolve solve_drive(const Mission& m, const flight::ThrustNeed& need, double rho);

}  // namespace sortie::sim
