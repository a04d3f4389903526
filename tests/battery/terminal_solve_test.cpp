// The terminal solve under a power demand when no EMF is left: a collapse with a finite current,
// never the far root.
#include "battery/thevenin.hpp"

#include <doctest/doctest.h>

#include <cmath>

using namespace sortie;

TEST_SUITE("battery") {

TEST_CASE("power demand with the EMF at or below zero is a collapse — not a huge negative current") {
  // With E ≤ 0 (an integrator's trial stage can push the RC voltages past the OCV) the
  // quadratic R0·I² − E·I + P = 0 still has real roots, and 2P/(E + √D) picked one near
  // −E/R0·1e4: a charging current that blew the state up into NaN.
  for (double E : {0.0, -1e-9, -5.0, -363.0}) {
    INFO("E = " << E);
    const auto t = battery::solve_terminal(E, 0.027, 15.0, battery::Demand::power(16.5), 0.0);
    CHECK(t.collapsed);
    CHECK(t.discriminant < 0.0);
    CHECK(t.current_A == 0.0);
    CHECK(std::isfinite(t.v_terminal_V));
  }
  // The reported discriminant is continuous through E = 0 (the event locator brackets it):
  // just above and just below, both near −4·R0·P.
  const auto above = battery::solve_terminal(1e-9, 0.027, 15.0, battery::Demand::power(16.5), 0.0);
  const auto below = battery::solve_terminal(-1e-9, 0.027, 15.0, battery::Demand::power(16.5), 0.0);
  CHECK(above.discriminant == doctest::Approx(-4.0 * 0.027 * 16.5).epsilon(1e-9));
  CHECK(below.discriminant == doctest::Approx(-4.0 * 0.027 * 16.5).epsilon(1e-9));
}

TEST_CASE("power demand of zero with no EMF draws no current (was 0/0)") {
  const auto t = battery::solve_terminal(-2.0, 0.03, 15.0, battery::Demand::power(0.0), 0.0);
  CHECK_FALSE(t.collapsed);
  CHECK(t.current_A == 0.0);
}

TEST_CASE("negative power (charging) with no EMF left stays finite") {
  const auto t = battery::solve_terminal(-2.0, 0.03, 15.0, battery::Demand::power(-50.0), 0.0);
  CHECK_FALSE(t.collapsed);
  CHECK(std::isfinite(t.current_A));
  CHECK(t.v_terminal_V * t.current_A == doctest::Approx(-50.0).epsilon(1e-9));
}

}  // TEST_SUITE
