// The SoC filter on a real cell: the open dataset of a 33 Ah pouch Li-ion cell from Oak Ridge
// National Laboratory — G. Wiggins, S. Allu, H. Wang (ORNL), "Battery cell data", 2019,
// doi:10.5281/zenodo.2580327 (MIT licence; ../shared/data/ornl-pouch-33Ah/SOURCE.md), read where
// it is. The cell model is fitted on the 25 °C pulse test; the filter then reads the measured
// 1C discharges (each after a full CC-CV charge and a rest) from a start guess 20 points low, and
// its SoC is compared with Coulomb counting from full on the fitted capacity.
#include <doctest/doctest.h>

#include <cmath>

#include "estimate/soc_filter.hpp"
#include "fit/fit_cell.hpp"
#include "io/cell_log_csv.hpp"
#include "support/open_data.hpp"

using namespace sortie;

TEST_SUITE("ornl") {

TEST_CASE("ornl: the SoC filter on the measured 1C discharges follows Coulomb counting from full") {
  if (!test::open_dataset("ornl-pouch-33Ah", "hppc-25C.csv")) return;
  const std::string dir = (test::open_data_root() / "ornl-pouch-33Ah").string() + "/";
  const battery::CellLog hppc = io::load_cell_log(dir + "hppc-25C.csv", io::CellLogOptions{});
  const fit::CellFitResult fit = fit::fit_cell(hppc, fit::CellFitOptions{});
  battery::Pack pack;
  pack.cell = fit.cell;
  io::CellLogOptions o;  // columns as SOURCE.md lists them; current positive on charge
  o.columns = io::parse_column_spec("time=2,current=9,voltage=10,exclude=1,mode=14", io::cell_log_quantities());
  o.discharge_positive = false;
  const battery::CellLog log = io::load_cell_log(dir + "discharge-1C.csv", o);
  int sections = 0;
  for (std::size_t k = 1; k + 1 < log.size(); ++k) {
    if (log.mode[k] != "discharge" || log.mode[k - 1] == "discharge") continue;
    sim::MeasuredFlight f;  // from the rest sample before the step
    f.time_s.push_back(0.0);
    f.current_A.push_back(0.0);
    f.voltage_V.push_back(log.voltage_V[k - 1]);
    for (std::size_t j = k; j < log.size() && log.mode[j] == "discharge"; ++j) {
      f.time_s.push_back(log.time_s[j] - log.time_s[k - 1]);
      f.current_A.push_back(log.current_A[j]);
      f.voltage_V.push_back(log.voltage_V[j]);
    }
    estimate::FilterOptions fo;
    fo.soc0 = 0.8;  // truth: 1 (full)
    fo.soc0_sd = 0.2;
    fo.voltage_sd_V = 0.025;  // the fitted model's own voltage error on these runs (tests/fit/ornl_test.cpp)
    const estimate::FilterResult r = estimate::run_soc_filter(pack, f, f.time_s.size(), fo);
    double q = 0.0, worst = 0.0;
    for (std::size_t j = 1; j < f.time_s.size(); ++j) {
      q += f.current_A[j] * (f.time_s[j] - f.time_s[j - 1]);
      const double counted = 1.0 - q / (3600.0 * pack.capacity_Ah());
      if (counted < 0.9 && counted > 0.1) worst = std::max(worst, std::abs(r.rows[j].soc - counted));
    }
    MESSAGE("section " << sections << ": largest |filter - counted| SoC between 90 % and 10 %: " << worst);
    CHECK(worst < 0.02);  // measured 0.7–1.0 points
    ++sections;
  }
  CHECK(sections == 4);
}

}  // TEST_SUITE
