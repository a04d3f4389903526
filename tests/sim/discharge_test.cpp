// Whole discharges against closed forms: Coulomb counting, constant power, pack scaling, ends.
#include "sim/discharge.hpp"

#include <doctest/doctest.h>

#include <cmath>

#include "support/cells.hpp"

using namespace sortie;

namespace {

sim::DischargeSpec cc(double amps, double cutoff) {
  sim::DischargeSpec s;
  s.load = sim::DischargeSpec::Load::current;
  s.value = amps;
  s.cutoff_cell_V = cutoff;
  s.sample_s = 0.0;
  return s;
}

// ∫ (E + √(E² − c)) dE = E²/2 + ½·(E·√(E² − c) − c·ln(E + √(E² − c)))   (standard integral)
double primitive(double E, double c) {
  const double r = std::sqrt(std::max(0.0, E * E - c));
  return 0.5 * E * E + 0.5 * (E * r - c * std::log(E + r));
}

}  // namespace

TEST_SUITE("battery") {

TEST_CASE("Coulomb counting: flat OCV — constant current — time to the SoC floor is Q·ΔSoC/I") {
  // dSoC/dt = −I/(3600·Q): t = 3600·Q·(SoC0 − floor)/I. Exact for any resistance.
  const double Q = 5.0, I = 7.5, soc0 = 0.95, floor = 0.2;
  battery::Pack p = test::single(test::analytic_cell(Q, 3.7, 0.0, 0.01, {{Table(0.004), Table(30.0)}}), soc0);
  auto spec = cc(I, 1.0);
  spec.soc_floor = floor;
  const auto r = sim::discharge(p, spec);
  CHECK(r.end_reason == sim::EndReason::soc_floor);
  const double t_ref = 3600.0 * Q * (soc0 - floor) / I;
  CHECK(r.time_to_end_s == doctest::Approx(t_ref).epsilon(1e-6));
  CHECK(std::fabs(r.time_to_end_s - t_ref) < 0.01);  // the 10 ms the ends are located to
  CHECK(r.charge_Ah == doctest::Approx(Q * (soc0 - floor)).epsilon(1e-9));
}

TEST_CASE("constant power — R0 only — linear OCV: time to cutoff matches the closed form") {
  // Derivation. OCV = v0 + k·s, E = OCV (no RC), I = (E − √(E² − 4R0P))/(2R0) (docs/physics.md).
  // dt = −C·ds/I with C = 3600·Q and ds = dE/k. Rationalising,
  //   1/I = 2R0/(E − √(E² − 4R0P)) = (E + √(E² − 4R0P))/(2P),
  // so t = C/(2P·k) · [F(E0) − F(E_end)], F the primitive of E + √(E² − c), c = 4·R0·P.
  // The end: terminal voltage V_cut with V·I = P gives I = P/V_cut, E_end = V_cut + R0·P/V_cut.
  const double Q = 3.0, v0 = 3.0, k = 1.2, R0 = 0.02, P = 30.0, v_cut = 3.3;
  battery::Pack p = test::single(test::analytic_cell(Q, v0, k, R0), 1.0);
  sim::DischargeSpec spec;
  spec.load = sim::DischargeSpec::Load::power;
  spec.value = P;
  spec.cutoff_cell_V = v_cut;
  spec.sample_s = 0.0;
  const auto r = sim::discharge(p, spec);
  CHECK(r.end_reason == sim::EndReason::cutoff_voltage);
  const double c = 4 * R0 * P, C = 3600 * Q;
  const double E0 = v0 + k, E_end = v_cut + R0 * P / v_cut;
  const double t_ref = C / (2 * P * k) * (primitive(E0, c) - primitive(E_end, c));
  CHECK(r.time_to_end_s == doctest::Approx(t_ref).epsilon(1e-6));
  // Energy at the terminals is P·t.
  CHECK(r.energy_Wh == doctest::Approx(P * t_ref / 3600).epsilon(1e-6));
}

TEST_CASE("constant power beyond what the pack can give ends in power collapse at the closed-form time") {
  // Collapse when E² = 4·R0·P, E_c = 2√(R0·P); time from the same integral as above, to E_c.
  const double Q = 2.0, v0 = 3.0, k = 1.2, R0 = 0.05, P = 60.0;  // E_c = 3.464 V
  battery::Pack p = test::single(test::analytic_cell(Q, v0, k, R0), 1.0);
  sim::DischargeSpec spec;
  spec.load = sim::DischargeSpec::Load::power;
  spec.value = P;
  spec.cutoff_cell_V = 0.6;  // far below V at collapse (E_c/2)
  spec.sample_s = 0.0;
  const auto r = sim::discharge(p, spec);
  CHECK(r.end_reason == sim::EndReason::power_collapse);
  const double c = 4 * R0 * P, C = 3600 * Q, Ec = 2 * std::sqrt(R0 * P);
  const double t_ref = C / (2 * P * k) * (primitive(v0 + k, c) - primitive(Ec, c));
  CHECK(r.time_to_end_s == doctest::Approx(t_ref).epsilon(1e-5));
  CHECK(std::fabs(r.time_to_end_s - t_ref) < 0.01);
}

TEST_CASE("an S×P pack behaves as the scaled single cell") {
  // Series multiplies voltage, parallel divides current per cell: at P times the cell current
  // a pack lasts as long as the cell, with S·V and S·P times the energy.
  std::vector<battery::RcPair> rc = {{Table(0.003), Table(8.0)}, {Table(0.004), Table(120.0)}};
  battery::Cell cell = test::analytic_cell(5.0, 3.2, 1.0, 0.006, rc);
  battery::Pack one = test::single(cell);
  battery::Pack pack = one;
  pack.series = 4;
  pack.parallel = 3;
  const auto r1 = sim::discharge(one, cc(10.0, 3.4));
  const auto rp = sim::discharge(pack, cc(30.0, 3.4));
  CHECK(rp.time_to_end_s == doctest::Approx(r1.time_to_end_s).epsilon(1e-6));
  CHECK(rp.energy_Wh == doctest::Approx(12 * r1.energy_Wh).epsilon(1e-6));
  CHECK(rp.charge_Ah == doctest::Approx(3 * r1.charge_Ah).epsilon(1e-6));
  CHECK(rp.v_min_V == doctest::Approx(4 * r1.v_min_V).epsilon(1e-6));
}

TEST_CASE("the cutoff is located to better than 10 ms") {
  battery::Cell cell = test::analytic_cell(5.0, 3.0, 1.2, 0.01, {{Table(0.005), Table(15.0)}});
  const auto r = sim::discharge(test::single(cell), cc(20.0, 3.3));
  REQUIRE(r.end_reason == sim::EndReason::cutoff_voltage);
  // Near the end the loaded voltage falls at about k·I/(3600·Q) V/s; 10 ms of that bounds the
  // voltage error at the reported time.
  const double dvdt = 1.2 * 20.0 / (3600.0 * 5.0);
  CHECK(std::fabs(r.v_min_V - 3.3) < dvdt * 0.01);
}

TEST_CASE("trace: samples every sample_s and the exact end point") {
  battery::Cell cell = test::analytic_cell(1.0, 3.0, 1.2, 0.01);
  auto spec = cc(2.0, 3.3);
  spec.sample_s = 10.0;
  const auto r = sim::discharge(test::single(cell), spec);
  REQUIRE(r.trace.size() > 3);
  for (std::size_t i = 0; i + 1 < r.trace.size(); ++i) CHECK(r.trace[i].t == doctest::Approx(10.0 * i));
  CHECK(r.trace.back().t == doctest::Approx(r.time_to_end_s));
  // SoC never rises in discharge (a property of the model: dSoC/dt = −I/C with I > 0).
  for (std::size_t i = 1; i < r.trace.size(); ++i) CHECK(r.trace[i].x[battery::kSoc] <= r.trace[i - 1].x[battery::kSoc]);
}

TEST_CASE("a step load series of one value equals the constant-current discharge") {
  battery::Cell cell = test::analytic_cell(2.0, 3.0, 1.2, 0.01, {{Table(0.005), Table(15.0)}});
  const auto ref = sim::discharge(test::single(cell), cc(4.0, 3.3));
  sim::DischargeSpec s = cc(0.0, 3.3);
  s.load = sim::DischargeSpec::Load::series;
  s.series.step = true;
  s.series.time_s = {0.0, 600.0, 1200.0, 1e5};
  s.series.value = {4.0, 4.0, 4.0, 4.0};
  const auto r = sim::discharge(test::single(cell), s);
  CHECK(r.end_reason == sim::EndReason::cutoff_voltage);
  CHECK(r.time_to_end_s == doctest::Approx(ref.time_to_end_s).epsilon(1e-6));
}

TEST_CASE("a linear ramp of current integrates to the trapezoid charge") {
  // Charge = ∫ I dt; for a ramp from I0 to I1 over T it is (I0 + I1)/2·T exactly.
  battery::Cell cell = test::analytic_cell(10.0, 3.7, 0.0, 0.01);
  sim::DischargeSpec s = cc(0.0, 1.0);
  s.load = sim::DischargeSpec::Load::series;
  s.series.time_s = {0.0, 1000.0};
  s.series.value = {2.0, 8.0};
  const auto r = sim::discharge(test::single(cell), s);
  CHECK(r.end_reason == sim::EndReason::load_end);
  CHECK(r.charge_Ah == doctest::Approx(5.0 * 1000.0 / 3600.0).epsilon(1e-9));
}

TEST_CASE("current above the cell limit is a warning event — not an end") {
  battery::Cell cell = test::analytic_cell(2.0, 3.0, 1.2, 0.01);
  cell.i_cont_max_A = 5.0;
  const auto r = sim::discharge(test::single(cell), cc(8.0, 3.3));
  CHECK(r.end_reason == sim::EndReason::cutoff_voltage);
  REQUIRE(r.events.size() == 2);
  CHECK(r.events[0].kind == "over_current");
  CHECK(r.events[0].t_s == 0.0);
  CHECK(r.events[1].kind == "cutoff_voltage");
}

}  // TEST_SUITE
