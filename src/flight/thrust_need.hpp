#pragma once
/// One entry point over either airframe: the thrust each rotor must give and the free stream
/// through its disc in one steady flight condition (sim/drive_solve.hpp hands it to the drive).
#include <string>
#include <variant>

#include "flight/airframe.hpp"
#include "flight/atmosphere.hpp"
#include "flight/fixed_wing.hpp"
#include "flight/flight_status.hpp"
#include "flight/multirotor.hpp"

namespace sortie::flight {

struct FlightCondition {
  double mass_kg = 1.0;          ///< all-up mass (all_up_mass_kg), kg
  double density_kg_m3 = kSeaLevelDensity;  ///< from Atmosphere::at
  /// Multirotor: horizontal airspeed. Fixed wing: true airspeed along the path. m/s, ≥ 0.
  double airspeed_mps = 0.0;
  double climb_rate_mps = 0.0;   ///< vertical rate, climb positive, m/s
  int rotors = 1;                ///< from the drive
  double disk_area_m2 = 0.1;     ///< one rotor, from the drive (disk_area_m2(diameter)), m²
  double load_factor = 1.0;      ///< fixed wing: n = 1/cos φ of a coordinated turn
  bool drag_device = false;      ///< fixed wing: a descent steeper than the idle glide is allowed
};

struct ThrustNeed {
  FlightStatus status = FlightStatus::ok;
  std::string detail;              ///< warning or refusal with numbers; empty when ok
  double thrust_total_N = 0.0;
  double thrust_per_rotor_N = 0.0;
  double axial_mps = 0.0;          ///< free stream along the rotor axis (fixed wing: the prop's J speed), m/s
  std::variant<RotorDemand, WingDemand> demand;  ///< everything the airframe model worked out
};

/// Multirotor: multirotor_steady. Fixed wing: fixed_wing_steady, the thrust shared equally by
/// the drive's rotors.
ThrustNeed thrust_need(const Airframe& airframe, const FlightCondition& c);

}  // namespace sortie::flight
