// Shape-preserving cubic interpolation against its defining properties and a hand-worked case.
#include <doctest/doctest.h>

#include <cmath>

#include "core/monotone_cubic.hpp"

using sortie::MonotoneCubic;

TEST_SUITE("core") {

TEST_CASE("monotone cubic: straight lines stay straight — points are kept") {
  // Equal secants give equal slopes (the harmonic mean of equal numbers, and the three-point
  // end rule on a line), so linear data are reproduced exactly, inside and beyond the ends.
  const MonotoneCubic line({0.0, 0.5, 2.0, 3.0, 7.0}, {1.0, 2.0, 5.0, 7.0, 15.0});
  for (double x = -1.0; x <= 8.0; x += 0.125) {
    CHECK(line(x) == doctest::Approx(1.0 + 2.0 * x).epsilon(1e-14));
    CHECK(line.slope(x) == doctest::Approx(2.0).epsilon(1e-13));
  }
  const MonotoneCubic two({1.0, 3.0}, {4.0, 0.0});
  CHECK(two(2.0) == doctest::Approx(2.0));
  CHECK(two(5.0) == doctest::Approx(-4.0));
  const MonotoneCubic c({0.0, 1.0, 2.5, 3.0}, {0.0, 2.0, 2.2, 9.0});
  for (std::size_t k = 0; k < 4; ++k) CHECK(c(c.x()[k]) == c.y()[k]);
}

TEST_CASE("monotone cubic: monotone data give a monotone curve without overshoot") {
  // The property that defines the method (Fritsch and Carlson, SIAM J. Numer. Anal. 17, 1980):
  // a step in the data does not ring, where an ordinary cubic spline would overshoot.
  const MonotoneCubic s({0.0, 1.0, 2.0, 3.0, 4.0, 5.0}, {0.0, 0.0, 0.1, 1.0, 1.0, 1.0});
  double last = -1.0;
  for (double x = 0.0; x <= 5.0; x += 0.001) {
    const double y = s(x);
    CHECK(y >= last - 1e-15);
    CHECK(y >= 0.0);
    CHECK(y <= 1.0 + 1e-15);  // rounding in the Hermite sum
    last = y;
  }
}

TEST_CASE("monotone cubic: a case worked by hand") {
  // x = 0, 1, 2, 3 and y = x²: secants δ = 1, 3, 5. Interior slopes by the weighted harmonic mean
  // (equal widths: w1 = w2 = 3): m1 = 6/(3/1 + 3/3) = 1.5, m2 = 6/(3/3 + 3/5) = 3.75. Ends by the
  // three-point rule ((2h0 + h1)·δ0 − h0·δ1)/(h0 + h1): m0 = (3 − 3)/2 = 0, m3 = (15 − 3)/2 = 6
  // (C. Moler, Numerical Computing with MATLAB, 2004, §3.4; worked here by hand). At x = 1.5 the
  // Hermite basis at t = ½ is (½, ⅛, ½, −⅛): y = ½·1 + ⅛·1.5 + ½·4 − ⅛·3.75 = 2.21875.
  const MonotoneCubic q({0.0, 1.0, 2.0, 3.0}, {0.0, 1.0, 4.0, 9.0});
  CHECK(q(1.5) == doctest::Approx(2.21875).epsilon(1e-15));
  CHECK(q.slope(1.0) == doctest::Approx(1.5).epsilon(1e-15));
  CHECK(q.slope(2.0) == doctest::Approx(3.75).epsilon(1e-15));
  CHECK(q.slope(0.0) == 0.0);
  CHECK(q.slope(3.0) == doctest::Approx(6.0).epsilon(1e-15));
  // The slope is the derivative of the curve: central differences agree to O(h²).
  for (double x : {0.3, 1.2, 2.7}) {
    const double h = 1e-5;
    CHECK(q.slope(x) == doctest::Approx((q(x + h) - q(x - h)) / (2.0 * h)).epsilon(1e-8));
  }
}

}  // TEST_SUITE
