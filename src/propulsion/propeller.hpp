#pragma once
/// A fixed-pitch propeller described by its thrust and power coefficients over advance ratio
/// (docs/physics.md "Propulsion"), in the revolutions-per-second convention:
///   J = V / (n·D),  T = CT(J)·ρ·n²·D⁴,  P_shaft = CP(J)·ρ·n³·D⁵,  Q = P_shaft / (2π·n)
/// with n in rev/s, D in m, V the axial inflow speed in m/s (W. F. Durand's coefficients, as in
/// J. G. Leishman, Principles of Helicopter Aerodynamics, 2nd ed., 2006, and every propeller
/// test report). The tables are held flat beyond their ends, so J outside the table is an
/// extrapolation the data do not support.
#include "core/table.hpp"

namespace sortie::propulsion {

struct Prop {
  double diameter_m = 0.254;  ///< tip-to-tip diameter, m
  Table ct{0.1};              ///< thrust coefficient over advance ratio J (a number: static)
  Table cp{0.04};             ///< power coefficient over advance ratio J (a number: static)
  double mass_kg = 0.0;       ///< informational (docs/physics.md "Mass")

  /// Disc area π·D²/4, m².
  double disc_area_m2() const;
  /// The largest thrust coefficient in the table (bounds T(n) from above for any J).
  double ct_max() const;
  /// The largest J both tables cover (infinity when both are constants); beyond it the
  /// coefficients are held at their last values, an extrapolation.
  double j_covered_max() const;
  /// The smallest J both tables cover (0 when both are constants); below it the coefficients
  /// are held at their first values, an extrapolation.
  double j_covered_min() const;
  /// J outside [j_covered_min, j_covered_max].
  bool outside_tables(double advance_ratio) const {
    return advance_ratio > j_covered_max() || advance_ratio < j_covered_min();
  }
};

/// J = V / (n·D); 0 for a prop at rest (n = 0 and V = 0). For n → 0 with V > 0, J grows
/// without bound and the tables hold their last value.
double advance_ratio(const Prop& p, double n_rps, double v_axial_mps);

/// T = CT(J)·ρ·n²·D⁴, N.
double prop_thrust_N(const Prop& p, double n_rps, double v_axial_mps, double rho_kg_m3);

/// P_shaft = CP(J)·ρ·n³·D⁵, W.
double prop_power_W(const Prop& p, double n_rps, double v_axial_mps, double rho_kg_m3);

/// Ideal (momentum-theory) power of an actuator disc of the prop's area giving thrust T in
/// axial flow V: P_ideal = T·(V/2 + √((V/2)² + T/(2ρA))); in hover T^1.5/√(2ρA)
/// (Leishman 2006, ch. 2, climb and hover; any real propeller needs at least this).
double ideal_power_W(const Prop& p, double thrust_N, double v_axial_mps, double rho_kg_m3);

}  // namespace sortie::propulsion
