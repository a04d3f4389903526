// SoC by Coulomb counting from full and empty points, and the OCV table from rest ends, loaded
// curves and fitted grids.
#include <doctest/doctest.h>

#include <array>
#include <cmath>

#include "core/error.hpp"
#include "fit/fit_cell.hpp"
#include "fit/ocv.hpp"
#include "fit/soc.hpp"

using namespace sortie;

namespace {

/// A log at 1 s: `phases` of (current A, seconds, voltage at the end); the voltage moves
/// linearly through each phase from the previous end (enough for anchors and rests).
battery::CellLog make_log(const std::vector<std::array<double, 3>>& phases, double v0) {
  battery::CellLog log;
  log.file = "log.csv";
  double t = 0.0, v = v0;
  log.time_s.push_back(0.0), log.current_A.push_back(0.0), log.voltage_V.push_back(v0), log.line.push_back(2);
  for (const auto& [i, dur, v_end] : phases) {
    const int n = static_cast<int>(dur);
    for (int k = 1; k <= n; ++k) {
      t += 1.0;
      log.time_s.push_back(t);
      log.current_A.push_back(i);
      log.voltage_V.push_back(v + (v_end - v) * k / n);
      log.line.push_back(log.line.back() + 1);
    }
    v = v_end;
  }
  return log;
}

}  // namespace

TEST_SUITE("fit") {

TEST_CASE("soc: a CC-CV charge to full then a discharge to cutoff gives the capacity and SoC 1 to 0") {
  // 2 Ah cell: charge at 2 A for 3000 s to 4.2 V, CV taper 1 A then 0.2 A, rest, discharge at
  // 1 A for 7200 s to 3.0 V. Capacity = 1 A·7200 s = 2.0 Ah.
  const auto log = make_log({{-2.0, 3000, 4.2}, {-1.0, 300, 4.2}, {-0.2, 300, 4.2}, {0.0, 600, 4.15},
                             {1.0, 7200, 3.0}, {0.0, 600, 3.3}},
                            3.3);
  const auto se = fit::estimate_soc(log, {});
  REQUIRE(se.anchors.size() == 2);
  CHECK(se.anchors[0].kind == fit::SocAnchor::Kind::full);
  CHECK(se.anchors[1].kind == fit::SocAnchor::Kind::empty);
  CHECK(se.capacity_Ah == doctest::Approx(2.0));
  CHECK(se.capacity_from_log);
  CHECK(se.soc[se.anchors[0].row] == doctest::Approx(1.0));
  CHECK(se.soc[se.anchors[1].row] == doctest::Approx(0.0).epsilon(1e-12));
  CHECK(se.soc[se.anchors[0].row + 600 + 3600] == doctest::Approx(0.5));  // half way down
}

TEST_CASE("soc: with one known point the capacity must be given") {
  const auto log = make_log({{1.0, 3600, 3.0}, {0.0, 600, 3.4}}, 4.1);  // only an empty point
  fit::SocOptions o;
  o.chemistry = "Li-ion";  // its usual end of discharge reaches 3.0 V (fit/chemistry)
  CHECK_THROWS_WITH_AS(fit::estimate_soc(log, o), doctest::Contains("expected --capacity-Ah"), InputError);
  o.capacity_Ah = 4.0;
  const auto se = fit::estimate_soc(log, o);
  CHECK(se.soc.front() == doctest::Approx(0.25));  // 1 Ah above empty of 4 Ah
}

TEST_CASE("soc: no full or empty point is an error unless --soc0 is given") {
  const auto log = make_log({{1.0, 60, 3.79}, {0.0, 600, 3.8}, {1.0, 60, 3.79}}, 3.8);
  fit::SocOptions o;
  o.v_cutoff_V = 3.0;  // the log never gets there
  o.v_max_V = 4.2;
  CHECK_THROWS_WITH_AS(fit::estimate_soc(log, o), doctest::Contains("no known full or empty point"), InputError);
  o.soc0 = 0.6;
  o.capacity_Ah = 1.0;
  const auto se = fit::estimate_soc(log, o);
  CHECK(se.soc.back() == doctest::Approx(0.6 - 120.0 / 3600.0));
}

TEST_CASE("ocv: rest points set the level and the loaded curve the shape between them") {
  // True OCV 3.5 + 0.6·s + 0.1·sin(6s); rests at 0.2 and 0.8 exact; loaded points 15 mV low
  // (the drop left in them) — the shift through the rests removes that.
  auto ocv = [](double s) { return 3.5 + 0.6 * s + 0.1 * std::sin(6 * s); };
  std::vector<fit::OcvPoint> rest = {{0.2, ocv(0.2)}, {0.8, ocv(0.8)}}, loaded;
  for (int i = 100; i <= 900; ++i) loaded.push_back({i / 1000.0, ocv(i / 1000.0) - 0.015});
  std::vector<double> grid;
  for (int i = 0; i <= 40; ++i) grid.push_back(i / 40.0);
  const auto built = fit::build_ocv(rest, loaded, grid);
  REQUIRE(built);
  const fit::OcvTable& t = *built;
  for (double s : {0.2, 0.35, 0.5, 0.65, 0.8}) CHECK(t.ocv(s) == doctest::Approx(ocv(s)).epsilon(0.002 / 3.9));
  CHECK(t.ocv.strictly_increasing_y());
  CHECK(t.rest_points == 2);
}

TEST_CASE("ocv: a grid becomes a strictly rising table of at least 11 points within tolerance") {
  std::vector<double> g, v;
  for (int i = 0; i <= 100; ++i) {
    g.push_back(i / 100.0);
    v.push_back(3.3 + 0.9 * g.back() + (i == 50 ? -0.02 : 0.0));  // one 20 mV dip
  }
  std::vector<std::string> warnings;
  const Table t = fit::ocv_table_from_grid(g, v, 0.0005, warnings);
  CHECK(t.size() >= 11);
  CHECK(t.strictly_increasing_y());
  CHECK(t.x().front() == 0.0);
  CHECK(t.x().back() == 1.0);
  CHECK(t(0.25) == doctest::Approx(3.3 + 0.9 * 0.25).epsilon(1e-3));
  REQUIRE(warnings.size() == 1);  // the dip was levelled, and said so
  CHECK(warnings[0].find("falls with rising SoC") != std::string::npos);
}

TEST_CASE("ocv: rests are found with their duration from the end of the load") {
  const auto log = make_log({{1.0, 100, 3.7}, {0.0, 400, 3.75}, {1.0, 50, 3.7}, {0.0, 30, 3.72}}, 3.8);
  const auto rests = fit::find_rests(log, 0.01);
  REQUIRE(rests.size() == 3);  // the first row, the long rest, the short one
  CHECK(rests[1].duration_s == doctest::Approx(400.0));
  CHECK(rests[2].duration_s == doctest::Approx(30.0));
}

TEST_CASE("fit cell: a log that is all charge is refused rather than fitted to nothing") {
  // A CC-CV charge and nothing else: its rows and the rest after it are not counted.
  const auto log = make_log({{-2.0, 3000, 4.2}, {-1.0, 300, 4.2}, {-0.2, 300, 4.2}, {0.0, 600, 4.15}}, 3.3);
  fit::CellFitOptions o;
  o.soc.capacity_Ah = 2.0;
  CHECK_THROWS_WITH_AS(fit::fit_cell(log, o), doctest::Contains("log.csv: only 1 rows outside long charges"), InputError);
}

}  // TEST_SUITE

TEST_CASE("ocv: open-circuit points outside the grid give no table (regression: an assertion found by fuzzing fit cell)") {
  // The grid spans the SoC of the rows the fit counts; rests that all lie beyond it (a clock jump
  // to 1e9 s made the counted rows a sliver of SoC) leave no grid point with data.
  std::vector<fit::OcvPoint> rest = {{0.95, 4.1}, {0.97, 4.12}}, loaded;
  const std::vector<double> grid = {0.0, 0.25, 0.5};
  CHECK_FALSE(fit::build_ocv(rest, loaded, grid).has_value());
  rest.push_back({0.3, 3.8});
  CHECK(fit::build_ocv(rest, loaded, grid).has_value());
}
