#include "estimate/pack_step.hpp"

#include <cmath>

namespace sortie::estimate {

void PackStep::rc_gains(const StepState& x, double dt, double a[2], double g[2]) const {
  const double s = model.r_scale(x.temp_C);
  for (std::size_t p = 0; p < 2; ++p) {
    if (p < model.n_rc) {
      a[p] = std::exp(-dt / model.tau_s[p](x.soc));
      g[p] = model.r_pack_ohm[p](x.soc) * s * (1.0 - a[p]);
    } else {
      a[p] = 0.0;
      g[p] = 0.0;
    }
  }
}

void PackStep::advance(StepState& x, double i, double dt) const {
  double a[2], g[2];
  rc_gains(x, dt, a, g);
  const double s = model.r_scale(x.temp_C);
  if (model.thermal) {
    // Heat of the row at its start state (explicit step): I²·R0_cells + Σ v_k²/R_k, per cell.
    double heat = i * i * (model.r0_pack_ohm(x.soc) - model.wiring_ohm) * r * s;
    const double vk[2] = {x.v1, x.v2};
    for (std::size_t p = 0; p < model.n_rc; ++p) {
      const double rk = model.r_pack_ohm[p](x.soc) * s;
      if (rk > 0.0) heat += vk[p] * vk[p] / rk;
    }
    const double per_cell = heat / (model.series * model.parallel);
    x.temp_C += dt * (per_cell - model.hA_W_per_K * (x.temp_C - model.air_C)) / model.heat_capacity_J_per_K;
  }
  x.v1 = a[0] * x.v1 + g[0] * i;
  x.v2 = a[1] * x.v2 + g[1] * i;
  x.soc -= i * dt / capacity_C();
}

double PackStep::r0(const StepState& x) const {
  return (model.r0_pack_ohm(x.soc) - model.wiring_ohm) * r * model.r_scale(x.temp_C) + model.wiring_ohm;
}

double PackStep::voltage(const StepState& x, double i) const {
  return model.ocv_pack(x.soc) - x.v1 - x.v2 - r0(x) * i;
}

double PackStep::dv_dsoc(const StepState& x, double i) const {
  const double dr0 = model.r0_pack_ohm.slope(x.soc) * r * model.r_scale(x.temp_C);
  return model.series * model.ocv_cell_V.slope(x.soc) - dr0 * i;
}

}  // namespace sortie::estimate
