// The model's range at run time: excursions beyond the cell's covered ranges and tables, the
// stop at the covered SoC floor, charging loads and loads beyond the pack's maximum power,
// each against a closed form derived here.
#include "sim/model_range.hpp"

#include <doctest/doctest.h>

#include <cmath>

#include "battery/scaling.hpp"
#include "sim/discharge.hpp"
#include "support/cells.hpp"

using namespace sortie;

namespace {

/// Linear OCV 3.0 + 1.2·SoC, R0 = 10 mΩ, no RC pair: every figure below has a closed form.
battery::Cell linear_cell(double Q) { return test::analytic_cell(Q, 3.0, 1.2, 0.01); }

sim::DischargeSpec constant_current(double amps, double soc_floor) {
  sim::DischargeSpec s;
  s.load = sim::DischargeSpec::Load::current;
  s.value = amps;
  s.cutoff_cell_V = 0.5;  // never reached: the runs end at the SoC floor
  s.soc_floor = soc_floor;
  s.sample_s = 0.0;
  return s;
}

sim::DischargeSpec current_series(std::vector<double> t, std::vector<double> i) {
  sim::DischargeSpec s;
  s.load = sim::DischargeSpec::Load::series;
  s.series.quantity = sim::LoadSeries::Quantity::current;
  s.series.step = false;
  s.series.time_s = std::move(t);
  s.series.value = std::move(i);
  s.cutoff_cell_V = 0.5;
  s.sample_s = 0.0;
  return s;
}

const sim::Excursion* find(const std::vector<sim::Excursion>& xs, const std::string& quantity,
                           const std::string& side, const std::string& range) {
  for (const auto& e : xs)
    if (e.quantity == quantity && e.side == side && e.range == range) return &e;
  return nullptr;
}

// Crossing times are located to 1e-4 s on the dense output (model_range.cpp) and the run's end
// to the same tolerance (segment.hpp): 1 ms covers both with room.
constexpr double kTimeTol = 1e-3;

}  // namespace

TEST_SUITE("sim") {

TEST_CASE("SoC below the covered floor: when and how long follow from Coulomb counting") {
  // dSoC/dt = −I/(3600·Q) (docs/physics.md): from SoC 1 at I the SoC reaches s at t = 3600·Q·(1 − s)/I.
  // Left at soc_min = 0.3, ended at the floor 0.05: outside for 3600·Q·(0.3 − 0.05)/I.
  const double Q = 5.0, I = 10.0, soc_min = 0.3, floor = 0.05;
  battery::Cell c = linear_cell(Q);
  c.coverage = battery::CellCoverage{};
  c.coverage->soc_min = soc_min;
  const auto r = sim::discharge(test::single(c, 1.0), constant_current(I, floor));
  REQUIRE(r.end_reason == sim::EndReason::soc_floor);
  const auto* e = find(r.excursions, "soc", "below", "coverage");
  REQUIRE(e);
  CHECK(std::fabs(e->first_s - 3600.0 * Q * (1.0 - soc_min) / I) < kTimeTol);
  CHECK(std::fabs(e->duration_s - 3600.0 * Q * (soc_min - floor) / I) < kTimeTol);
  CHECK(e->extreme == doctest::Approx(floor).epsilon(1e-6));
  CHECK(e->beyond() == doctest::Approx(soc_min - floor).epsilon(1e-5));
  CHECK(e->intervals == 1);
  CHECK(e->at_end);
  CHECK(r.excursions.size() == 1);  // a constant current of 10 A claims nothing else
  CHECK(r.soc_floor_covered == doctest::Approx(soc_min));
  bool event = false;
  for (const auto& ev : r.events) event = event || (ev.kind == "model_range" && std::fabs(ev.t_s - e->first_s) < 1e-9);
  CHECK(event);
}

TEST_CASE("stop at coverage: the run ends where the SoC reaches the covered floor as its own end") {
  // Same cell and load: the end is at SoC 0.3, t = 3600·Q·(1 − 0.3)/I, with no SoC excursion.
  const double Q = 5.0, I = 10.0, soc_min = 0.3;
  battery::Cell c = linear_cell(Q);
  c.coverage = battery::CellCoverage{};
  c.coverage->soc_min = soc_min;
  auto spec = constant_current(I, 0.0);
  spec.stop_at_coverage = true;
  const auto r = sim::discharge(test::single(c, 1.0), spec);
  CHECK(r.end_reason == sim::EndReason::coverage_floor);
  CHECK(std::string(sim::to_string(r.end_reason)) == "coverage_floor");
  CHECK(r.soc_end == doctest::Approx(soc_min).epsilon(1e-6));
  CHECK(std::fabs(r.time_to_end_s - 3600.0 * Q * (1.0 - soc_min) / I) < kTimeTol);
  CHECK(r.excursions.empty());
}

TEST_CASE("stop at coverage without a floor: an OCV table from SoC 0 and no coverage change nothing") {
  const double Q = 5.0, I = 10.0;
  battery::Cell c = linear_cell(Q);
  c.ocv_V = Table({0.0, 0.5, 1.0}, {3.0, 3.6, 4.2});
  auto spec = constant_current(I, 0.1);
  spec.stop_at_coverage = true;
  const auto r = sim::discharge(test::single(c, 1.0), spec);
  CHECK(r.end_reason == sim::EndReason::soc_floor);
  CHECK(std::fabs(r.time_to_end_s - 3600.0 * Q * 0.9 / I) < kTimeTol);
  CHECK(r.excursions.empty());
}

TEST_CASE("an OCV table that starts above SoC 0: its first point is the floor and below it is an excursion") {
  // Without a coverage block the table's own range is the data: below SoC 0.2 the OCV is held
  // flat. Left at t = 3600·Q·0.8/I, outside down to the floor 0.05 for 3600·Q·0.15/I.
  const double Q = 2.0, I = 4.0;
  battery::Cell c = linear_cell(Q);
  c.ocv_V = Table({0.2, 0.6, 1.0}, {3.4, 3.7, 4.2});
  const auto r = sim::discharge(test::single(c, 1.0), constant_current(I, 0.05));
  CHECK(r.soc_floor_covered == doctest::Approx(0.2));
  const auto* e = find(r.excursions, "soc", "below", "ocv_table");
  REQUIRE(e);
  CHECK(std::fabs(e->first_s - 3600.0 * Q * 0.8 / I) < kTimeTol);
  CHECK(std::fabs(e->duration_s - 3600.0 * Q * 0.15 / I) < kTimeTol);
  CHECK(e->limit == doctest::Approx(0.2));
}

TEST_CASE("cell current above the covered maximum: a linear ramp load with two crossings located exactly") {
  // Load (linear): 0 A at 0 s, 20 A at 100 s, 20 A at 200 s, 0 A at 300 s. With the covered
  // maximum 12 A: up through 12 A at t = 12/20·100 = 60 s, down through it at
  // 200 + (20 − 12)/20·100 = 240 s: 180 s outside, at most 20 A.
  battery::Cell c = linear_cell(50.0);
  c.coverage = battery::CellCoverage{};
  c.coverage->current_max_A = 12.0;
  const auto r = sim::discharge(test::single(c, 1.0), current_series({0, 100, 200, 300}, {0, 20, 20, 0}));
  CHECK(r.end_reason == sim::EndReason::load_end);
  const auto* e = find(r.excursions, "cell_current_A", "above", "coverage");
  REQUIRE(e);
  CHECK(std::fabs(e->first_s - 60.0) < kTimeTol);
  CHECK(std::fabs(e->duration_s - 180.0) < kTimeTol);
  CHECK(e->extreme == doctest::Approx(20.0));
  CHECK(e->intervals == 1);
  CHECK_FALSE(e->at_end);
}

TEST_CASE("cell current above the covered maximum twice: two stretches with their times summed") {
  // Triangles 0→20→0 A over 0–200 s and 200–400 s: each above 12 A from 60 to 140 s of its
  // 200 s (12/20 of the way up and down): 2 × 80 s, first from 60 s. Two cells in parallel at
  // twice the current: the cell current is the pack's over P.
  battery::Cell c = linear_cell(50.0);
  c.coverage = battery::CellCoverage{};
  c.coverage->current_max_A = 12.0;
  battery::Pack p = test::single(c, 1.0);
  p.parallel = 2;
  const auto r = sim::discharge(p, current_series({0, 100, 200, 300, 400}, {0, 40, 0, 40, 0}));
  const auto* e = find(r.excursions, "cell_current_A", "above", "coverage");
  REQUIRE(e);
  CHECK(e->intervals == 2);
  CHECK(std::fabs(e->first_s - 60.0) < kTimeTol);
  CHECK(std::fabs(e->duration_s - 160.0) < kTimeTol);
  CHECK(e->extreme == doctest::Approx(20.0));
}

TEST_CASE("cell temperature above the covered range: the lumped thermal model's closed form") {
  // m·c·dT/dt = I²·R0 − hA·(T − T_air) with T(0) = T_air (docs/physics.md):
  //   T(t) = T_air + ΔT·(1 − e^(−t/τ)),  ΔT = I²·R0/hA,  τ = m·c/hA.
  // Here ΔT = 10²·0.01/0.1 = 10 K, τ = 0.1·1000/0.1 = 1000 s; T reaches 25 °C at
  // t_c = −τ·ln(1 − 5/10) and stays above it to the end at 3600·Q·0.95/I.
  const double Q = 5.0, I = 10.0;
  battery::Cell c = linear_cell(Q);
  c.thermal = battery::Thermal{1000.0, 0.1};
  c.coverage = battery::CellCoverage{};
  c.coverage->temperature_min_C = 19.0;
  c.coverage->temperature_max_C = 25.0;
  battery::Pack p = test::single(c, 1.0);
  p.temperature_C = 20.0;
  const auto r = sim::discharge(p, constant_current(I, 0.05));
  const double tau = 1000.0, dT = 10.0, t_end = 3600.0 * Q * 0.95 / I;
  const double t_c = -tau * std::log(1.0 - 5.0 / dT);
  const auto* e = find(r.excursions, "cell_temperature_C", "above", "coverage");
  REQUIRE(e);
  CHECK(std::fabs(e->first_s - t_c) < kTimeTol);
  CHECK(std::fabs(e->duration_s - (t_end - t_c)) < kTimeTol);
  CHECK(e->extreme == doctest::Approx(20.0 + dT * (1.0 - std::exp(-t_end / tau))).epsilon(1e-7));
  CHECK_FALSE(find(r.excursions, "cell_temperature_C", "below", "coverage"));
}

TEST_CASE("a pack colder than the cell's temperature table: outside for the whole run and by how much") {
  // No thermal model: the cells stay at −30 °C, 20 K below the table's −10 °C, from t = 0 to the end.
  battery::Cell c = linear_cell(5.0);
  battery::TemperatureEffect eff;
  eff.r_factor = Table({-10.0, 25.0}, {2.0, 1.0});
  c.temperature = eff;
  battery::Pack p = test::single(c, 1.0);
  p.temperature_C = -30.0;
  const auto r = sim::discharge(p, constant_current(10.0, 0.5));
  const auto* e = find(r.excursions, "cell_temperature_C", "below", "temperature_table");
  REQUIRE(e);
  CHECK(e->first_s == 0.0);
  CHECK(std::fabs(e->duration_s - r.time_to_end_s) < kTimeTol);
  CHECK(e->extreme == doctest::Approx(-30.0));
  CHECK(e->beyond() == doctest::Approx(20.0));
  CHECK(e->at_end);
  const std::string words = sim::describe(*e);
  CHECK(words.find("-10.0 °C") != std::string::npos);
  CHECK(words.find("-30.0 °C") != std::string::npos);
}

TEST_CASE("charging: SoC rises by Coulomb counting and the run ends at full and a voltage above v_max is an excursion") {
  // −5 A into a 5 Ah cell from SoC 0.5: full at t = 3600·5·0.5/5 = 1800 s. Loaded voltage
  // V = OCV + R0·|I| = 3.0 + 1.2·s + 0.05 passes v_max = 4.2 V at s = (4.2 − 3.05)/1.2, that is
  // t = 3600·(s − 0.5), and reaches 4.25 V at full.
  battery::Cell c = linear_cell(5.0);
  c.v_max_V = 4.2;
  const auto r = sim::discharge(test::single(c, 0.5), current_series({0, 4000}, {-5, -5}));
  CHECK(r.end_reason == sim::EndReason::pack_full);
  CHECK(r.soc_end == doctest::Approx(1.0).epsilon(1e-6));
  CHECK(std::fabs(r.time_to_end_s - 1800.0) < kTimeTol);
  const auto* e = find(r.excursions, "cell_voltage_V", "above", "v_max");
  REQUIRE(e);
  const double s_c = (4.2 - 3.05) / 1.2;
  CHECK(std::fabs(e->first_s - 3600.0 * (s_c - 0.5)) < kTimeTol);
  CHECK(std::fabs(e->duration_s - 3600.0 * (1.0 - s_c)) < kTimeTol);
  CHECK(e->extreme == doctest::Approx(4.25).epsilon(1e-6));
  CHECK(r.excursions.size() == 1);  // the end at full is not an excursion of the SoC
}

TEST_CASE("a run that starts full and discharges is not stopped by the full-pack end") {
  battery::Cell c = linear_cell(5.0);
  const auto r = sim::discharge(test::single(c, 1.0), constant_current(10.0, 0.5));
  CHECK(r.end_reason == sim::EndReason::soc_floor);
}

TEST_CASE("power beyond the pack's maximum: the end says the power asked and E²/(4·R0)") {
  // Flat OCV 3.7 V, R0 = 10 mΩ: V·I with V = E − R0·I peaks at E²/(4·R0) = 342.25 W.
  battery::Cell c = test::analytic_cell(5.0, 3.7, 0.0, 0.01);
  sim::DischargeSpec spec;
  spec.load = sim::DischargeSpec::Load::power;
  spec.value = 500.0;
  spec.cutoff_cell_V = 3.0;
  spec.sample_s = 0.0;
  const auto r = sim::discharge(test::single(c, 1.0), spec);
  CHECK(r.end_reason == sim::EndReason::power_collapse);
  CHECK(r.time_to_end_s == 0.0);
  CHECK(r.power_asked_W == doctest::Approx(500.0));
  CHECK(r.power_max_W == doctest::Approx(3.7 * 3.7 / 0.04));
  CHECK(r.events.back().detail.find("cannot deliver this power") != std::string::npos);
  CHECK(sim::max_power_W(3.7, 0.01) == doctest::Approx(342.25));
}

TEST_CASE("power collapse mid-run: at the collapse the power asked is the maximum the pack can give") {
  // Linear OCV, R0 = 0.1 Ω: E²/(4·R0) falls with the SoC and crosses 30 W where
  // E = √(4·0.1·30) = 3.464 V, SoC (3.464 − 3.0)/1.2: the collapse ends the run there.
  battery::Cell c = test::analytic_cell(2.0, 3.0, 1.2, 0.1);
  sim::DischargeSpec spec;
  spec.load = sim::DischargeSpec::Load::power;
  spec.value = 30.0;
  spec.cutoff_cell_V = 0.5;
  spec.sample_s = 0.0;
  const auto r = sim::discharge(test::single(c, 1.0), spec);
  REQUIRE(r.end_reason == sim::EndReason::power_collapse);
  CHECK(r.power_max_W == doctest::Approx(30.0).epsilon(1e-4));
  CHECK(r.soc_end == doctest::Approx((std::sqrt(12.0) - 3.0) / 1.2).epsilon(1e-4));
}

TEST_CASE("resizing a cell scales its covered currents with its capacity but not its SoC or temperature") {
  // battery/scaling.hpp: the same C-rates in a cell k times bigger are k times the current.
  battery::Cell c = linear_cell(5.0);
  c.coverage = battery::CellCoverage{0.1, 0.9, 50.0, -10.0, 5.0, 30.0, "test"};
  const battery::Cell big = battery::scale_cell(c, 10.0);
  REQUIRE(big.coverage);
  CHECK(*big.coverage->current_max_A == doctest::Approx(100.0));
  CHECK(*big.coverage->current_min_A == doctest::Approx(-20.0));
  CHECK(big.coverage->soc_min == 0.1);
  CHECK(*big.coverage->temperature_max_C == 30.0);
}

}  // TEST_SUITE
