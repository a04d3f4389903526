#include "core/roots.hpp"

#include <boost/math/tools/roots.hpp>
#include <boost/math/tools/toms748_solve.hpp>
#include <cmath>
#include <utility>

#include "core/error.hpp"

namespace sortie {

std::optional<double> find_root(const std::function<double(double)>& f, double a, double b,
                                double x_tol, std::uintmax_t max_iter) {
  return find_root(f, a, b, f(a), f(b), x_tol, max_iter);
}

std::optional<double> find_root(const std::function<double(double)>& f, double a, double b,
                                double fa, double fb, double x_tol, std::uintmax_t max_iter) {
  if (a > b) {
    std::swap(a, b);
    std::swap(fa, fb);
  }
  if (!std::isfinite(a) || !std::isfinite(b)) return std::nullopt;
  if (fa == 0.0) return a;
  if (fb == 0.0) return b;
  if (!std::isfinite(fa) || !std::isfinite(fb) || (fa > 0) == (fb > 0)) return std::nullopt;
  // A sign change across a bracket of no width (a step too short to move the time at that
  // magnitude): the root is that point. TOMS 748 refuses a == b with a std::domain_error.
  if (a == b) return a;
  std::uintmax_t iters = max_iter;
  auto tol = [x_tol](double lo, double hi) { return std::fabs(hi - lo) <= x_tol; };
  std::pair<double, double> bracket;
  try {
    bracket = boost::math::tools::toms748_solve(f, a, b, fa, fb, tol, iters);
  } catch (const boost::math::evaluation_error& e) {  // f turned non-finite inside the bracket
    throw LimitError("root finder failed on [" + format_number(a) + ", " + format_number(b) + "]: " + e.what());
  }
  const auto [lo, hi] = bracket;
  if (iters >= max_iter && !tol(lo, hi))
    throw LimitError("root finder did not converge in " + std::to_string(max_iter) +
                     " iterations on [" + format_number(a) + ", " + format_number(b) + "]");
  return 0.5 * (lo + hi);
}

}  // namespace sortie
