// Thevenin pack model: closed-form checks of the dynamics and the terminal solve.
#include "battery/thevenin.hpp"

#include <doctest/doctest.h>

#include <cmath>

#include "sim/discharge.hpp"
#include "sim/segment.hpp"
#include "support/cells.hpp"

using namespace sortie;

TEST_SUITE("battery") {

TEST_CASE("one-RC cell under a current step follows the closed form") {
  // Circuit theory (e.g. G. Plett, Battery Management Systems, Vol. I, 2015, ch. 2): for a
  // current step I at t = 0 from rest, with flat OCV,
  //   V(t) = OCV − I·R0 − I·R1·(1 − e^(−t/τ)).
  const double ocv = 3.7, I = 10.0, R0 = 0.010, R1 = 0.005, tau = 20.0;
  battery::Cell c = test::analytic_cell(5.0, ocv, 0.0, R0, {{Table(R1), Table(tau)}});
  const battery::PackModel m(test::single(c));
  sim::SegmentOptions o;
  o.t_end = 120.0;
  o.sample_s = 0.5;
  auto res = sim::run_segment(m, battery::Demand::current(I), 0.0, m.initial_state(1.0), {}, o);
  REQUIRE(res.samples.size() == 240);
  double worst = 0.0;
  for (const auto& s : res.samples) {
    const double v_ref = ocv - I * R0 - I * R1 * (1.0 - std::exp(-s.t / tau));
    worst = std::max(worst, std::fabs(s.term.v_terminal_V - v_ref) / v_ref);
  }
  // Tolerances 1e-10 abs/rel on the state keep the dense-output error far below 1e-6 relative.
  CHECK(worst < 1e-6);
  MESSAGE("worst relative error " << worst);
}

TEST_CASE("two RC pairs superpose") {
  // Linear circuit: the two RC voltages add, each I·R_k·(1 − e^(−t/τ_k)) (Plett 2015, ch. 2).
  const double I = 4.0, R0 = 0.02, R1 = 0.004, t1 = 5.0, R2 = 0.008, t2 = 150.0;
  battery::Cell c = test::analytic_cell(2.0, 3.6, 0.0, R0, {{Table(R1), Table(t1)}, {Table(R2), Table(t2)}});
  const battery::PackModel m(test::single(c));
  sim::SegmentOptions o;
  o.t_end = 600.0;
  o.sample_s = 10.0;
  auto res = sim::run_segment(m, battery::Demand::current(I), 0.0, m.initial_state(1.0), {}, o);
  for (const auto& s : res.samples) {
    const double v_ref = 3.6 - I * R0 - I * R1 * (1 - std::exp(-s.t / t1)) - I * R2 * (1 - std::exp(-s.t / t2));
    CHECK(s.term.v_terminal_V == doctest::Approx(v_ref).epsilon(1e-8));
  }
}

TEST_CASE("constant-power terminal solve satisfies V·I = P and picks the stable root") {
  // R0·I² − E·I + P = 0 (docs/physics.md); the smaller root keeps V above E/2.
  const double E = 16.0, R0 = 0.05, P = 400.0;
  const auto t = battery::solve_terminal(E, R0, E, battery::Demand::power(P), 0.0);
  CHECK_FALSE(t.collapsed);
  CHECK(t.v_terminal_V * t.current_A == doctest::Approx(P).epsilon(1e-12));
  CHECK(t.v_terminal_V > E / 2);
  // Beyond E²/(4·R0) = 1280 W the pack cannot deliver.
  const auto c = battery::solve_terminal(E, R0, E, battery::Demand::power(1300.0), 0.0);
  CHECK(c.collapsed);
  CHECK(c.discriminant < 0);
}

TEST_CASE("power with a bus-voltage term P = a + b·V is met exactly") {
  const double E = 22.0, R0 = 0.03, a = 250.0, b = 3.0;
  const auto t = battery::solve_terminal(E, R0, E, battery::Demand::power(a, b), 0.0);
  CHECK(t.v_terminal_V * t.current_A == doctest::Approx(a + b * t.v_terminal_V).epsilon(1e-12));
}

TEST_CASE("pack scaling: S in series and P in parallel scale resistances by S/P") {
  battery::Cell c = test::analytic_cell(5.0, 3.7, 0.0, 0.004, {{Table(0.002), Table(10.0)}});
  battery::Pack p = test::single(c);
  p.series = 6;
  p.parallel = 3;
  p.wiring_ohm = 0.01;
  p.soh_resistance = 1.2;
  p.soh_capacity = 0.9;
  const battery::PackModel m(p);
  CHECK(m.r0_pack_ohm(0.5) == doctest::Approx(6.0 / 3.0 * 0.004 * 1.2 + 0.01));
  CHECK(m.r_pack_ohm[0](0.5) == doctest::Approx(6.0 / 3.0 * 0.002));
  CHECK(m.capacity_C == doctest::Approx(3600.0 * 5.0 * 3 * 0.9));
  CHECK(m.ocv_pack(0.3) == doctest::Approx(6 * 3.7));
}

TEST_CASE("temperature tables scale resistance and capacity") {
  battery::Cell c = test::analytic_cell(5.0, 3.7, 0.0, 0.004);
  c.temperature = battery::TemperatureEffect{Table({-10.0, 25.0}, {3.0, 1.0}), Table({-10.0, 25.0}, {0.8, 1.0})};
  battery::Pack p = test::single(c);
  p.temperature_C = -10.0;
  const battery::PackModel cold(p);
  CHECK(cold.r0_pack_ohm(0.5) == doctest::Approx(0.012));
  CHECK(cold.capacity_C == doctest::Approx(3600.0 * 5.0 * 0.8));
}

}  // TEST_SUITE
