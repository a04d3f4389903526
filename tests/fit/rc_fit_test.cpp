// The RC identification problem: its analytic Jacobian against finite differences, and exact
// recovery of known parameters from a noise-free synthetic log.
#include "fit/rc_fit.hpp"

#include <doctest/doctest.h>

#include <cmath>

#include "io/battery_json.hpp"
#include "sim/synthetic_log.hpp"
#include "support/cli.hpp"

using namespace sortie;

namespace {

struct Case {
  battery::Cell cell;
  sim::SyntheticLog s;
  battery::CellLog log;
};

Case noise_free() {
  Case c;
  c.cell = io::load_cell_file(test::source_path("models/cells/demo-lipo-5000.json"));
  sim::MeasurementNoise none;
  none.voltage_sd_V = none.voltage_step_V = none.current_sd_A = none.current_step_A = 0.0;
  c.s = sim::synthetic_pulse_test(c.cell, sim::PulseTestProtocol{}, none);
  c.log.file = "synthetic";
  c.log.time_s = c.s.time_s;
  c.log.current_A = c.s.current_A;
  c.log.voltage_V = c.s.voltage_V;
  c.log.line.resize(c.s.time_s.size());
  return c;
}

std::vector<double> tenths() {
  std::vector<double> k;
  for (int j = 0; j <= 10; ++j) k.push_back(j / 10.0);
  return k;
}

}  // namespace

TEST_SUITE("fit") {

TEST_CASE("rc fit: the forward-sensitivity Jacobian matches central differences") {
  const Case c = noise_free();
  for (const auto merge : {fit::RcProblem::RowMerge::none, fit::RcProblem::RowMerge::held_current}) {
  CAPTURE(static_cast<int>(merge));
  fit::RcProblem p(c.log, c.s.soc_true, c.cell.ocv_V, {0.2, 0.5, 0.8}, 2, {}, merge);
  std::vector<double> grid;
  for (int i = 0; i <= 20; ++i) grid.push_back(i / 20.0);
  p.free_ocv(grid, 0.01);
  p.set_smoothing(0.01);
  fit::RcSolution s;
  s.t = fit::RcTables::constant({0.2, 0.5, 0.8}, 2, 0.004, {0.0015, 0.002}, {5.0, 70.0});
  s.t.r0_ohm[2] = 0.0033;
  s.t.tau_s[1][0] = 110.0;
  const Eigen::VectorXd z = p.to_z(s);
  fit::NormalEquations ne;
  p.evaluate(z, true, ne, true);
  // The gradient of the cost is Jᵀe; compare with (c(z + h) − c(z − h))/2h, h = 1e-6 (central
  // differences, error O(h²)·c''' — far below the 1e-5 relative tolerance here).
  for (Eigen::Index i = 0; i < z.size(); ++i) {
    Eigen::VectorXd zp = z, zm = z;
    const double h = 1e-6;
    zp[i] += h;
    zm[i] -= h;
    fit::NormalEquations a, b;
    p.evaluate(zp, false, a, true);
    p.evaluate(zm, false, b, true);
    const double fd = (a.cost - b.cost) / (2 * h);
    CHECK_MESSAGE(ne.jtr[i] == doctest::Approx(fd).epsilon(1e-5).scale(1e-9), "parameter " << i);
  }
  }
}

TEST_CASE("rc fit: noise-free data give the model's R0 table and RC pairs and OCV back") {
  const Case c = noise_free();
  const std::vector<double> knots = tenths();
  fit::RcProblem p(c.log, c.s.soc_true, c.cell.ocv_V, knots, 2);
  p.set_shared(2, true);
  p.set_shared(4, true);
  std::vector<double> grid;
  for (int i = 0; i <= 10; ++i) grid.push_back(i / 10.0);  // the model's own OCV points
  p.free_ocv(grid, 0.0);
  fit::RcSolution s0;
  s0.t = fit::RcTables::constant(knots, 2, 0.004, {0.001, 0.001}, {3.0, 60.0});
  fit::RcBounds b;
  fit::LmOptions o;
  o.cost_rel_tol = 1e-14;
  const auto r = p.solve(s0, b, o);
  const auto got = p.from_z(r.x);
  for (std::size_t j = 0; j < knots.size(); ++j) {
    // R0 is piecewise linear on 0, 0.1, 0.2, 0.5, 1.0 in the model: exact on these knots.
    CHECK(got.t.r0_ohm[j] == doctest::Approx(c.cell.r0_ohm(knots[j])).epsilon(1e-5));
    CHECK(got.t.r_ohm[0][j] == doctest::Approx(0.0012).epsilon(1e-4));
    CHECK(got.t.r_ohm[1][j] == doctest::Approx(0.0018).epsilon(1e-4));
  }
  CHECK(got.t.tau_s[0][0] == doctest::Approx(6.0).epsilon(1e-5));
  CHECK(got.t.tau_s[1][0] == doctest::Approx(90.0).epsilon(1e-5));
  for (std::size_t o2 = 0; o2 < grid.size(); ++o2)
    CHECK(got.ocv_V[o2] == doctest::Approx(c.cell.ocv_V(grid[o2])).epsilon(1e-6));
}

TEST_CASE("rc fit: merging held-current rows keeps the cost and the fitted pairs of a fast log") {
  // The noise-free pulse test logged every 50 ms throughout: merged rows must stand for the rows
  // they replace (weights), so the cost at any parameters and the fit agree with the row-by-row
  // problem. An independent check: the row-by-row recurrence is exact for a held current.
  const battery::Cell cell = io::load_cell_file(test::source_path("models/cells/demo-lipo-5000.json"));
  sim::MeasurementNoise none;
  none.voltage_sd_V = none.voltage_step_V = none.current_sd_A = none.current_step_A = 0.0;
  sim::PulseTestProtocol proto;
  proto.sample_s = proto.pulse_sample_s = proto.rest_sample_s = 0.05;
  const sim::SyntheticLog s = sim::synthetic_pulse_test(cell, proto, none);
  battery::CellLog log;
  log.file = "synthetic";
  log.time_s = s.time_s, log.current_A = s.current_A, log.voltage_V = s.voltage_V;
  log.line.resize(s.time_s.size());
  const std::vector<double> knots{0.2, 0.5, 0.8};
  using M = fit::RcProblem::RowMerge;
  fit::RcProblem each(log, s.soc_true, cell.ocv_V, knots, 2, {}, M::none);
  fit::RcProblem merged(log, s.soc_true, cell.ocv_V, knots, 2, {}, M::held_current);
  CHECK(each.rows_evaluated() == log.size());
  CHECK(merged.rows_evaluated() < log.size() / 5);  // mostly held current: far fewer rows
  CHECK(merged.rows_used() == each.rows_used());
  fit::RcSolution probe;
  probe.t = fit::RcTables::constant(knots, 2, 0.005, {0.002, 0.003}, {4.0, 50.0});
  CHECK(merged.data_cost(probe) == doctest::Approx(each.data_cost(probe)).epsilon(0.02));
  for (fit::RcProblem* p : {&each, &merged}) {
    p->set_shared(2, true);
    p->set_shared(4, true);
  }
  fit::RcSolution s0;
  s0.t = fit::RcTables::constant(knots, 2, 0.004, {0.001, 0.001}, {3.0, 60.0});
  const auto a = each.from_z(each.solve(s0, fit::RcBounds{}).x);
  const auto b = merged.from_z(merged.solve(s0, fit::RcBounds{}).x);
  for (std::size_t j = 0; j < knots.size(); ++j) {
    CHECK(b.t.r0_ohm[j] == doctest::Approx(a.t.r0_ohm[j]).epsilon(1e-3));
    CHECK(b.t.r_ohm[0][j] == doctest::Approx(a.t.r_ohm[0][j]).epsilon(1e-2));
    CHECK(b.t.r_ohm[1][j] == doctest::Approx(a.t.r_ohm[1][j]).epsilon(1e-2));
  }
  CHECK(b.t.tau_s[0][0] == doctest::Approx(a.t.tau_s[0][0]).epsilon(1e-2));
  CHECK(b.t.tau_s[1][0] == doctest::Approx(a.t.tau_s[1][0]).epsilon(1e-2));
}

TEST_CASE("rc fit: a current step shows R = -dV/dI") {
  battery::CellLog log;
  log.time_s = {0, 1, 2, 3};
  log.current_A = {0, 0, 5, 5};
  log.voltage_V = {3.8, 3.8, 3.75, 3.749};
  log.line = {2, 3, 4, 5};
  const auto steps = fit::find_current_steps(log, {0.5, 0.5, 0.5, 0.5}, 1.0);
  REQUIRE(steps.size() == 1);
  CHECK(steps[0].row == 2);
  CHECK(steps[0].r_ohm == doctest::Approx(0.01));
}

}  // TEST_SUITE
