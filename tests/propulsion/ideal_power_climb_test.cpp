// Ideal (momentum-theory) power of a rotor in axial climb against the momentum balance solved
// here by bisection, rather than against its closed form.
#include <doctest/doctest.h>

#include <cmath>
#include <numbers>

#include "propulsion/propeller.hpp"

using namespace sortie;

TEST_SUITE("propulsion") {

TEST_CASE("propeller: ideal power in axial climb is T·(V + v_i) with v_i from the momentum balance") {
  // Momentum theory in axial climb (J. G. Leishman, Principles of Helicopter Aerodynamics, 2nd
  // ed., 2006, ch. 2): the disc of area A moves air at V + v_i through it, and
  //   T = 2ρA·(V + v_i)·v_i,   P_ideal = T·(V + v_i).
  // v_i found by bisection on the balance (monotone in v_i ≥ 0), to 1e-15 relative.
  propulsion::Prop p;
  p.diameter_m = 0.381;
  const double A = std::numbers::pi * p.diameter_m * p.diameter_m / 4.0;
  for (const double rho : {1.225, 0.95})
    for (const double V : {0.0, 1.5, 6.0, 20.0})
      for (const double T : {0.5, 6.0, 30.0}) {
        CAPTURE(rho);
        CAPTURE(V);
        CAPTURE(T);
        double lo = 0.0, hi = 100.0;
        for (int k = 0; k < 200; ++k) {
          const double mid = 0.5 * (lo + hi);
          (2.0 * rho * A * (V + mid) * mid < T ? lo : hi) = mid;
        }
        const double vi = 0.5 * (lo + hi);
        CHECK(propulsion::ideal_power_W(p, T, V, rho) == doctest::Approx(T * (V + vi)).epsilon(1e-12));
      }
}

}  // TEST_SUITE
