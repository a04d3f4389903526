#pragma once
/// The pack model as a discrete-time system over log rows, shared by the health fit and the SoC
/// filter. Row k's current I_k flows over (t_{k−1}, t_k] and is constant there:
///   SoC_k = SoC_{k−1} − I_k·Δt / (c·C_rated)
///   v_i,k = a_i·v_i,k−1 + R_i·(1 − a_i)·I_k,   a_i = e^{−Δt/τ_i}   (exact for a constant current)
///   T_k   = T_{k−1} + Δt·(q − hA·(T_{k−1} − T_air)) / (m·c_p)        (explicit, one step per row;
///           q the per-cell heat of battery/thevenin.hpp; the cell's thermal block only)
///   V_k   = S·OCV(SoC_k) − v_1,k − v_2,k − (r·R0_cells(SoC_k)·s(T_k) + R_wiring)·I_k
/// with R_i and τ_i taken at the SoC and temperature at the start of the row, s(T) the cell's
/// resistance factor relative to the start temperature, c and r the capacity and R0 factors.
#include "battery/thevenin.hpp"

namespace sortie::estimate {

struct StepState {
  double soc = 1.0, v1 = 0.0, v2 = 0.0, temp_C = 25.0;
};

/// The pack with its soh factors set to 1: the model a PackStep is built on.
inline battery::Pack unit_soh(battery::Pack p) {
  p.soh_capacity = 1.0;
  p.soh_resistance = 1.0;
  return p;
}

struct PackStep {
  /// `model` built with soh factors 1 (unit_soh; the factors below replace them).
  const battery::PackModel& model;
  double c = 1.0;  ///< capacity factor
  double r = 1.0;  ///< R0 factor

  StepState start(double soc0) const { return {soc0, 0.0, 0.0, model.t0_C}; }
  /// Decay factors a_i and input gains R_i·(1 − a_i) of the RC pairs over Δt at state x.
  void rc_gains(const StepState& x, double dt, double a[2], double g[2]) const;
  void advance(StepState& x, double current_A, double dt) const;
  double r0(const StepState& x) const;
  double voltage(const StepState& x, double current_A) const;
  /// ∂V/∂SoC at fixed current (the OCV slope less the change of R0·I), per unit SoC.
  double dv_dsoc(const StepState& x, double current_A) const;
  double capacity_C() const { return model.capacity_C * c; }
};

}  // namespace sortie::estimate
