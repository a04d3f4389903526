// The RC pairs of a cold pack: resistances scaled by the cell's r_factor(T), time constants not,
// against the closed form of a current step and of the relaxation after it.
#include <doctest/doctest.h>

#include <cmath>

#include "battery/thevenin.hpp"
#include "sim/segment.hpp"
#include "support/cells.hpp"

using namespace sortie;

TEST_SUITE("battery") {

TEST_CASE("a cold 4S2P pack under a current step: every resistance times r_factor(T) and tau unchanged") {
  // Circuit theory for a first-order RC pair under a current step I from rest (G. Plett,
  // Battery Management Systems, Vol. I, 2015, ch. 2, the Thevenin model):
  //   v_k(t) = I·R_k·(1 − e^(−t/τ_k)),   V(t) = S·OCV − I·R0 − v_1 − v_2
  // and, the current removed at t1, v_k(t) = v_k(t1)·e^(−(t − t1)/τ_k).
  // Pack level (docs/physics.md): R_k,pack = S/P·R_k,cell·r_factor(T), R0 likewise (plus the
  // wiring), τ_k unchanged by S, P and temperature. At −10 °C the cell's table gives 3.2
  // (an invented table, the shape of the demo cells'). Flat OCV: the SoC does not enter.
  const double ocv = 3.7, R0 = 0.004, R1 = 0.0012, tau1 = 6.0, R2 = 0.0018, tau2 = 90.0;
  battery::Cell c = test::analytic_cell(5.0, ocv, 0.0, R0, {{Table(R1), Table(tau1)}, {Table(R2), Table(tau2)}});
  c.temperature = battery::TemperatureEffect{Table({-10.0, 0.0, 25.0}, {3.2, 2.1, 1.0}), Table({-10.0, 25.0}, {0.8, 1.0})};
  battery::Pack p = test::single(c);
  p.series = 4;
  p.parallel = 2;
  p.wiring_ohm = 0.003;
  p.temperature_C = -10.0;
  const double rf = 3.2, sp = 4.0 / 2.0;
  const double r0_pack = sp * R0 * rf + 0.003, r1 = sp * R1 * rf, r2 = sp * R2 * rf;
  const battery::PackModel m(p);

  const double I = 30.0, t1 = 200.0;
  sim::SegmentOptions o;
  o.t_end = t1;
  o.sample_s = 1.0;
  const auto step = sim::run_segment(m, battery::Demand::current(I), 0.0, m.initial_state(1.0), {}, o);
  REQUIRE(step.samples.size() >= 200);
  double worst_v = 0.0, worst_rc = 0.0;
  for (const auto& s : step.samples) {
    const double v1 = I * r1 * (1.0 - std::exp(-s.t / tau1)), v2 = I * r2 * (1.0 - std::exp(-s.t / tau2));
    const double v_ref = 4.0 * ocv - I * r0_pack - v1 - v2;
    worst_v = std::max(worst_v, std::fabs(s.term.v_terminal_V - v_ref) / v_ref);
    if (s.t > 1.0) {
      worst_rc = std::max(worst_rc, std::fabs(s.x[battery::kV1] - v1) / v1);
      worst_rc = std::max(worst_rc, std::fabs(s.x[battery::kV2] - v2) / v2);
    }
  }
  // Integrator tolerances (1e-10) keep the dense output far inside 1e-6 relative; a factor
  // dropped on any one resistance moves V by I·ΔR ≈ 0.1 V on 14.8 V (7e-3) and its RC voltage
  // by a factor 3.2.
  CHECK(worst_v < 1e-6);
  CHECK(worst_rc < 1e-6);
  MESSAGE("step: worst relative error V " << worst_v << ", RC voltages " << worst_rc);

  // Relaxation: each RC voltage decays with its own τ_k, whatever its resistance.
  const double v1_t1 = I * r1 * (1.0 - std::exp(-t1 / tau1)), v2_t1 = I * r2 * (1.0 - std::exp(-t1 / tau2));
  o.t_end = t1 + 300.0;
  o.next_sample_t = t1;
  const auto rest = sim::run_segment(m, battery::Demand::current(0.0), t1, step.end.x, {}, o);
  REQUIRE(rest.samples.size() >= 300);
  double worst_rest = 0.0;
  for (const auto& s : rest.samples) {
    const double v_ref = 4.0 * ocv - v1_t1 * std::exp(-(s.t - t1) / tau1) - v2_t1 * std::exp(-(s.t - t1) / tau2);
    worst_rest = std::max(worst_rest, std::fabs(s.term.v_terminal_V - v_ref) / v_ref);
  }
  CHECK(worst_rest < 1e-6);
  // The slow pair's voltage 100 s into the rest, v2(t1)·e^(−100/τ2), to 1e-6 relative.
  const auto at = [&](double t) {
    for (const auto& s : rest.samples)
      if (std::fabs(s.t - t) < 1e-9) return s.x[battery::kV2];
    return -1.0;
  };
  CHECK(at(t1 + 100.0) == doctest::Approx(v2_t1 * std::exp(-100.0 / tau2)).epsilon(1e-6));
}

TEST_CASE("a pack at the reference temperature of its table is unscaled — and between knots the factor interpolates") {
  // r_factor is linear between the table's knots (core/table): at 5 °C, between 0 °C (2.1) and
  // 25 °C (1.0), it is 2.1 − 1.1·5/25 = 1.88.
  battery::Cell c = test::analytic_cell(5.0, 3.7, 0.0, 0.004, {{Table(0.0012), Table(6.0)}, {Table(0.0018), Table(90.0)}});
  c.temperature = battery::TemperatureEffect{Table({-10.0, 0.0, 25.0}, {3.2, 2.1, 1.0}), Table(1.0)};
  battery::Pack p = test::single(c);
  p.temperature_C = 25.0;
  const battery::PackModel warm(p);
  CHECK(warm.r_pack_ohm[0](0.5) == doctest::Approx(0.0012).epsilon(1e-12));
  CHECK(warm.r_pack_ohm[1](0.5) == doctest::Approx(0.0018).epsilon(1e-12));
  p.temperature_C = 5.0;
  const battery::PackModel mild(p);
  const double rf = 2.1 - 1.1 * 5.0 / 25.0;
  CHECK(mild.r0_pack_ohm(0.5) == doctest::Approx(0.004 * rf).epsilon(1e-12));
  CHECK(mild.r_pack_ohm[0](0.5) == doctest::Approx(0.0012 * rf).epsilon(1e-12));
  CHECK(mild.r_pack_ohm[1](0.5) == doctest::Approx(0.0018 * rf).epsilon(1e-12));
  CHECK(mild.tau_s[0](0.5) == doctest::Approx(6.0).epsilon(1e-12));
  CHECK(mild.tau_s[1](0.5) == doctest::Approx(90.0).epsilon(1e-12));
}

}  // TEST_SUITE
