#include "flight/rotor_power.hpp"

#include <cassert>

namespace sortie::flight {

RotorPower rotor_shaft_power(const RotorPowerInput& in) {
  assert(in.thrust_N > 0 && in.hover_induced_mps > 0 && in.tip_speed_mps > 0);
  RotorPower p;
  const double T = in.thrust_N;
  // Hover split of the drive's own power: P_s = κ·T·v_h + P0.
  double kappa = in.induced_power_factor;
  const double ideal_hover = T * in.hover_induced_mps;
  if (in.hover_shaft_W < kappa * ideal_hover) {
    kappa = in.hover_shaft_W / ideal_hover;
    p.factor_lowered = true;
  }
  p.induced_power_factor = kappa;
  p.profile_hover_W = in.hover_shaft_W - kappa * ideal_hover;
  // μ = V_e/(Ω·R); P0(μ) = P0·(1 + K·μ²) (Leishman 2006, ch. 5).
  p.advance_ratio = in.edgewise_mps / in.tip_speed_mps;
  p.profile_W = p.profile_hover_W * (1.0 + in.profile_power_k * p.advance_ratio * p.advance_ratio);
  p.induced_W = kappa * T * in.induced_mps;  // P_i = κ·T·v_i
  p.inflow_W = T * in.axial_mps;             // T·V_n: D·V in level flight, W·V_z in a climb
  p.shaft_W = p.induced_W + p.inflow_W + p.profile_W;
  return p;
}

}  // namespace sortie::flight
