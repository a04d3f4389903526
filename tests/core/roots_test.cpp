// The bracketed root finder: its iteration cap is a LimitError, its answers are within the
// tolerance asked for.
#include "core/roots.hpp"

#include <doctest/doctest.h>

#include <cmath>
#include <limits>

#include "core/error.hpp"

using namespace sortie;

TEST_SUITE("core") {

TEST_CASE("find_root: the root of x² − 2 to the tolerance asked for") {
  const auto r = find_root([](double x) { return x * x - 2.0; }, 0.0, 2.0, 1e-12);
  REQUIRE(r);
  CHECK(std::fabs(*r - std::sqrt(2.0)) < 1e-12);
  CHECK_FALSE(find_root([](double x) { return x * x + 1.0; }, -1.0, 1.0, 1e-9));  // no sign change
}

TEST_CASE("find_root: the iteration cap is a LimitError naming the bracket") {
  // A jump at x = 1/3: the bracket shrinks, but 3 evaluations cannot reach 1e-15.
  auto step = [](double x) { return x < 1.0 / 3.0 ? -1.0 : 1.0; };
  CHECK_THROWS_WITH_AS(find_root(step, 0.0, 1.0, 1e-15, 3), "root finder did not converge in 3 iterations on [0, 1]",
                       LimitError);
  const auto r = find_root(step, 0.0, 1.0, 1e-9, 200);
  REQUIRE(r);
  CHECK(std::fabs(*r - 1.0 / 3.0) < 1e-9);
}

TEST_CASE("find_root: a sign change across a bracket of no width is its point — not a boost domain_error") {
  // Found by the load_csv fuzz target (fuzz/regressions/load_csv/time-minus-1e300-s.csv): an
  // integration step too short to move t = -1e300 s bracketed an event on [t, t], and TOMS 748
  // threw std::domain_error ("Parameters a and b out of order").
  const double t = -1e300;
  const auto r = find_root([](double) { return 0.0; }, t, t, 1.0, -1.0, 1e-4);
  REQUIRE(r);
  CHECK(*r == t);
}

TEST_CASE("find_root: a bracket with a non-finite end has no root") {
  const double inf = std::numeric_limits<double>::infinity();
  CHECK_FALSE(find_root([](double x) { return x; }, -1.0, inf, -1.0, 1.0, 1e-9));
  CHECK_FALSE(find_root([](double x) { return x; }, std::nan(""), 1.0, -1.0, 1.0, 1e-9));
}

}  // TEST_SUITE
