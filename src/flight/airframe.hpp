#pragma once
/// Airframes as plain data (SI): what the aircraft weighs and how it makes drag and lift.
/// The rotor count and disk area come from the drive, not from here.
#include <optional>
#include <string>
#include <variant>

namespace sortie::flight {

/// A multirotor frame. Mass excludes the pack and the payload; it includes the drive.
struct Multirotor {
  std::string name;
  double mass_empty_kg = 1.0;   ///< airframe with its drive, without pack and payload, kg
  double payload_kg = 0.0;      ///< kg
  double cda_m2 = 0.05;         ///< drag area Cd·A for horizontal flight, m²
  /// Drag area for vertical climb and descent, m². Defaults to cda_m2 when not given; the
  /// frame's top view is usually larger than its front view, so give it when it is known.
  double cda_vertical_m2 = 0.05;
  /// Rotor download on the frame: the part of the rotors' thrust the wake pushes back down on
  /// the arms and body, as a fraction of the thrust (0 ≤ f < 0.5). Common practice puts it at a
  /// few percent for an open multirotor frame; 0.03 unless given. Held at every airspeed (the
  /// wake sweeps back off the frame in fast forward flight, so this errs toward more power).
  double download_fraction = 0.03;
  /// Induced-power factor κ of the rotors, P_i = κ·T·v_i: the excess of a real rotor's induced
  /// power over the ideal, from non-uniform inflow and tip losses. 1.15 is the usual value
  /// (J. G. Leishman, Principles of Helicopter Aerodynamics, 2nd ed., 2006, ch. 2 and 5; from
  /// memory).
  double induced_power_factor = 1.15;
  /// K in the profile power's growth with advance ratio, P0(μ) = P0·(1 + K·μ²); 4.65
  /// (Leishman 2006, ch. 5, forward-flight power; from memory). Some texts use 4.7 or 3.
  double profile_power_k = 4.65;
  std::optional<double> mtom_kg;  ///< maximum take-off mass, kg (none: not checked)
};

/// A fixed-wing aircraft with a parabolic drag polar CD = CD0 + CL²/(π·e·AR).
struct FixedWing {
  std::string name;
  double mass_empty_kg = 2.0;   ///< airframe with its drive, without pack and payload, kg
  double payload_kg = 0.0;      ///< kg
  double wing_area_m2 = 0.5;    ///< reference wing area S, m²
  double cd0 = 0.03;            ///< zero-lift drag coefficient
  double aspect_ratio = 8.0;    ///< AR = b²/S
  double oswald_e = 0.8;        ///< span efficiency, 0 < e ≤ 1
  double cl_max = 1.2;          ///< maximum lift coefficient (clean, at stall)
  std::optional<double> mtom_kg;  ///< maximum take-off mass, kg (none: not checked)
};

using Airframe = std::variant<Multirotor, FixedWing>;

/// All-up mass = mass_empty_kg + payload_kg + pack mass (docs/physics.md "Mass"), kg.
double all_up_mass_kg(const Airframe& a, double pack_mass_kg);
/// The maximum take-off mass the airframe states, kg (none: not given).
std::optional<double> mtom_kg(const Airframe& a);
/// "multirotor" or "fixed_wing" (the file's "kind").
const char* kind_name(const Airframe& a);
/// The airframe's name, possibly empty.
const std::string& name(const Airframe& a);

}  // namespace sortie::flight
