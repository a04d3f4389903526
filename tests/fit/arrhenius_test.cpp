// Arrhenius temperature dependence of the resistances (fit/cell_priors): current steps whose
// −ΔV/ΔI follows R(T) = R_ref·exp(E_a/R·(1/T − 1/T_ref)) (S. Arrhenius, Z. Phys. Chem. 4, 1889)
// give E_a back; a spread below 5 K gives the stated prior.
#include <doctest/doctest.h>

#include <cmath>

#include "fit/cell_priors.hpp"

using namespace sortie;

namespace {

/// Steps at temperatures t_C over a cell of R0 = 20 mΩ, E_a 40 kJ/mol, reference 25 °C.
void make(const std::vector<double>& t_C, battery::CellLog& log, std::vector<fit::CurrentStep>& steps) {
  for (std::size_t i = 0; i < t_C.size(); ++i) {
    log.time_s.push_back(static_cast<double>(i));
    log.current_A.push_back(1.0);
    log.voltage_V.push_back(3.7);
    log.temperature_C.push_back(t_C[i]);
    fit::CurrentStep s;
    s.row = i;
    s.soc = 0.5;
    s.r_ohm = 0.020 * std::exp(40000.0 / 8.314462618 * (1.0 / (t_C[i] + 273.15) - 1.0 / 298.15));
    steps.push_back(s);
  }
}

}  // namespace

TEST_SUITE("fit") {

TEST_CASE("arrhenius: steps over 10 to 40 °C give E_a back and the factor table is 1 at the reference") {
  battery::CellLog log;
  std::vector<fit::CurrentStep> steps;
  make({10, 15, 20, 25, 30, 35, 40, 12, 28, 38}, log, steps);
  battery::Cell cell;
  cell.r0_ohm = Table(0.020);
  const fit::ArrheniusFit a = fit::fit_arrhenius(log, steps, cell, 25.0, "(test)");
  CHECK(a.fitted);
  CHECK(a.ea_J_per_mol == doctest::Approx(40000.0).epsilon(1e-6));
  const battery::TemperatureEffect e = fit::arrhenius_effect(a);
  CHECK(e.r_factor(25.0) == doctest::Approx(1.0).epsilon(1e-4));
  // exp(40000/8.3145·(1/273.15 − 1/298.15)) = 4.38 at 0 °C (hand computed).
  CHECK(e.r_factor(0.0) == doctest::Approx(4.38).epsilon(0.01));
}

TEST_CASE("arrhenius: a spread of 3 K gives the 30 kJ/mol prior and says so") {
  battery::CellLog log;
  std::vector<fit::CurrentStep> steps;
  make({24, 25, 26, 27, 24.5, 25.5, 26.5}, log, steps);
  battery::Cell cell;
  cell.r0_ohm = Table(0.020);
  const fit::ArrheniusFit a = fit::fit_arrhenius(log, steps, cell, 25.0, "(test)");
  CHECK_FALSE(a.fitted);
  CHECK(a.ea_J_per_mol == doctest::Approx(30000.0));
  CHECK(a.how.rfind("prior E_a 30 kJ/mol", 0) == 0);
}

}  // TEST_SUITE
