// Replaying a logged current against closed forms (Thevenin model, one RC pair, flat OCV):
// after a current step from rest, V(t) = OCV − I·R0 − I·R1·(1 − e^(−t/τ)); at rest after a
// stretch of length T, v1 decays as I·R1·(1 − e^(−T/τ))·e^(−t/τ) (first-order linear ODE,
// standard solution).
#include "sim/replay.hpp"

#include <doctest/doctest.h>

#include <cmath>

#include "support/cells.hpp"

using namespace sortie;

TEST_SUITE("sim") {

TEST_CASE("replay: a current step and a rest follow the one-RC closed form at every log time") {
  const double r0 = 0.01, r1 = 0.005, tau = 20.0, ocv = 3.7, I = 3.0;
  battery::Pack p = test::single(test::analytic_cell(100.0, ocv, 0.0, r0, {{Table(r1), Table(tau)}}), 0.8);
  // Irregular times; sample k's current flowed over (t[k-1], t[k]].
  sim::CurrentLog log;
  log.time_s = {0.0, 0.5, 1.7, 5.0, 30.0, 60.0, 61.0, 75.0, 200.0};
  log.current_A = {0.0, I, I, I, I, I, 0.0, 0.0, 0.0};
  const auto r = sim::replay(p, log);
  for (std::size_t k = 0; k < log.time_s.size(); ++k) {
    const double t = log.time_s[k];
    double want;
    if (t <= 60.0) want = ocv - log.current_A[k] * r0 - I * r1 * (1.0 - std::exp(-t / tau));
    else want = ocv - I * r1 * (1.0 - std::exp(-60.0 / tau)) * std::exp(-(t - 60.0) / tau);
    CHECK(r.v_terminal_V[k] == doctest::Approx(want).epsilon(1e-8));
  }
  // Charge: SoC falls by I·60 s / (3600·100 Ah).
  CHECK(r.soc.back() == doctest::Approx(0.8 - I * 60.0 / 360000.0).epsilon(1e-10));
  // Equal currents in a row are one stretch: two here (I from 0 to 60 s, then 0 to 200 s).
  CHECK(r.segments == 2);
}

TEST_CASE("replay: a new section starts with the RC pair relaxed and keeps the charge") {
  const double r0 = 0.01, r1 = 0.005, tau = 20.0, I = 2.0;
  battery::Pack p = test::single(test::analytic_cell(10.0, 3.5, 1.0, r0, {{Table(r1), Table(tau)}}), 0.5);
  sim::CurrentLog log;
  log.time_s = {0.0, 100.0, 101.0, 102.0};
  log.current_A = {0.0, I, I, I};
  log.restarts = {2};
  const auto r = sim::replay(p, log);
  const double soc = 0.5 - I * 100.0 / 36000.0;  // no charge counted across the gap
  CHECK(r.soc[2] == doctest::Approx(soc).epsilon(1e-10));
  // At the restart row v1 = 0: V = OCV(SoC) − I·R0 with OCV = 3.5 + 1.0·SoC.
  CHECK(r.v_terminal_V[2] == doctest::Approx(3.5 + soc - I * r0).epsilon(1e-10));
  const double soc3 = soc - I * 1.0 / 36000.0;
  CHECK(r.v_terminal_V[3] == doctest::Approx(3.5 + soc3 - I * r0 - I * r1 * (1 - std::exp(-1.0 / tau))).epsilon(1e-7));
}

}  // TEST_SUITE
