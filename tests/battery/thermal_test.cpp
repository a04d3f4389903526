// Lumped thermal model of the cells (battery::Thermal): closed forms and an energy balance.
//   m·c·dT/dt = I²·R0 + Σ v_k²/R_k − hA·(T − T_air)   (docs/physics.md)
#include <doctest/doctest.h>

#include <cmath>

#include "battery/scaling.hpp"
#include "battery/thevenin.hpp"
#include "sim/discharge.hpp"
#include "sim/segment.hpp"
#include "support/cells.hpp"

using namespace sortie;

namespace {

battery::Cell thermal_cell(double r0, std::vector<battery::RcPair> rc, double c_J_per_kgK, double hA_W_per_K) {
  battery::Cell c = test::analytic_cell(5.0, 3.7, 0.0, r0, std::move(rc));
  c.mass_kg = 0.12;
  c.thermal = battery::Thermal{c_J_per_kgK, hA_W_per_K};
  return c;
}

}  // namespace

TEST_SUITE("battery") {

TEST_CASE("thermal: adiabatic cells under a constant current warm by I²·R0·t/(m·c)") {
  // Joule heating into a lumped heat capacity with no loss: ΔT = P·t/(m·c). A 3S2P pack: each
  // cell carries I/P and its own R0; the wiring's heat is not in a cell.
  battery::Pack p = test::single(thermal_cell(0.004, {}, 1000.0, 0.0));
  p.series = 3;
  p.parallel = 2;
  p.wiring_ohm = 0.01;
  p.temperature_C = 20.0;
  const battery::PackModel m(p);
  REQUIRE(m.thermal);
  const double I = 60.0, i_cell = I / 2.0;
  sim::SegmentOptions o;
  o.t_end = 600.0;
  o.sample_s = 60.0;
  const auto res = sim::run_segment(m, battery::Demand::current(I), 0.0, m.initial_state(1.0), {}, o);
  REQUIRE(res.samples.size() == 10);
  for (const auto& s : res.samples) {
    const double want = 20.0 + i_cell * i_cell * 0.004 * s.t / (0.12 * 1000.0);
    CHECK(s.x[battery::kTemp] == doctest::Approx(want).epsilon(1e-9));
  }
  CHECK(res.end.x[battery::kTemp] == doctest::Approx(20.0 + 900.0 * 0.004 * 600.0 / 120.0).epsilon(1e-9));  // 38 °C
}

TEST_CASE("thermal: with cooling the temperature follows the lumped-capacitance solution") {
  // Lumped capacitance with internal generation q and convection hA to air at T_air
  // (F. Incropera, D. DeWitt et al., Fundamentals of Heat and Mass Transfer, 6th ed., 2007,
  // §5.3, the general lumped-capacitance balance — from memory):
  //   T(t) = T_air + q/hA + (T0 − T_air − q/hA)·e^(−t/τ),  τ = m·c/hA.
  const double r0 = 0.003, hA = 0.15, c = 1100.0, I = 40.0;
  battery::Pack p = test::single(thermal_cell(r0, {}, c, hA));
  p.temperature_C = 5.0;
  p.air_C = -10.0;
  const battery::PackModel m(p);
  const double q = I * I * r0, tau = 0.12 * c / hA;  // 4.8 W, 880 s
  sim::SegmentOptions o;
  o.t_end = 3000.0;
  o.sample_s = 100.0;
  const auto res = sim::run_segment(m, battery::Demand::current(I), 0.0, m.initial_state(1.0), {}, o);
  double worst = 0.0;
  for (const auto& s : res.samples) {
    const double want = -10.0 + q / hA + (5.0 + 10.0 - q / hA) * std::exp(-s.t / tau);
    worst = std::max(worst, std::fabs(s.x[battery::kTemp] - want));
  }
  CHECK(worst < 1e-7);
  MESSAGE("largest difference from the closed form " << worst << " K");
}

TEST_CASE("thermal: the heat in the cells is the circuit's loss less the energy left in the RC pairs") {
  // Energy balance of the circuit, adiabatic cells, flat OCV U: the chemical energy S·U·q leaves
  // at the terminals (∫V·I), as heat (I²·R0 + Σ v_k²/R_k) and as energy stored in the pair
  // capacitors, ½·C_k·v_k² with C_k = τ_k/R_k. So
  //   S·P·m·c·ΔT = S·U·q − ∫V·I dt − Σ ½·(τ_k/R_k)·v_k²   (pack-level v_k, R_k).
  const double U = 3.7, R0 = 0.005, R1 = 0.002, t1 = 8.0, R2 = 0.003, t2 = 120.0;
  battery::Pack p = test::single(
      thermal_cell(R0, {{Table(R1), Table(t1)}, {Table(R2), Table(t2)}}, 950.0, 0.0));
  p.series = 4;
  p.parallel = 1;
  p.temperature_C = 25.0;
  const battery::PackModel m(p);
  sim::SegmentOptions o;
  o.t_end = 300.0;  // τ2 = 120 s: the slow pair still holds energy at the end
  const auto res = sim::run_segment(m, battery::Demand::current(25.0), 0.0, m.initial_state(1.0), {}, o);
  const auto& x = res.end.x;
  const double rp1 = 4 * R1, rp2 = 4 * R2;  // pack values, S/P·R
  const double stored = 0.5 * (t1 / rp1) * x[battery::kV1] * x[battery::kV1] + 0.5 * (t2 / rp2) * x[battery::kV2] * x[battery::kV2];
  const double heat = 4 * U * x[battery::kCharge] - x[battery::kEnergy] - stored;
  CHECK(4 * 0.12 * 950.0 * (x[battery::kTemp] - 25.0) == doctest::Approx(heat).epsilon(1e-7));
  CHECK(stored > 0.01 * heat);  // the stored term matters here
}

TEST_CASE("thermal: a cold pack that warms lasts between the isothermal runs at its start and hottest temperature") {
  // The resistance factor falls with temperature; a warming pack sags less as it goes.
  battery::Cell c = thermal_cell(0.006, {{Table(0.003), Table(60.0)}}, 1000.0, 0.05);
  c.v_cutoff_V = 3.3;
  c.temperature = battery::TemperatureEffect{Table({-10.0, 0.0, 10.0, 25.0, 45.0}, {3.2, 2.1, 1.4, 1.0, 0.8}),
                                             Table(1.0)};
  c.ocv_V = Table({0.0, 0.1, 0.5, 1.0}, {3.2, 3.55, 3.8, 4.2});
  battery::Pack p = test::single(c);
  p.temperature_C = 0.0;
  sim::DischargeSpec spec;
  spec.load = sim::DischargeSpec::Load::current;
  spec.value = 20.0;  // 4C
  spec.cutoff_cell_V = 3.3;
  spec.sample_s = 0.0;
  const sim::DischargeResult warm = sim::discharge(p, spec);
  REQUIRE(warm.thermal);
  CHECK(warm.air_C == doctest::Approx(0.0));
  CHECK(warm.temperature_max_C > 5.0);
  battery::Pack iso = p;
  iso.cell.thermal.reset();
  const double t_cold = sim::discharge(iso, spec).time_to_end_s;
  iso.temperature_C = warm.temperature_max_C;
  const double t_hot = sim::discharge(iso, spec).time_to_end_s;
  MESSAGE("isothermal at 0 °C " << t_cold << " s, warming " << warm.time_to_end_s << " s (to "
                                << warm.temperature_max_C << " °C), isothermal there " << t_hot << " s");
  CHECK(t_cold < warm.time_to_end_s);
  CHECK(warm.time_to_end_s < t_hot);
}

TEST_CASE("thermal: cells that pass 60 °C raise one cell_hot warning and the run goes on") {
  battery::Pack p = test::single(thermal_cell(0.02, {}, 900.0, 0.0));
  p.temperature_C = 40.0;
  sim::DischargeSpec spec;
  spec.load = sim::DischargeSpec::Load::current;
  spec.value = 20.0;  // 8 W in 108 J/K: 60 °C after 270 s
  spec.cutoff_cell_V = 1.0;
  spec.soc_floor = 0.5;
  spec.sample_s = 0.0;
  const sim::DischargeResult r = sim::discharge(p, spec);
  int hot = 0;
  for (const auto& e : r.events)
    if (e.kind == "cell_hot") {
      ++hot;
      CHECK(e.t_s == doctest::Approx(20.0 * 0.12 * 900.0 / (400.0 * 0.02)).epsilon(1e-4));
    }
  CHECK(hot == 1);
  CHECK(r.end_reason == sim::EndReason::soc_floor);
  CHECK(r.temperature_end_C > 60.0);
}

TEST_CASE("thermal: without a thermal model the cells stay at the pack temperature") {
  battery::Pack p = test::single(test::analytic_cell(5.0, 3.7, 0.0, 0.01));
  p.temperature_C = -5.0;
  sim::DischargeSpec spec;
  spec.load = sim::DischargeSpec::Load::current;
  spec.value = 10.0;
  spec.cutoff_cell_V = 1.0;
  spec.soc_floor = 0.2;
  const sim::DischargeResult r = sim::discharge(p, spec);
  CHECK_FALSE(r.thermal);
  CHECK(r.temperature_end_C == -5.0);
  CHECK(r.temperature_max_C == -5.0);
}

TEST_CASE("thermal: a resized cell warms at the same rate at the same C-rate and cools through a surface as size^(2/3)") {
  // scale_cell: I²·R grows as k, the heat capacity as k; hA as k^(2/3) (common practice).
  const battery::Cell small = thermal_cell(0.004, {{Table(0.002), Table(30.0)}}, 1000.0, 0.0);
  const battery::Cell big = battery::scale_cell(small, 2.0 * small.capacity_Ah);
  REQUIRE(big.thermal);
  CHECK(big.thermal->c_J_per_kgK == small.thermal->c_J_per_kgK);
  CHECK(battery::scale_cell(thermal_cell(0.004, {}, 1000.0, 0.1), 40.0).thermal->hA_W_per_K ==
        doctest::Approx(0.1 * 4.0).epsilon(1e-12));  // k = 8: 8^(2/3) = 4
  sim::SegmentOptions o;
  o.t_end = 400.0;
  double rise[2];
  for (int i = 0; i < 2; ++i) {
    const battery::Cell& c = i == 0 ? small : big;
    const battery::PackModel m(test::single(c));
    const auto res = sim::run_segment(m, battery::Demand::current(3.0 * c.capacity_Ah), 0.0, m.initial_state(1.0), {}, o);
    rise[i] = res.end.x[battery::kTemp] - 25.0;
  }
  CHECK(rise[1] == doctest::Approx(rise[0]).epsilon(1e-8));
  CHECK(rise[0] > 1.0);
}

}  // TEST_SUITE
