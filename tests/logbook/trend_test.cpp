#include <doctest/doctest.h>

#include <cmath>

#include "logbook/trend.hpp"

using namespace sortie::logbook;

// Reference: the normal equations solved by hand for the points (1, 1.00), (2, 0.98), (3, 0.97),
// (4, 0.94), (5, 0.93): x̄ = 3, ȳ = 0.964, Sxx = 10, Sxy = −0.18, so b = −0.018,
// a = 0.964 + 0.054 = 1.018; residuals 0, −0.002, 0.006, −0.006, 0.002, Σr² = 8e−5, s² = 8e−5/3,
// Var b = s²/10 = 2.6667e−6, Var a = s²(1/5 + 9/10) = 2.9333e−5, Cov = −3s²/10 = −8e−6.
TEST_CASE("trend: least squares on five points matches the normal equations done by hand") {
  const auto f = fit_line({1, 2, 3, 4, 5}, {1.00, 0.98, 0.97, 0.94, 0.93});
  REQUIRE(f);
  CHECK(f->slope == doctest::Approx(-0.018).epsilon(1e-12));
  CHECK(f->intercept == doctest::Approx(1.018).epsilon(1e-12));
  CHECK(f->slope_sd == doctest::Approx(std::sqrt(8e-5 / 3 / 10)).epsilon(1e-9));
  CHECK(f->intercept_sd == doctest::Approx(std::sqrt(8e-5 / 3 * 1.1)).epsilon(1e-9));
  CHECK(f->covariance == doctest::Approx(-3 * 8e-5 / 3 / 10).epsilon(1e-9));
  // Limit 0.8: x* = (0.8 − 1.018)/(−0.018) = 12.111; σ² = (Var a + x*² Var b + 2x* Cov)/b².
  const Crossing c = crossing(*f, 0.8, true);
  REQUIRE(c.reached);
  const double xs = 0.218 / 0.018;
  CHECK(c.x == doctest::Approx(xs).epsilon(1e-12));
  const double s2 = 8e-5 / 3;
  const double var = s2 * 1.1 + xs * xs * s2 / 10 + 2 * xs * (-3 * s2 / 10);
  CHECK(c.x_sd == doctest::Approx(std::sqrt(var) / 0.018).epsilon(1e-9));
  // A rising resistance never reaches a falling limit.
  CHECK_FALSE(crossing(*f, 1.3, false).reached);
}

TEST_CASE("trend: fewer than three points or one x gives no line") {
  CHECK_FALSE(fit_line({1, 2}, {1, 0.9}));
  CHECK_FALSE(fit_line({2, 2, 2}, {1, 0.9, 0.8}));
}

TEST_CASE("trend: dates to day counts and back") {
  // 2000-03-01 is day 11017 after 1970-01-01 (30 years of 365 days plus 7 leap days, then
  // 31 + 29 days of 2000): 10950 + 7 + 60 = 11017.
  CHECK(days_from_date("2000-03-01") == 11017);
  CHECK(days_from_date("1970-01-01") == 0);
  CHECK(date_from_days(11017) == "2000-03-01");
  for (long d = -1000; d < 30000; d += 37) CHECK(days_from_date(date_from_days(d)) == d);
  CHECK_FALSE(days_from_date("2026-02-29"));
  CHECK(days_from_date("2024-02-29"));
  CHECK_FALSE(days_from_date("2026-13-01"));
  CHECK_FALSE(days_from_date("26-1-1"));
}
