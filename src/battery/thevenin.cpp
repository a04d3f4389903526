#include "battery/thevenin.hpp"

#include <cmath>

namespace sortie::battery {

PackModel::PackModel(const Pack& p)
    : series(p.series),
      parallel(p.parallel),
      capacity_C(3600.0 * p.capacity_Ah()),
      v_max_cell_V(p.cell.v_max_V),
      i_cont_max_cell_A(p.cell.i_cont_max_A),
      ocv_cell_V(p.cell.ocv_V),
      n_rc(p.cell.rc.size()) {
  const double sp = static_cast<double>(p.series) / p.parallel;
  const double rf = p.cell.r_factor(p.temperature_C);
  // R0_pack = S/P·R0_cell·soh_resistance·r_factor(T) + R_wiring (docs/physics.md)
  Table r0 = p.cell.r0_ohm.scaled(sp * p.soh_resistance * rf);
  std::vector<double> y = r0.y();
  for (double& v : y) v += p.wiring_ohm;
  r0_pack_ohm = Table(r0.x(), y);
  for (std::size_t k = 0; k < 2; ++k) {
    if (k < n_rc) {
      r_pack_ohm[k] = p.cell.rc[k].r_ohm.scaled(sp * rf);  // R_k,pack = S/P·R_k,cell
      tau_s[k] = p.cell.rc[k].tau_s;                        // τ_k unchanged by S and P
    } else {
      r_pack_ohm[k] = Table(0.0);
      tau_s[k] = Table(1.0);
    }
  }
  if (p.cell.thermal) {
    thermal = true;
    wiring_ohm = p.wiring_ohm;
    t0_C = p.temperature_C;
    air_C = p.air_C.value_or(p.temperature_C);
    heat_capacity_J_per_K = p.cell.mass_kg * p.cell.thermal->c_J_per_kgK;
    hA_W_per_K = p.cell.thermal->hA_W_per_K;
    if (p.cell.temperature) r_factor_T = p.cell.temperature->r_factor;
    r_factor_t0 = r_factor_T(t0_C);
  } else {
    t0_C = p.temperature_C;
    air_C = p.temperature_C;
  }
}

Terminal solve_terminal(double emf_V, double r0_ohm, double ocv_V, const Demand& d, double t) {
  Terminal out;
  out.v_ocv_V = ocv_V;
  const double ramp = d.a + d.a_rate * (t - d.t0);
  if (d.kind == Demand::Kind::current) {
    out.current_A = ramp;
  } else {
    const double B = emf_V + d.b * r0_ohm;  // coefficient of I (with sign flipped)
    const double C = ramp + d.b * emf_V;    // constant term
    const double disc = B * B - 4.0 * r0_ohm * C;
    if (C > 0.0 && (B <= 0.0 || disc < 0.0)) {
      // No current delivers P: D < 0, or no EMF left at all (B ≤ 0; an integrator's trial
      // stage can put the RC voltages above the OCV, and there the other root 2C/(B + √D) is a
      // huge negative current that blows the state up). D is reported negative in both cases,
      // and continuous through B = 0, for the event locator; the current is the vertex
      // B/(2·R0) while there is an EMF, else none.
      out.collapsed = true;
      out.discriminant = B > 0.0 ? disc : -std::fabs(disc);
      out.current_A = B > 0.0 ? B / (2.0 * r0_ohm) : 0.0;
    } else if (C == 0.0) {
      out.discriminant = disc;
      out.current_A = 0.0;  // no power asked for (2C/(B + √D) would be 0/0 with B ≤ 0)
    } else if (r0_ohm <= 0.0) {
      out.current_A = C / B;  // R0 = 0: V = E, I = (a + b·E)/E; here B > 0 or C < 0
    } else {
      out.discriminant = disc;
      // Smaller root in a cancellation-free form: I = 2C / (B + √D); B + √D > 0 here (C < 0
      // makes √D exceed |B|).
      out.current_A = 2.0 * C / (B + std::sqrt(disc));
    }
  }
  out.v_terminal_V = emf_V - r0_ohm * out.current_A;
  out.power_W = out.v_terminal_V * out.current_A;
  return out;
}

Terminal Thevenin::terminal(const State& x, double t) const {
  const double soc = x[kSoc];
  const double ocv = pack.ocv_pack(soc);
  // E = S·OCV − v1 − v2 (docs/physics.md)
  const double emf = ocv - x[kV1] - x[kV2];
  return solve_terminal(emf, pack.r0_pack(soc, x[kTemp]), ocv, demand, t);
}

void Thevenin::operator()(const State& x, State& dxdt, double t) const {
  // Each table once per call: the RHS is the hot path (docs/style.md).
  const double soc = x[kSoc];
  const double rs = pack.r_scale(x[kTemp]);
  const double r0_table = pack.r0_pack_ohm(soc);
  const double r0 = pack.thermal ? (r0_table - pack.wiring_ohm) * rs + pack.wiring_ohm : r0_table;
  const double ocv = pack.ocv_pack(soc);
  const Terminal term = solve_terminal(ocv - x[kV1] - x[kV2], r0, ocv, demand, t);  // E = S·OCV − v1 − v2
  const double i = term.current_A;
  dxdt[kSoc] = -i / pack.capacity_C;  // dSoC/dt = −I / (3600·Q_Ah·P·soh)
  double heat = i * i * (r0 - pack.wiring_ohm);  // pack, W
  for (std::size_t k = 0; k < 2; ++k) {
    const std::size_t idx = kV1 + k;
    if (k < pack.n_rc) {
      const double tau = pack.tau_s[k](soc);
      const double r = pack.r_pack_ohm[k](soc) * rs;
      dxdt[idx] = (-x[idx] + i * r) / tau;  // dv/dt = −v/τ + I·R/τ
      heat += x[idx] * x[idx] / r;
    } else {
      dxdt[idx] = 0.0;
    }
  }
  dxdt[kCharge] = i;
  dxdt[kEnergy] = term.power_W;
  dxdt[kTemp] = pack.thermal ? (heat / (static_cast<double>(pack.series) * pack.parallel) -
                                pack.hA_W_per_K * (x[kTemp] - pack.air_C)) /
                                   pack.heat_capacity_J_per_K
                             : 0.0;
}

}  // namespace sortie::battery
