#include "propulsion/propeller.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numbers>

namespace sortie::propulsion {

double Prop::disc_area_m2() const { return std::numbers::pi * diameter_m * diameter_m / 4.0; }

double Prop::ct_max() const { return *std::max_element(ct.y().begin(), ct.y().end()); }

double Prop::j_covered_max() const {
  double j = std::numeric_limits<double>::infinity();
  if (!ct.is_constant()) j = std::min(j, ct.x().back());
  if (!cp.is_constant()) j = std::min(j, cp.x().back());
  return j;
}

double Prop::j_covered_min() const {
  double j = 0.0;
  if (!ct.is_constant()) j = std::max(j, ct.x().front());
  if (!cp.is_constant()) j = std::max(j, cp.x().front());
  return j;
}

double advance_ratio(const Prop& p, double n_rps, double v_axial_mps) {
  if (v_axial_mps == 0.0) return 0.0;
  // J = V/(n·D); at n = 0 with inflow, J is unbounded and the tables hold their last value.
  if (n_rps <= 0.0) return std::numeric_limits<double>::infinity();
  return v_axial_mps / (n_rps * p.diameter_m);
}

double prop_thrust_N(const Prop& p, double n_rps, double v_axial_mps, double rho_kg_m3) {
  const double J = advance_ratio(p, n_rps, v_axial_mps);
  const double D2 = p.diameter_m * p.diameter_m;
  // T = CT(J)·ρ·n²·D⁴
  return p.ct(J) * rho_kg_m3 * n_rps * n_rps * D2 * D2;
}

double prop_power_W(const Prop& p, double n_rps, double v_axial_mps, double rho_kg_m3) {
  const double J = advance_ratio(p, n_rps, v_axial_mps);
  const double D2 = p.diameter_m * p.diameter_m;
  // P = CP(J)·ρ·n³·D⁵
  return p.cp(J) * rho_kg_m3 * n_rps * n_rps * n_rps * D2 * D2 * p.diameter_m;
}

double ideal_power_W(const Prop& p, double thrust_N, double v_axial_mps, double rho_kg_m3) {
  // Momentum theory in axial flow: induced velocity v_i = −V/2 + √((V/2)² + T/(2ρA)),
  // P_ideal = T·(V + v_i).
  const double h = 0.5 * v_axial_mps;
  const double vh2 = thrust_N / (2.0 * rho_kg_m3 * p.disc_area_m2());
  return thrust_N * (h + std::sqrt(h * h + vh2));
}

}  // namespace sortie::propulsion
