// The thermal block from a logged cell temperature (fit/thermal_fit): a synthetic pulse test run
// with a known thermal block gives it back; a log whose temperature does not move gives none.
#include <doctest/doctest.h>

#include <cmath>

#include "fit/fit_cell.hpp"
#include "io/battery_json.hpp"
#include "sim/synthetic_log.hpp"
#include "support/cli.hpp"
#include "support/synthetic.hpp"

using namespace sortie;

namespace {

/// A pulse test hard enough to warm the cell: 4C steps between the pulse sets.
sim::PulseTestProtocol warm_protocol(double air_C) {
  sim::PulseTestProtocol p;
  p.step_C = 4.0;
  p.step_rest_s = 2400.0;
  p.thermal = true;
  p.air_C = air_C;
  return p;
}

}  // namespace

TEST_SUITE("fit") {

TEST_CASE("fit thermal: a synthetic log with a known thermal block gives its heat capacity and hA back") {
  // The invented demo cell (0.118 kg) with a thermal block away from the fit's defaults (1000
  // J/(kg·K), 0.078 W/K for its mass): 850 J/(kg·K) = 100.3 J/K, hA 0.12 W/K (τ ≈ 14 min).
  battery::Cell truth = io::load_cell_file(test::source_path(test::kDemoLogCell));
  REQUIRE(truth.thermal);
  truth.thermal->c_J_per_kgK = 850.0;
  truth.thermal->hA_W_per_K = 0.12;
  for (const std::uint64_t seed : {std::uint64_t{20240611}, std::uint64_t{99}}) {
    MESSAGE("seed " << seed);
    sim::MeasurementNoise noise;
    noise.seed = seed;
    const sim::SyntheticLog s = sim::synthetic_pulse_test(truth, warm_protocol(18.0), noise);
    REQUIRE(s.temperature_C.size() == s.time_s.size());
    fit::CellFitOptions o;
    o.chemistry = "LiPo";  // the demo cell's chemistry
    // Its 4C steps end at the cutoff with charge left: not an empty point, so the capacity is given.
    o.soc.capacity_Ah = truth.capacity_Ah;
    o.mass_kg = truth.mass_kg;
    const fit::CellFitResult r = fit::fit_cell(sim::to_cell_log(s, "synthetic"), o);
    REQUIRE(r.thermal);
    REQUIRE(r.cell.thermal);
    MESSAGE("C " << r.thermal->heat_capacity_J_per_K << " J/K, hA " << r.thermal->hA_W_per_K << " W/K, air "
                 << r.thermal->air_C << " °C, RMSE " << r.thermal->rmse_K << " K, swing "
                 << r.thermal->temperature_max_C - r.thermal->temperature_min_C << " K");
    CHECK(r.cell.thermal->c_J_per_kgK == doctest::Approx(truth.thermal->c_J_per_kgK).epsilon(0.05));
    CHECK(r.cell.thermal->hA_W_per_K == doctest::Approx(truth.thermal->hA_W_per_K).epsilon(0.10));
    CHECK(r.thermal->air_C == doctest::Approx(18.0).epsilon(0.02));
    // The fitted model follows the logged temperature to about its noise and resolution
    // (σ 0.05 K, steps of 0.1 K).
    CHECK(r.thermal->rmse_K < 0.15);
    // The air temperature given: two unknowns, the same answer.
    o.air_C = 18.0;
    const fit::CellFitResult g = fit::fit_cell(sim::to_cell_log(s, "synthetic"), o);
    REQUIRE(g.cell.thermal);
    CHECK(g.thermal->air_given);
    CHECK(g.cell.thermal->hA_W_per_K == doctest::Approx(truth.thermal->hA_W_per_K).epsilon(0.10));
  }
}

TEST_CASE("fit thermal: a temperature that barely moves gives a warning and the default thermal block") {
  const battery::Cell truth = io::load_cell_file(test::source_path(test::kDemoLogCell));
  sim::PulseTestProtocol p = warm_protocol(25.0);
  p.step_C = 0.5;  // gentle: the cell warms by a few tenths of a kelvin
  p.pulse_C = 1.0;
  p.charge_pulse_C = 0.5;
  battery::Cell big = truth;
  big.thermal->hA_W_per_K = 5.0;  // and is held near the air by a large cooling
  const sim::SyntheticLog s = sim::synthetic_pulse_test(big, p, sim::MeasurementNoise{});
  fit::CellFitOptions o;
  o.chemistry = "LiPo";  // the demo cell's chemistry
  o.soc.capacity_Ah = truth.capacity_Ah;
  o.mass_kg = truth.mass_kg;
  const fit::CellFitResult r = fit::fit_cell(sim::to_cell_log(s, "synthetic"), o);
  REQUIRE(r.thermal);
  REQUIRE(r.cell.thermal);
  CHECK_FALSE(r.thermal->c_fitted);
  CHECK_FALSE(r.thermal->hA_fitted);
  // The defaults (fit/cell_priors, from memory / common practice): c 1000 J/(kg·K); hA = h·A with
  // h 10 W/(m²·K) and A the area of a cube of the cell's volume at 2500 kg/m³.
  CHECK(r.cell.thermal->c_J_per_kgK == doctest::Approx(1000.0));
  const double area = 6.0 * std::pow(truth.mass_kg / 2500.0, 2.0 / 3.0);
  CHECK(r.cell.thermal->hA_W_per_K == doctest::Approx(10.0 * area).epsilon(1e-6));
  CHECK(r.thermal->air_C == doctest::Approx(25.0).epsilon(0.02));  // the log's first temperature
  bool warned = false;
  for (const auto& w : r.warnings) warned = warned || w.rfind("thermal block not fitted: the cell temperature moves", 0) == 0;
  CHECK(warned);
}

TEST_CASE("fit thermal: a fitted hA outside what a cell of its mass can have in air is replaced by the default") {
  // The demo cell logged with a cooling of 0.02 W/K, below the smallest hA the bounds allow for
  // 0.118 kg in air (7 W/(m²·K) over the area of a cube of its volume at 2500 kg/m³, 0.055 W/K;
  // fit/cell_priors): the fit holds hA at its default and refits the heat capacity with it.
  const battery::Cell truth = io::load_cell_file(test::source_path(test::kDemoLogCell));
  battery::Cell cooled = truth;
  cooled.thermal->hA_W_per_K = 0.02;
  const sim::SyntheticLog s = sim::synthetic_pulse_test(cooled, warm_protocol(18.0), sim::MeasurementNoise{});
  fit::CellFitOptions o;
  o.chemistry = "LiPo";
  o.soc.capacity_Ah = truth.capacity_Ah;
  o.mass_kg = truth.mass_kg;
  const fit::CellFitResult r = fit::fit_cell(sim::to_cell_log(s, "synthetic"), o);
  REQUIRE(r.thermal);
  MESSAGE("swing " << r.thermal->temperature_max_C - r.thermal->temperature_min_C << " K, " << r.thermal->how);
  const double area = 6.0 * std::pow(truth.mass_kg / 2500.0, 2.0 / 3.0);
  CHECK_FALSE(r.thermal->hA_fitted);
  CHECK(r.thermal->hA_W_per_K == doctest::Approx(10.0 * area).epsilon(1e-6));
  bool warned = false;
  for (const auto& w : r.warnings) warned = warned || w.rfind("thermal block: the fitted hA", 0) == 0;
  CHECK(warned);
  CHECK(r.cell.thermal->c_J_per_kgK >= 700.0);
  CHECK(r.cell.thermal->c_J_per_kgK <= 1400.0);
}

TEST_CASE("fit thermal: an isothermal synthetic log is the same with or without the thermal option") {
  // The bundled demo log was made with the thermal option off: its rows do not depend on the
  // cell's thermal block.
  const battery::Cell truth = io::load_cell_file(test::source_path(test::kDemoLogCell));
  battery::Cell plain = truth;
  plain.thermal.reset();
  sim::PulseTestProtocol p;
  p.step_soc = 0.3;
  const sim::SyntheticLog a = sim::synthetic_pulse_test(truth, p, sim::MeasurementNoise{});
  const sim::SyntheticLog b = sim::synthetic_pulse_test(plain, p, sim::MeasurementNoise{});
  CHECK(a.voltage_V == b.voltage_V);
  CHECK(a.temperature_C.empty());
}

}  // TEST_SUITE
