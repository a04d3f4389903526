// The bounded Levenberg–Marquardt solver on problems with known minima.
#include "fit/levenberg_marquardt.hpp"

#include <doctest/doctest.h>

#include <cmath>
#include <random>

using namespace sortie;

namespace {

/// A problem from residuals r(x) and their Jacobian J(x), as normal equations.
fit::LeastSquaresProblem from_residuals(std::function<Eigen::VectorXd(const Eigen::VectorXd&)> r,
                                        std::function<Eigen::MatrixXd(const Eigen::VectorXd&)> j) {
  return [r, j](const Eigen::VectorXd& x, bool jac, fit::NormalEquations& ne) {
    const Eigen::VectorXd e = r(x);
    ne.cost = 0.5 * e.squaredNorm();
    if (!jac) return;
    const Eigen::MatrixXd J = j(x);
    ne.jtj = J.transpose() * J;
    ne.jtr = J.transpose() * e;
  };
}

}  // namespace

TEST_SUITE("fit") {

TEST_CASE("levenberg-marquardt: Rosenbrock's valley from the classic start to its minimum at x = y = 1") {
  // f = 100·(y − x²)² + (1 − x)² as residuals 10·(y − x²), 1 − x; minimum 0 at (1, 1)
  // (H. H. Rosenbrock, Computer Journal 3, 1960; the classic start point −1.2, 1).
  const auto f = from_residuals(
      [](const Eigen::VectorXd& x) { return Eigen::Vector2d(10.0 * (x[1] - x[0] * x[0]), 1.0 - x[0]); },
      [](const Eigen::VectorXd& x) {
        Eigen::Matrix2d j;
        j << -20.0 * x[0], 10.0, -1.0, 0.0;
        return Eigen::MatrixXd(j);
      });
  fit::LmOptions o;
  o.cost_rel_tol = 1e-14;
  const auto r = fit::levenberg_marquardt(f, Eigen::Vector2d(-1.2, 1.0), Eigen::Vector2d(-10, -10),
                                          Eigen::Vector2d(10, 10), o);
  CHECK(r.status == fit::LmStatus::converged);
  CHECK(r.x[0] == doctest::Approx(1.0).epsilon(1e-5));
  CHECK(r.x[1] == doctest::Approx(1.0).epsilon(1e-5));
}

TEST_CASE("levenberg-marquardt: an exponential decay is recovered from noisy samples") {
  // y = A·e^(−t/τ) + noise (seed 42); least squares recovers A and τ to within a few standard
  // errors: with σ = 0.001 on A = 2 over 200 points the standard errors are ~1e-4 relative.
  std::mt19937_64 gen(42);
  std::normal_distribution<double> noise(0.0, 0.001);
  MESSAGE("seed 42");
  std::vector<double> t, y;
  for (int i = 0; i < 200; ++i) {
    t.push_back(0.25 * i);
    y.push_back(2.0 * std::exp(-t.back() / 7.5) + noise(gen));
  }
  const auto f = from_residuals(
      [&](const Eigen::VectorXd& x) {
        Eigen::VectorXd e(t.size());
        for (std::size_t i = 0; i < t.size(); ++i) e[i] = x[0] * std::exp(-t[i] / x[1]) - y[i];
        return e;
      },
      [&](const Eigen::VectorXd& x) {
        Eigen::MatrixXd j(t.size(), 2);
        for (std::size_t i = 0; i < t.size(); ++i) {
          const double ex = std::exp(-t[i] / x[1]);
          j(i, 0) = ex;
          j(i, 1) = x[0] * ex * t[i] / (x[1] * x[1]);
        }
        return j;
      });
  const auto r = fit::levenberg_marquardt(f, Eigen::Vector2d(1.0, 1.0), Eigen::Vector2d(0.01, 0.01),
                                          Eigen::Vector2d(100, 100));
  CHECK(r.x[0] == doctest::Approx(2.0).epsilon(2e-3));
  CHECK(r.x[1] == doctest::Approx(7.5).epsilon(2e-3));
}

TEST_CASE("levenberg-marquardt: a minimum outside the box ends on the bound") {
  // r = x − 3 with x ≤ 1: the constrained minimum is x = 1 (the gradient points outward there).
  const auto f = from_residuals([](const Eigen::VectorXd& x) { return Eigen::VectorXd::Constant(1, x[0] - 3.0); },
                                [](const Eigen::VectorXd&) { return Eigen::MatrixXd::Constant(1, 1, 1.0); });
  const auto r = fit::levenberg_marquardt(f, Eigen::VectorXd::Constant(1, 0.0), Eigen::VectorXd::Constant(1, -5.0),
                                          Eigen::VectorXd::Constant(1, 1.0));
  CHECK(r.x[0] == doctest::Approx(1.0));
  CHECK(r.status == fit::LmStatus::converged);
}

TEST_CASE("levenberg-marquardt: the iteration cap is reported with the best point so far") {
  const auto f = from_residuals(
      [](const Eigen::VectorXd& x) { return Eigen::Vector2d(10.0 * (x[1] - x[0] * x[0]), 1.0 - x[0]); },
      [](const Eigen::VectorXd& x) {
        Eigen::Matrix2d j;
        j << -20.0 * x[0], 10.0, -1.0, 0.0;
        return Eigen::MatrixXd(j);
      });
  fit::LmOptions o;
  o.max_iterations = 3;
  const auto r = fit::levenberg_marquardt(f, Eigen::Vector2d(-1.2, 1.0), Eigen::Vector2d(-10, -10),
                                          Eigen::Vector2d(10, 10), o);
  CHECK(r.status == fit::LmStatus::iteration_cap);
  CHECK(r.iterations == 3);
  CHECK(r.cost < 0.5 * (4.4 * 4.4 + 2.2 * 2.2));  // below the start's cost
}

}  // TEST_SUITE
